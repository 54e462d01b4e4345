# Golden model for selectors: two reaches of different classes in series
# (the same rectangular cut, so both carry uniform flow at the normal depth
# of each event) and three events of two storm classes. An invented channel.
# The expected values follow from Manning's equation (rules/selector_test.go
# computes them independently).

units = "si"
title = "Corbel Lane drainage"

section "cut" {
  shape        = "rectangle"
  bottom_width = 3.0
  height       = 1.45
  roughness    = 0.015
  lining       = "concrete"
}

# want freeboard design 0..1000
# want max_velocity flood 0..1000
reach "ditch" {
  from    = "lane-inlet"
  to      = "culvert-head"
  length  = 1000
  section = "cut"
  slope   = 0.001
  class   = "roadside-ditch"
}

# want freeboard flood 0..1000
# want max_velocity flood 0..1000
reach "channel" {
  from    = "culvert-head"
  to      = "outfall"
  length  = 1000
  section = "cut"
  slope   = 0.001
  class   = "constructed"
}

event "frequent" {
  return_period = 2
  class         = "minor"
  inflow        = { "ditch" = 1.0 }
  outlet        = { condition = "normal" }
}

event "design" {
  return_period = 10
  class         = "minor"
  inflow        = { "ditch" = 3.0 }
  outlet        = { condition = "normal" }
}

event "flood" {
  return_period = 100
  class         = "major"
  inflow        = { "ditch" = 4.0 }
  outlet        = { condition = "normal" }
}
