# Explicit inlet coefficients with some missing and one unknown.
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
  inlet = { form = 1, K = 0.026, M = 1.0, Y = 0.81, entrance = 0.4 } # want model "Unknown inlet coefficient" # want model "Incomplete inlet coefficients"
}
event "q100" {
  inflow = { "above" = 3.0 }
  outlet = { depth = 0.8 }
}
