policy "x" {
  units = "si"
  froude_band { avoid = [[1.13, 0.86]] } # want policy "Invalid band" "low end must be below"
}
