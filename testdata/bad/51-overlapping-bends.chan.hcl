# Two bends over the same stations.
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
bend "first" {
  reach        = "main"
  from_station = 100
  to_station   = 200
  radius       = 30
}

bend "second" {
  reach        = "main"
  from_station = 180 # want model "Overlapping bends"
  to_station   = 250
  radius       = 40
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
