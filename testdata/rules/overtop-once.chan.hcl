# Golden model for overtopping reported once: a lined ditch backed up by a
# high tailwater (an M1 curve) rises above its lining over its downstream
# part. capacity reports the overtopping stretch; freeboard and
# superelevation report only the stretch upstream of it where the channel
# still holds the flow but lacks freeboard, ending where the overtopping
# begins (rules/golden_test.go integrates the M1 curve independently). An
# invented ditch.

units = "si"
title = "Wenlow back lane ditch"

section "ditch" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.0
  roughness    = 0.015
  lining       = "concrete"
}

# want capacity q ~..600
# want freeboard q ~..~
reach "back-lane" {
  from    = "culvert"
  to      = "river"
  length  = 600
  section = "ditch"
  slope   = 0.003
}

# want superelevation q ~..~
bend "long-sweep" {
  reach        = "back-lane"
  from_station = 0
  to_station   = 600
  radius       = 25
}

event "q" {
  inflow = { "back-lane" = 2.0 }
  outlet = { depth = 1.3 }
}
