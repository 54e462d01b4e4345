# Golden model for a closed box flowing full: the tailwater at the outlet
# (1.6 m) stands above the 1.2 m soffit of the 2.0 m wide box, so it runs
# full over its whole length. An invented storm-drain box.
#
# Expectations: "# want RULE EVENT FROM..TO" names a finding whose block
# starts on the next line that is not a comment.

units = "si"
title = "Garth Row box drain"

section "box" {
  shape        = "box"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.013
  lining       = "concrete"
}

# want capacity q 0..80
reach "drain" {
  from    = "inlet"
  to      = "outlet"
  length  = 80
  section = "box"
  slope   = 0.001
}

event "q" {
  inflow = { "drain" = 4.0 }
  outlet = { depth = 1.6 }
}
