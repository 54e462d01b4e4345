# A height above the surveyed ground at an end: imaginary banks.
units = "si"
section "lined" {
  shape     = "points"
  points    = [[0, 2], [5, 0], [10, 2.4]]
  height    = 3.5 # want model "Height above the ground"
  roughness = 0.03
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
