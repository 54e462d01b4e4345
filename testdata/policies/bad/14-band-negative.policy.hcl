policy "x" {
  units = "si"
  froude_band { avoid = [[-0.5, 0.86]] } # want policy "Invalid band" "at least 0"
}
