policy "x" {
  units = "si"
  max_velocity { limit = { grass = 1.2, grass = 1.5 } } # want policy "Duplicate lining in limit" "\x22grass\x22 already has a limit at line 3, column 28"
}
