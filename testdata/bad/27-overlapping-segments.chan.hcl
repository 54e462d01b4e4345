# Two segments claim stations 150 to 200.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
section "wide" {
  shape        = "rectangle"
  bottom_width = 3.0
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
  segment {
    from_station = 100
    to_station   = 200
    section      = "wide"
  }
  segment {
    from_station = 150 # want model "Overlapping segments"
    to_station   = 300
    section      = "wide"
  }
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
