# A vertical wall is two points, not three.
units = "si"
section "lined" {
  shape     = "points"
  points    = [[0, 2], [0, 1], [0, 0], [6, 0], [6, 2]] # want model "Three points at one offset"
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
