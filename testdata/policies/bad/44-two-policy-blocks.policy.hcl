policy "x" {
  units = "si"
}
policy "y" { # want policy "More than one policy block" "first is at line 1"
  units = "si"
}
