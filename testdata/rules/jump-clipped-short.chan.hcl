# Golden model for a jump at a reach end that escapes: as jump-clipped,
# but the basin at the head of "tail" is only 2 m long, so the roller runs
# past it: the containment finding is on reach "release", clipped to it, and
# names the unprotected channel in "tail". An invented outlet works.

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
# want jump_containment release toe..end
basin "release-basin" {
  reach        = "release"
  from_station = 0
  to_station   = 12
}

basin "tail-basin" {
  reach        = "tail"
  from_station = 0
  to_station   = 2
}

event "release" {
  inflow = { "release" = 4.0 }
  outlet = { condition = "normal" }
}
