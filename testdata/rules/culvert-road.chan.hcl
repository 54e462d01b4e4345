# Golden model for the culvert rules: a 1.0 m concrete pipe under a road,
# with the tailwater (1.6 m) above its crown, so outlet control with the
# barrel full governs and the headwater follows the energy equation by
# hand. In q-big the road overtops. An invented road crossing.
#
# Expectations: "# want RULE EVENT FROM..TO" names a finding whose block
# starts on the next line that is not a comment.

units = "si"
title = "Hollins Lane crossing"

section "approach" {
  shape        = "rectangle"
  bottom_width = 4
  height       = 4
  roughness    = 0.03
  lining       = "grass"
}

section "pipe" {
  shape     = "circle"
  diameter  = 1.0
  roughness = 0.013
  lining    = "concrete"
}

reach "approach" {
  from    = "top"
  to      = "inlet"
  length  = 100
  section = "approach"
  invert  = [5.25, 5.05]
}

reach "barrel" {
  from    = "inlet"
  to      = "outlet"
  length  = 30
  section = "pipe"
  invert  = [5.03, 5.0]
}

# want headwater q-big 0..0
# want headwater q-big 0..0
# want overtopping q-big 0..0
# want outlet_velocity q-big 30..30
culvert "hollins-lane" {
  reach = "barrel"
  inlet = { form = 1, K = 0.0098, M = 2.0, c = 0.0398, Y = 0.67, entrance_loss = 0.5 }
  road  = { crest = 7.2, length = 20, width = 10 }
}

event "q-small" {
  inflow = { "approach" = 1.0 }
  outlet = { depth = 1.6 }
}

event "q-big" {
  inflow = { "approach" = 3.0 }
  outlet = { depth = 1.6 }
}
