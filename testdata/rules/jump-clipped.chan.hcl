# Golden model for a jump at a reach end: the outlet of jump-escapes split
# at station 12, where the channel passes a wall into reach "tail" with the
# same section and slope. The jump (toe near 8.8 m, about 6.3 m long) runs
# past the end of "release": its span is clipped to the reach, its message
# says it continues into "tail", and it is contained because the rest of
# its body lies in the basin at the head of "tail". An invented outlet works.

units = "si"
title = "Brackenmoor reservoir outlet, split at the valve-house wall"

section "outlet-channel" {
  shape        = "rectangle"
  bottom_width = 2.5
  height       = 2.0
  roughness    = 0.014
  lining       = "concrete"
}

reach "release" {
  from    = "gate-house"
  to      = "valve-house"
  length  = 12
  section = "outlet-channel"
  slope   = 0.0007
}

reach "tail" {
  from    = "valve-house"
  to      = "river"
  length  = 188
  section = "outlet-channel"
  slope   = 0.0007
}

gate "sluice" {
  reach       = "release"
  opening     = 0.43
  contraction = 0.61
}

# want jump_type release toe..end
basin "release-basin" {
  reach        = "release"
  from_station = 0
  to_station   = 12
}

basin "tail-basin" {
  reach        = "tail"
  from_station = 0
  to_station   = 10
}

event "release" {
  inflow = { "release" = 4.0 }
  outlet = { condition = "normal" }
}
