# Losses at nodes that are not junctions.
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
loss "inlet" {
  node      = "midd" # want model "Unknown node"
  expansion = 0.3
}
loss "entry" {
  node        = "top" # want model "Loss at a headwater node"
  contraction = 0.2
}
