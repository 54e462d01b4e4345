# The invented Brackenfold business park drain, in US units: one
# concrete-lined rectangular channel along the service road to the pond.
# Designed to pass the built-in baseline-us pack cleanly: no finding at any
# severity, in both flow events.
units = "us"
title = "Brackenfold park drain"

section "road-channel" {
  shape        = "rectangle"
  bottom_width = 6.0
  height       = 5.0
  roughness    = 0.013
  lining       = "concrete"
}

reach "service-road" {
  from    = "car-park"
  to      = "pond"
  length  = 900
  section = "road-channel"
  slope   = 0.001
}

event "q10" {
  inflow = { "service-road" = 60 }
  outlet = { condition = "normal" }
}

event "q100" {
  inflow = { "service-road" = 120 }
  outlet = { depth = 3.0 }
}
