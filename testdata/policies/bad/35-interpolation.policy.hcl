policy "x" {
  units     = "si"
  reference = "manual ${edition}" # want policy "Variables not allowed"
}
