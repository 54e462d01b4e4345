# Golden model for a drop: a mild rectangular channel falls freely over a
# vertical drop of 1.5 m onto a mild rectangular channel of the same width
# whose outlet runs at normal depth. Rand's (1955) straight-drop relations
# give the depth at the toe of the nappe and the drop length; from there the
# jet rises along an M3 curve to the Belanger sequent of the normal depth,
# where the jump forms (rules/golden_test.go integrates the M3 curve
# independently). The basin below the drop is too short for the jump and
# the upstream Froude number lies in the band the policy avoids. An
# invented drop structure.
#
# Expectations: a "# want RULE EVENT FROM..TO" comment names a finding whose
# block starts on the next line that is not a comment; "toe..end" stands for
# the jump's own span.

units = "si"
title = "Tarrow Beck drop structure, short basin"

section "drop-channel" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 2.0
  roughness    = 0.014
  lining       = "concrete"
}

reach "approach" {
  from    = "field"
  to      = "drop"
  length  = 100
  section = "drop-channel"
  invert  = [11.64, 11.57]
}

reach "below-drop" {
  from    = "drop"
  to      = "beck"
  length  = 200
  section = "drop-channel"
  invert  = [10.07, 9.93]
}

# want jump_containment design toe..end
# want jump_type design toe..end
basin "drop-basin" {
  reach        = "below-drop"
  from_station = 0
  to_station   = 10
}

event "design" {
  inflow = { "approach" = 4.0 }
  outlet = { condition = "normal" }
}
