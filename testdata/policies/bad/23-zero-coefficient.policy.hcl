policy "x" {
  units = "si"
  superelevation { supercritical_coefficient = 0 } # want policy "Invalid value for \x22supercritical_coefficient\x22" "greater than 0"
}
