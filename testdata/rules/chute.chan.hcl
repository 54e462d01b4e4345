# Golden model for supercritical flow: a steep rectangular chute entered at
# its own normal depth (0.48470... m, which rules/golden_test.go recomputes
# from Manning's equation), so the whole chute runs uniform and rapid, and
# the bend takes the supercritical superelevation coefficient. An invented
# spillway chute.
#
# Expectations: "# want RULE EVENT FROM..TO" names a finding whose block
# starts on the next line that is not a comment.

# The golden policy's min_velocity block names event q-low only.
# want unmatched_selector - -..-
units = "si"
title = "Hollinsclough spillway chute"

section "chute" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.0
  roughness    = 0.013
  lining       = "concrete"
}

# want max_velocity q 0..300
reach "chute" {
  from    = "crest"
  to      = "stilling-pond"
  length  = 300
  section = "chute"
  slope   = 0.02
}

# want superelevation q 100..200
bend "swing" {
  reach        = "chute"
  from_station = 100
  to_station   = 200
  radius       = 20
}

event "q" {
  inflow   = { "chute" = 5.0 }
  outlet   = { condition = "normal" }
  entrance = { "chute" = 0.4847044693053545 }
}
