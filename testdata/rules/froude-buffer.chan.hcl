# Golden model for the Froude-band buffer: a mild concrete ditch ends in a
# free outfall, so its M2 drawdown passes through critical depth at the
# brink and crosses the near-critical band just upstream of it. That
# stretch is the control's, not the design's: froude_band leaves
# control_buffer critical depths next to the brink unchecked (no finding
# with the default buffer); with control_buffer = 0 the band is reported
# from where the drawdown enters it (rules/golden_test.go integrates the
# M2 curve independently). An invented ditch.

units = "si"
title = "Ostler Row roadside ditch"

section "ditch" {
  shape        = "rectangle"
  bottom_width = 3.0
  height       = 1.5
  roughness    = 0.015
  lining       = "concrete"
}

# want:nobuffer froude_band q ~..300
reach "ostler-row" {
  from    = "lane-end"
  to      = "brook"
  length  = 300
  section = "ditch"
  slope   = 0.001
}

event "q" {
  inflow = { "ostler-row" = 3.0 }
  outlet = { condition = "critical" }
}
