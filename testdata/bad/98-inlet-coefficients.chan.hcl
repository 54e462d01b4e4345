# Explicit inlet coefficients far outside HDS-5's table: an exponent M of
# 1e9 and a K of 1e9, with which every drop of the flow would go over the
# road.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
section "barrel" {
  shape        = "box"
  bottom_width = 1.8
  height       = 1.2
  roughness    = 0.013
  lining       = "concrete"
}
reach "above" {
  from    = "top"
  to      = "inlet"
  length  = 200
  section = "lined"
  slope   = 0.002
}
reach "under-road" {
  from    = "inlet"
  to      = "outfall"
  length  = 30
  section = "barrel"
  invert  = [2.06, 2.0]
}
culvert "road" {
  reach = "under-road"
  inlet = {
    form          = 2
    K             = 1e9 # want model "Inlet coefficient out of range.*K of the inlet of culvert \x22road\x22 is 1e\+09; it must lie between 0.0001 and 2"
    M             = 1e9 # want model "Inlet coefficient out of range.*M of the inlet"
    c             = 0.0347
    Y             = 1e-20 # want model "Inlet coefficient out of range.*Y of the inlet"
    entrance_loss = 0.4
  }
  road = { crest = 4.5, length = 40, width = 10 }
}
event "q100" {
  inflow = { "above" = 3.0 }
  outlet = { depth = 0.8 }
}
