policy "x" {
  units = "si"
  freeboard { minimum = max(0.3, 0.5) } # want policy "Function calls not allowed"
}
