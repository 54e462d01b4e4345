policy "x" {
  units = "si"
  jump_containment {}
  jump_containment { severity = "warning" } # want policy "Duplicate rule block" "already configured at line 3"
}
