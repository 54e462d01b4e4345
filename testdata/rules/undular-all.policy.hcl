# Test policy: every jump needs a basin.
policy "undular-all" {
  units = "si"
  jump_containment {}
}
