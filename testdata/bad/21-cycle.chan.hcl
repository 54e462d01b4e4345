# Three reaches that flow round in a loop.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
reach "a" {
  from    = "n1"
  to      = "n2" # want model "Reaches form a loop"
  length  = 400
  section = "lined"
  slope   = 0.002
}
reach "b" {
  from    = "n2"
  to      = "n3"
  length  = 400
  section = "lined"
  slope   = 0.002
}
reach "c" {
  from    = "n3"
  to      = "n1"
  length  = 400
  section = "lined"
  slope   = 0.002
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
