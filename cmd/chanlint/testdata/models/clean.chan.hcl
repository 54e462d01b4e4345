# Wrenfield test channel (an invented scenario): a deep concrete box that
# carries its flow well below the lining, at normal depth, with nothing for
# the baseline pack to report.
units = "si"
title = "Wrenfield test channel"

section "box" {
  shape        = "rectangle"
  bottom_width = 3.0
  height       = 3.0
  roughness    = 0.015
  lining       = "concrete"
}

reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 200
  section = "box"
  slope   = 0.001
}

event "q5" {
  inflow = { "main" = 3.0 }
  outlet = { condition = "normal" }
}
