policy "x" {
  units = "si"
  freeboard { minimum = true ? 0.3 : 0.5 } # want policy "Expressions not allowed" "literal values only"
}
