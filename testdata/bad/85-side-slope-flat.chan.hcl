# A side slope of 2e6 horizontal per unit rise: a percentage or a slope
# written the other way up.
units = "si"
section "lined" {
  shape        = "trapezoid"
  bottom_width = 2
  side_slope   = 2e6 # want model "Side slope too flat.*side_slope of section \x22lined\x22 is 2e\+06; the most accepted is 1000"
  height       = 1.2
  roughness    = 0.015
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
