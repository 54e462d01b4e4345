policy "x" {
  units = "si"
  freeboard { fraction = 20 } # want policy "Invalid value for \x22fraction\x22" "0\.2 means 20 %"
}
