policy "x" {
  units = "si"
  jump_type { avoid = [[2.5, 3, 4.5]] } # want policy "Invalid band" "not a pair"
}
