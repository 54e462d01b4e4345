policy "x" {
  units = "si"
  freeboard { minimum = } # want policy "Invalid expression"
}
