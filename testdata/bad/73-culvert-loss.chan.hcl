# Loss blocks at the two ends of a culvert.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
section "barrel" {
  shape        = "box"
  bottom_width = 1.8
  height       = 1.2
  roughness    = 0.013
  lining       = "concrete"
}
reach "above" {
  from    = "top"
  to      = "inlet"
  length  = 200
  section = "lined"
  slope   = 0.002
}
reach "under-road" {
  from    = "inlet"
  to      = "outfall"
  length  = 30
  section = "barrel"
  invert  = [2.06, 2.0]
}
culvert "road" {
  reach   = "under-road"
  inlet   = "box-wingwalls-30-75"

}
event "q100" {
  inflow = { "above" = 3.0 }
  outlet = { depth = 0.8 }
}
loss "entry" {
  node        = "inlet" # want model "Loss at a culvert"
  contraction = 0.5
}
loss "exit" {
  node      = "outfall" # want model "Loss at a culvert"
  expansion = 1.0
}
