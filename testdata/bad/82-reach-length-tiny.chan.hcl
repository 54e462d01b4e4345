# A reach 1e-20 m long: an exponent slip; the shortest reach accepted is 1 mm.
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
  length  = 1e-20 # want model "Length too small.*length of reach \x22main\x22 is 1e-20 m; the least accepted is 0.001 m"
  section = "lined"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
