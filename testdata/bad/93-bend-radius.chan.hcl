# A bend of radius 1e-20 m. (A radius under half the flow's top width is
# the model rule's warning on the solved flow, not a refusal.)
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
}
bend "pin" {
  reach        = "main"
  from_station = 10
  to_station   = 20
  radius       = 1e-20 # want model "Dimension too small.*radius of bend \x22pin\x22 is 1e-20 m"
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
