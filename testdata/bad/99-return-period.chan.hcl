# Return periods of 1e-20 and 1e9 years: an annual probability written
# as a return period, and a stray exponent.
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
  inflow        = { "main" = 3.0 }
  outlet        = { depth = 0.8 }
  return_period = 1e-20 # want model "Return period out of range.*return_period of event \x22q100\x22 is 1e-20 years; the least accepted is 0.1 years"
}
event "pmf" {
  inflow        = { "main" = 9.0 }
  outlet        = { depth = 1.1 }
  return_period = 1e9 # want model "Return period out of range.*the most accepted is 1e\+06 years"
}
