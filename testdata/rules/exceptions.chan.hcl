# Golden model for design exceptions: the uniform-flow cut of
# uniform.chan.hcl at its design flow, with three exceptions: one that
# covers the freeboard finding, one too short for the Froude-band finding,
# and one for a rule that finds nothing. Checked with golden.policy.hcl
# ("report") and golden-deny.policy.hcl ("deny"). An invented channel.
#
# Expectations: "# want RULE EVENT FROM..TO [excepted]" names a finding whose
# block starts on the next line that is not a comment; "# want:report" and
# "# want:deny" hold only under that policy.

# The golden policy's min_velocity block names event q-low only.
# want unmatched_selector - -..-
units = "si"
title = "Harrowgate Fields interceptor cut, with exceptions"

section "cut" {
  shape        = "rectangle"
  bottom_width = 3.0
  height       = 1.45
  roughness    = 0.015
  lining       = "grass"
}

# want:report freeboard q-design 0..2000 excepted
# want:deny freeboard q-design 0..2000
# want max_velocity q-design 0..2000
# want froude_band q-design 0..2000
# want shear_stress q-design 0..800
# want shear_stress q-design 800..1000
# want shear_stress q-design 1000..2000
reach "interceptor" {
  from    = "fields-inlet"
  to      = "outfall"
  length  = 2000
  section = "cut"
  slope   = 0.001
}

# want superelevation q-design 800..1000
bend "mill-curve" {
  reach        = "interceptor"
  from_station = 800
  to_station   = 1000
  radius       = 12
}

event "q-design" {
  inflow = { "interceptor" = 6.0 }
  outlet = { condition = "normal" }
}

# want:deny unused_exception - 0..2000
exception "freeboard" {
  reach        = "interceptor"
  from_station = 0
  to_station   = 2000
  reason       = "Bank raised by a parapet wall under a separate contract; reviewed"
}

# want:report unused_exception - 100..300
# want:deny unused_exception - 100..300
exception "froude_band" {
  reach        = "interceptor"
  from_station = 100
  to_station   = 300
  reason       = "Near-critical flow accepted at the weir approach"
}

# want:report unused_exception - 0..2000
# want:deny unused_exception - 0..2000
exception "min_velocity" {
  reach        = "interceptor"
  from_station = 0
  to_station   = 2000
  reason       = "Low flows are pumped"
}
