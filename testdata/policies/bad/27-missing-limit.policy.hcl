policy "x" {
  units = "si"
  max_velocity { # want policy "Missing argument \x22limit\x22" "limit = NUMBER"
    severity = "error"
  }
}
