policy "x" {
  units = "si"
  jump_containment "main" {} # want policy "Extraneous label for jump_containment"
}
