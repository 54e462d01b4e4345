policy "x" {
  units = "si"
  max_velocity { limit = { concrete = speed } } # want policy "Variables not allowed"
}
