policy "x" {
  units = "si"
  max_velocity { limit = -1.5 } # want policy "Invalid value for \x22limit\x22" "greater than 0"
}
