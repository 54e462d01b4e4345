policy "x" {
  units   = "si"
  extend  = "baseline" # want policy "Unsupported argument" "Did you mean \x22extends\x22\?"
}
