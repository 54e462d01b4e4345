# A long trapezoidal canal ending at a dam: the gradually-varied-flow
# direct-step example of Chow (1959), ch. 10, in US customary units.
# The reservoir holds 5.0 ft of depth at the dam; the canal is mild, so an
# M1 backwater curve extends upstream towards normal depth (about 3.36 ft).

units = "us"
title = "Canal above a dam (Chow 1959 direct-step example)"

section "canal" {
  shape        = "trapezoid"
  bottom_width = 20
  side_slope   = 2
  height       = 7
  roughness    = 0.025
  lining       = "earth"
}

reach "canal" {
  from    = "head"
  to      = "dam"
  length  = 5000
  section = "canal"
  slope   = 0.0016
}

event "design" {
  inflow = { canal = 400 }
  outlet = { depth = 5.0 }
}
