# Golden model for the point rules: one long, straight-graded rectangular
# cut whose outlet runs at normal depth, so every computed point carries
# uniform flow and every expected value follows from Manning's equation
# (rules/golden_test.go computes them independently). An invented channel.
#
# Expectations: a "# want RULE EVENT FROM..TO" comment names a finding whose
# block starts on the next line that is not a comment.

units = "si"
title = "Harrowgate Fields interceptor cut"

section "cut" {
  shape        = "rectangle"
  bottom_width = 3.0
  height       = 1.45
  roughness    = 0.015
  lining       = "grass"
}

# want min_velocity q-low 0..2000
# want froude_band q-low 0..2000
# want freeboard q-design 0..2000
# want max_velocity q-design 0..2000
# want froude_band q-design 0..2000
# want shear_stress q-design 0..800
# want shear_stress q-design 800..1000
# want shear_stress q-design 1000..2000
# want capacity q-flood 0..2000
# want max_velocity q-flood 0..2000
# want shear_stress q-flood 0..800
# want shear_stress q-flood 800..1000
# want shear_stress q-flood 1000..2000
reach "interceptor" {
  from    = "fields-inlet"
  to      = "outfall"
  length  = 2000
  section = "cut"
  slope   = 0.001
}

# want superelevation q-design 800..1000
bend "mill-curve" {
  reach        = "interceptor"
  from_station = 800
  to_station   = 1000
  radius       = 12
}

event "q-low" {
  inflow = { "interceptor" = 0.25 }
  outlet = { condition = "normal" }
}

event "q-design" {
  inflow = { "interceptor" = 6.0 }
  outlet = { condition = "normal" }
}

event "q-flood" {
  inflow = { "interceptor" = 14.0 }
  outlet = { condition = "normal" }
}
