policy "x" {
  units = "si"
  max_velocity { limit = { a.b = 1 } } # want policy "Variables not allowed"
}
