policy "x" {
  units = "si"
  max_velocity { limit = { concrete = 6.0, grass = -1.2 } } # want policy "Invalid value for \x22limit\x22" "greater than 0"
}
