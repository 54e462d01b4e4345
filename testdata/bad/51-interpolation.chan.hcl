# ${...} is not evaluated in a model, even around a literal.
units = "si"
title = "Trunk, phase ${2}" # want model "Interpolation not allowed" "literal text"
section "lined" {
  shape        = "rectangle"
  bottom_width = "${2.0}" # want model "Interpolation not allowed" "literal values"
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
