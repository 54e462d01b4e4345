# Two values on one line: the parser stops at the second.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
reach "main" {
  from = "top"
  to   = "outfall" "oops" # want model "Missing newline|Invalid"
}
