# Test policy: undular jumps (F1 below 1.7) need no basin.
policy "undular-froude" {
  units = "si"
  jump_containment {
    min_froude = 1.7
  }
}
