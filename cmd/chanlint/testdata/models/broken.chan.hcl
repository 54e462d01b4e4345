units = "si"
section "ditch" {
  shape        = "rectangle"
  botom_width  = 2.0
  height       = 1.0
  roughness    = 0.015
}
