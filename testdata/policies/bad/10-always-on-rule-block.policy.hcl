policy "x" {
  units = "si"
  capacity { # want policy "Rule is always on" "\x22capacity\x22 rule always runs"
    severity = "warning"
  }
}
