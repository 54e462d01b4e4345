policy "x" {
  units = "si"
  freeboard { minimum = 1e400 } # want policy "Invalid value for \x22minimum\x22" "too large"
}
