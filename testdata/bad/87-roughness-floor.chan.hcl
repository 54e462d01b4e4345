# A Manning's n of 1e-20, far below the smoothest surface.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 1e-20 # want model "Roughness too low.*roughness of section \x22lined\x22 is 1e-20; the least accepted is 0.005"
}
section "zones" {
  shape     = "points"
  points    = [[0, 2], [5, 0], [10, 2]]
  roughness = [0.06, 0.001, 0.06] # want model "Roughness too low"
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
