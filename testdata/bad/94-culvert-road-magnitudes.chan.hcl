# A road over a culvert with a crest 1e-9 m long, a width of 1e-20 m, a
# weir coefficient of 50 (not in m^0.5/s) and a shoulder far above any
# ground.
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
  inlet = "box-wingwalls-30-75"
  road = {
    crest       = 4.5
    length      = 1e-9 # want model "Dimension too small.*length of the road of culvert \x22road\x22 is 1e-09 m"
    width       = 1e-20 # want model "Dimension too small.*width of the road"
    coefficient = 50 # want model "Weir coefficient out of range.*coefficient of the road of culvert \x22road\x22 is 50 m\^0.5/s; the most accepted is 2 m\^0.5/s"
    shoulder    = -4e4 # want model "Elevation out of range.*shoulder of the road"
  }
}
event "q100" {
  inflow = { "above" = 3.0 }
  outlet = { depth = 0.8 }
}
