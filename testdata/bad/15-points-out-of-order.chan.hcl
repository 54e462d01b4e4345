# Offsets must run left to right.
units = "si"
section "lined" {
  shape     = "points"
  points    = [[0, 2], [5, 0], [3, 0.5], [10, 2]] # want model "Offsets out of order"
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
