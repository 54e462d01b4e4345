# Slopes and lengths each in range that add up to a fall no valley has:
# 9,000 km at a slope of 0.5 rises 4,500 km above the outlet.
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
  length  = 9e6
  section = "lined"
  slope   = 0.5 # want model "Elevation out of range.*reach \x22main\x22 rises to an upstream invert of 4.5e\+06 m \(its downstream invert 0 m plus slope 0.5 over its length 9e\+06 m\); elevations lie within ±20000 m"
}
event "q100" {
  inflow = { "upper" = 3.0 }
  outlet = { depth = 0.8 }
}
