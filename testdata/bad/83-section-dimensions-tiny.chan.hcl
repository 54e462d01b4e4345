# Cross-sections smaller than 1 cm: a trapezoid with a 1e-9 m bed (a
# triangle in all but name), a rectangle 1e-20 m high and a pipe 5 mm
# across.
units = "si"
section "lined" {
  shape        = "trapezoid"
  bottom_width = 1e-9 # want model "Dimension too small.*bottom_width of section \x22lined\x22 is 1e-09 m; the least accepted is 0.01 m.*shape = \x22triangle\x22"
  side_slope   = 2
  height       = 1.2
  roughness    = 0.015
}
section "flat" {
  shape        = "rectangle"
  bottom_width = 2
  height       = 1e-20 # want model "Dimension too small.*height of section \x22flat\x22"
  roughness    = 0.015
}
section "straw" {
  shape     = "circle"
  diameter  = 0.005 # want model "Dimension too small.*diameter of section \x22straw\x22 is 0.005 m"
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
