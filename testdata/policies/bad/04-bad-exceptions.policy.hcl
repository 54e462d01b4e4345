policy "x" {
  units      = "si"
  exceptions = "ignore" # want policy "Invalid exceptions" "\x22report\x22, \x22deny\x22"
}
