# Golden model for the always-on rules that judge the model and the
# solution: an entrance depth above critical on a mild reach cannot act as
# an upstream control (the solver notes it), a bend far tighter than the
# channel is wide, and an exception whose rule id is misspelt. Checked with
# jumps.policy.hcl, which enables no point rule. An invented farm ditch.
#
# Expectations: "# want RULE EVENT FROM..TO" names a finding whose block
# starts on the next line that is not a comment; "-" is no event, "-..-"
# no span.

units = "si"
title = "Copperbeck farm ditch"

section "ditch" {
  shape        = "rectangle"
  bottom_width = 3.0
  height       = 2.0
  roughness    = 0.015
  lining       = "concrete"
}

# want solver q 0..0
reach "ditch" {
  from    = "field-gate"
  to      = "beck"
  length  = 400
  section = "ditch"
  slope   = 0.001
}

bend "hairpin" {
  reach        = "ditch"
  from_station = 100
  to_station   = 120
  # want model - -..-
  radius       = 1.0
}

event "q" {
  inflow   = { "ditch" = 6.0 }
  outlet   = { condition = "normal" }
  entrance = { "ditch" = 1.0 }
}

# want model - -..-
# want unused_exception - 0..400
exception "frebaord" {
  reach        = "ditch"
  from_station = 0
  to_station   = 400
  reason       = "Typing error in the rule id"
}
