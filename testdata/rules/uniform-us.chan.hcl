# uniform.chan.hcl in US customary units: every length divided by 0.3048
# m/ft and every discharge by 0.3048³, so its findings are those of the SI
# model converted (rules/golden_test.go). An invented channel.

units = "us"
title = "Harrowgate Fields interceptor cut (feet)"

section "cut" {
  shape        = "rectangle"
  bottom_width = 9.84251968503937
  height       = 4.757217847769028
  roughness    = 0.015
  lining       = "grass"
}

# want min_velocity q-low 0..6561.679790026246
# want froude_band q-low 0..6561.679790026246
# want freeboard q-design 0..6561.679790026246
# want max_velocity q-design 0..6561.679790026246
# want froude_band q-design 0..6561.679790026246
# want shear_stress q-design 0..2624.6719160104985
# want shear_stress q-design 2624.6719160104985..3280.839895013123
# want shear_stress q-design 3280.839895013123..6561.679790026246
# want capacity q-flood 0..6561.679790026246
# want max_velocity q-flood 0..6561.679790026246
# want shear_stress q-flood 0..2624.6719160104985
# want shear_stress q-flood 2624.6719160104985..3280.839895013123
# want shear_stress q-flood 3280.839895013123..6561.679790026246
reach "interceptor" {
  from    = "fields-inlet"
  to      = "outfall"
  length  = 6561.679790026246
  section = "cut"
  slope   = 0.001
}

# want superelevation q-design 2624.6719160104985..3280.839895013123
bend "mill-curve" {
  reach        = "interceptor"
  from_station = 2624.6719160104985
  to_station   = 3280.839895013123
  radius       = 39.37007874015748
}

event "q-low" {
  inflow = { "interceptor" = 8.828666680372146 }
  outlet = { condition = "normal" }
}

event "q-design" {
  inflow = { "interceptor" = 211.8880003289315 }
  outlet = { condition = "normal" }
}

event "q-flood" {
  inflow = { "interceptor" = 494.4053341008402 }
  outlet = { condition = "normal" }
}
