# Inflows of 1e-20 m³/s and 5e7 m³/s: a trickle no channel carries as
# open-channel flow, and some 250 times the Amazon.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
reach "upper" {
  from    = "top"
  to      = "mid"
  length  = 400
  section = "lined"
  slope   = 0.002
}
reach "main" {
  from    = "mid"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
}
event "q100" {
  inflow = {
    "upper" = 1e-20 # want model "Discharge too small.*inflow to \x22upper\x22 in event \x22q100\x22 is 1e-20 m³/s; the least accepted is 0.0001 m³/s"
    "main"  = 5e7 # want model "Discharge too large.*inflow to \x22main\x22 in event \x22q100\x22 is 5e\+07 m³/s; the most accepted is 1e\+06 m³/s"
  }
  outlet = { depth = 0.8 }
}
