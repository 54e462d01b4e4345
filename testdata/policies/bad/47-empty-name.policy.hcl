policy "" { # want policy "Empty policy name"
  units = "si"
}
