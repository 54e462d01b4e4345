# Tarnby lane ditch (an invented scenario): a shallow lined ditch backed up
# by a high tailwater, so the water surface rises above the lining near the
# outlet.
units = "si"
title = "Tarnby lane ditch"

section "ditch" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.0
  roughness    = 0.015
  lining       = "concrete"
}

reach "lane" {
  from    = "culvert"
  to      = "river"
  length  = 120
  section = "ditch"
  slope   = 0.001
}

event "q25" {
  inflow = { "lane" = 2.0 }
  outlet = { depth = 1.3 }
}
