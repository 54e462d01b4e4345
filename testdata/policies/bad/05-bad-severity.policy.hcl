policy "x" {
  units = "si"
  jump_type {
    avoid    = [[2.5, 4.5]]
    severity = "fatal" # want policy "Invalid severity" "\x22error\x22, \x22warning\x22, \x22info\x22"
  }
}
