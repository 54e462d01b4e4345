# Several unrelated mistakes, all reported in one run.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0 # want model "Value must be positive"
  lining       = "concrete"
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "linde" # want model "Unknown section"
  slope   = 0.002
  max_spacing = -5 # want model "Value must be positive"
}
gate "head" {
  reach       = "main"
  opening     = 0.3
  contraction = 0 # want model "Contraction out of range"
}
event "q100" {
  inflow = { "main" = 3.0, "mane" = 1.0 } # want model "Unknown reach"
  outlet = { depht = 0.8 } # want model "Unknown outlet control"
}
