# A short roadside drain of the invented Fernhollow estate: a triangular
# grassed gutter into a box drain that spills freely over a drop at its end.

units = "si"

section "gutter" {
  shape      = "triangle"
  side_slope = 4
  height     = 0.4
  roughness  = 0.025
  lining     = "grass"
}

section "box" {
  shape        = "rectangle"
  bottom_width = 0.9
  height       = 0.75
  roughness    = 0.013
  lining       = "concrete"
}

reach "gutter" {
  from    = "crest"
  to      = "box-inlet"
  length  = 120
  section = "gutter"
  slope   = 0.01
}

reach "box-drain" {
  from    = "box-inlet"
  to      = "drop"
  length  = 60
  section = "box"
  invert  = [12.4, 12.16]
}

event "minor" {
  inflow = { gutter = 0.12, "box-drain" = 0.05 }
  outlet = { condition = "critical" }
}

event "major" {
  inflow = { gutter = 0.3, "box-drain" = 0.12 }
  outlet = { condition = "normal" }
}
