policy "x" {
  units = "si"
  unused_exception { # want policy "Rule is always on" "\x22unused_exception\x22 rule always runs"
    enabled = false
  }
}
