policy "x" {
  units = "si"
  shear_stress { limit = 0 } # want policy "Invalid value for \x22limit\x22" "got 0"
}
