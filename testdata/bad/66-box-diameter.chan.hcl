# A box section given a diameter.
units = "si"
section "barrel" {
  shape        = "box"
  bottom_width = 1.8
  height       = 1.2
  diameter     = 1.2 # want model "Argument not used by this shape"
  roughness    = 0.013
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 30
  section = "barrel"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
