policy "x" {
  units = "si"
  freeboard {
    minimun = 0.3 # want policy "Unsupported argument" "Did you mean \x22minimum\x22\?"
  }
}
