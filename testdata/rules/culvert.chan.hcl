# Golden model for a closed conduit flowing full: the tailwater at the
# outlet (1.4 m) stands above the crown of the 1.0 m pipe, so the pipe runs
# full over its whole length (the hydraulic grade rises upstream of the
# outlet). An invented road culvert.
#
# Expectations: "# want RULE EVENT FROM..TO" names a finding whose block
# starts on the next line that is not a comment.

units = "si"
title = "Linthwaite Lane culvert"

section "pipe" {
  shape     = "circle"
  diameter  = 1.0
  roughness = 0.013
  lining    = "concrete"
}

# want capacity q 0..60
reach "culvert" {
  from    = "inlet"
  to      = "outlet"
  length  = 60
  section = "pipe"
  slope   = 0.002
}

event "q" {
  inflow = { "culvert" = 1.2 }
  outlet = { depth = 1.4 }
}
