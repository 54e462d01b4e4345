# A circle's height is its diameter.
units = "si"
section "lined" {
  shape     = "circle"
  diameter  = 1.2
  height    = 1.2 # want model "Argument not used by this shape"
  roughness = 0.013
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
