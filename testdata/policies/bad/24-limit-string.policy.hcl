policy "x" {
  units = "si"
  min_velocity { limit = "0.6" } # want policy "Invalid value for \x22limit\x22" "the string \x220\.6\x22"
}
