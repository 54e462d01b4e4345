# Test policy for the golden jump models: only the jump rules.
policy "jumps" {
  units = "si"
  jump_containment {}
  jump_type {
    avoid = [[2.5, 4.5]]
  }
}
