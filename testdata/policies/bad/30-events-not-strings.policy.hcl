policy "x" {
  units = "si"
  jump_containment { events = ["q100", 10] } # want policy "Invalid value for \x22events\x22" "event names"
}
