policy "x" {
  units = "si"
  jump_type { avoid = [] } # want policy "Empty \x22avoid\x22" "enabled = false"
}
