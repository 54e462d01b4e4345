# The same bounds in US units, each a round number of feet: a reach
# 0.002 ft long, a bed 0.02 ft wide, an inflow of 0.001 ft³/s and a road
# coefficient of 1 ft^0.5/s.
units = "us"
section "lined" {
  shape        = "rectangle"
  bottom_width = 0.02 # want model "Dimension too small.*bottom_width of section \x22lined\x22 is 0.02 ft; the least accepted is 0.03 ft"
  height       = 4
  roughness    = 0.015
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 0.002 # want model "Length too small.*length of reach \x22main\x22 is 0.002 ft; the least accepted is 0.003 ft"
  section = "lined"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 0.001 } # want model "Discharge too small.*inflow to \x22main\x22 in event \x22q100\x22 is 0.001 ft³/s; the least accepted is 0.003 ft³/s"
  outlet = { elevation = 70000 } # want model "Elevation out of range.*±66000 ft"
}
