# Zone roughness needs one value or three.
units = "si"
section "lined" {
  shape     = "points"
  points    = [[0, 2], [5, 0], [10, 2]]
  roughness = [0.05, 0.03] # want model "Three roughness values required"
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
