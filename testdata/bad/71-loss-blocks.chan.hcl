# Loss blocks with wrong places or coefficients.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
}
section "wide" {
  shape        = "rectangle"
  bottom_width = 3.0
  height       = 1.2
  roughness    = 0.015
}
reach "upper" {
  from    = "top"
  to      = "mid"
  length  = 300
  section = "lined"
  slope   = 0.002
}
reach "main" {
  from    = "mid"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
  segment {
    from_station = 200
    to_station   = 400
    section      = "wide"
  }
}
event "q100" {
  inflow = { "upper" = 3.0 }
  outlet = { depth = 0.8 }
}
loss "throat" {
  reach       = "main"
  station     = 150 # want model "No section change at the station"
  contraction = 0.1
}
loss "default" {
  contraction = 0.1
  expansion   = 0.2
}
loss "other" { # want model "Second default loss"
  contraction = 0.3
}
loss "inlet" {
  node        = "mid"
  contraction = -0.2 # want model "Loss coefficient out of range"
}
loss "both" {
  node        = "mid"
  reach       = "main" # want model "Loss at a node and in a reach"
  station     = 200
  contraction = 0.2
}
loss "bare" { # want model "Missing loss coefficient"
  node = "mid"
}
