policy "x" {
  units = "si"
  jump_containment { events = [] } # want policy "Empty \x22events\x22" "every event"
}
