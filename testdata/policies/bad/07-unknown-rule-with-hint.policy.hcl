policy "x" {
  units = "si"
  freebord { # want policy "Unsupported block type" "Did you mean \x22freeboard\x22\?"
    minimum = 0.3
  }
}
