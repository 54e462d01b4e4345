# Test policy: the Froude band checked at every point, controls included.
policy "froude-nobuffer" {
  units = "si"
  froude_band {
    avoid          = [[0.86, 1.13]]
    control_buffer = 0
  }
}
