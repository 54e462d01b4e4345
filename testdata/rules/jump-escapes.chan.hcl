# Golden model for the jump rules: a sluice gate releases a supercritical
# jet onto a mild rectangular channel whose outlet runs at normal depth. The
# jet rises along an M3 curve until its depth is the Belanger sequent of the
# normal depth, where the jump forms (rules/golden_test.go integrates the M3
# curve independently). The basin is too short: the jump ends about 4 m past it; its
# upstream Froude number (about 3.1) lies in the oscillating band the
# policy avoids. An invented outlet works.
#
# Expectations: a "# want RULE EVENT FROM..TO" comment names a finding whose
# block starts on the next line that is not a comment; "toe..end" stands for
# the jump's own span.

units = "si"
title = "Brackenmoor reservoir outlet, short basin"

section "outlet-channel" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 2.0
  roughness    = 0.014
  lining       = "concrete"
}

reach "release" {
  from    = "gate-house"
  to      = "river"
  length  = 200
  section = "outlet-channel"
  slope   = 0.0007
}

gate "sluice" {
  reach       = "release"
  opening     = 0.43
  contraction = 0.61
}

# want jump_containment release toe..end
# want jump_type release toe..end
basin "short-basin" {
  reach        = "release"
  from_station = 0
  to_station   = 12
}

event "release" {
  inflow = { "release" = 4.0 }
  outlet = { condition = "normal" }
}
