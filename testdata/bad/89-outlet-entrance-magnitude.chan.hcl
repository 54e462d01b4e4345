# An outlet depth of 1e-20 m, an entrance depth of 0.0005 m, and an outlet
# level far above any ground.
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
  inflow   = { "main" = 3.0 }
  outlet   = { depth = 1e-20 } # want model "Depth too small.*outlet depth of event \x22q100\x22 is 1e-20 m; the least accepted is 0.001 m"
  entrance = { "main" = 0.0005 } # want model "Depth too small.*entrance depth of \x22main\x22 in event \x22q100\x22"
}
event "q10" {
  inflow = { "main" = 1.0 }
  outlet = { elevation = 3e5 } # want model "Elevation out of range.*outlet elevation of event \x22q10\x22 is 300000 m"
}
