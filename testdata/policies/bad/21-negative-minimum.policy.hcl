policy "x" {
  units = "si"
  freeboard { minimum = -0.3 } # want policy "Invalid value for \x22minimum\x22" "at least 0"
}
