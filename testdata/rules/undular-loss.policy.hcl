# Test policy: jumps that lose less than 0.05 m of head need no basin.
policy "undular-loss" {
  units = "si"
  jump_containment {
    min_energy_loss = 0.05
  }
}
