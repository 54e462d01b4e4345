policy "x" {
  units = "si"
  min_velocity { limit = { concrete = null } } # want policy "No number in \x22limit\x22" "null alone"
}
