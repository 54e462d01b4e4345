# A model with no channel.  # want model "No reach"
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
event "q100" {
  inflow = {} # want model "No inflow"
  outlet = { depth = 0.8 }
}
