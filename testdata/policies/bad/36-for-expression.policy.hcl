policy "x" {
  units = "si"
  froude_band { avoid = [for b in [[1, 2]] : b] } # want policy "For expressions not allowed" "literal values only"
}
