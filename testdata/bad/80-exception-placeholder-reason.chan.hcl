# A design exception needs a reason of at least a sentence, not a placeholder.
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
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
exception "freeboard" {
  reach        = "main"
  from_station = 0
  to_station   = 50
  reason       = "." # want model "Reason too short"
}
exception "freeboard" {
  reach        = "main"
  from_station = 50
  to_station   = 60
  reason       = "TODO: see above" # want model "Reason too short"
}
exception "freeboard" {
  reach        = "main"
  from_station = 60
  to_station   = 70
  reason       = "ok ok ok ok" # want model "Reason too short"
}
