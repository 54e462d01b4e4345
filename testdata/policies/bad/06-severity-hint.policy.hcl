policy "x" {
  units = "si"
  jump_containment { severity = "warn" } # want policy "Invalid severity" "Did you mean \x22warning\x22\?"
}
