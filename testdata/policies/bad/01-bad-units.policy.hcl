policy "x" {
  units = "metric" # want policy "Invalid units" "Did you mean \x22si\x22\?"
}
