# Two points do not make a cross-section.
units = "si"
section "lined" {
  shape     = "points"
  points    = [[0, 1], [4, 1]] # want model "Too few points"
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
