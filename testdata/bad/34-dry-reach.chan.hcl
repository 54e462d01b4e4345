# The west branch gets no water in q10.
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
  to      = "junction"
  length  = 400
  section = "lined"
  slope   = 0.002
}
reach "west" {
  from    = "west-top"
  to      = "junction"
  length  = 400
  section = "lined"
  slope   = 0.002
}
reach "lower" {
  from    = "junction"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 3.0, "west" = 1.0 }
  outlet = { depth = 0.8 }
}
event "q10" {
  inflow = { "main" = 1.0 } # want model "Reach receives no discharge"
  outlet = { depth = 0.8 }
}
