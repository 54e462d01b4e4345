policy "x" {
  units = "si"
  jump_type { avoid = 2.5 } # want policy "Invalid value for \x22avoid\x22" "list of \[low, high\]"
}
