# Class words and return periods of reaches and events.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
  class   = "roadside ditch" # want model "Invalid class word"
}
event "q100" {
  inflow        = { "main" = 3.0 }
  outlet        = { depth = 0.8 }
  return_period = 0 # want model "Value must be positive"
  class         = "" # want model "Invalid class word"
}
