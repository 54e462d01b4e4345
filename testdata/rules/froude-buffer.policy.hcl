# Test policy: the Froude band with its default buffer next to controls.
policy "froude-buffer" {
  units = "si"
  froude_band {
    avoid = [[0.86, 1.13]]
  }
}
