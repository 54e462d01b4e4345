policy "x" {
  units = 3 # want policy "Invalid value for \x22units\x22" "must be a string"
}
