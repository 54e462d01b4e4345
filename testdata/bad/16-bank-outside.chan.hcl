# A bank beyond the last point.
units = "si"
section "lined" {
  shape     = "points"
  points    = [[0, 2], [5, 0], [10, 2]]
  banks     = [2, 12] # want model "Bank outside the section"
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
