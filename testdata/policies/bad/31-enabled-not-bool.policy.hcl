policy "x" {
  units = "si"
  jump_containment { enabled = "no" } # want policy "Invalid value for \x22enabled\x22" "true or false"
}
