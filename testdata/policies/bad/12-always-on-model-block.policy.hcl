policy "x" {
  units = "si"
  model {} # want policy "Rule is always on" "\x22model\x22 rule always runs"
}
