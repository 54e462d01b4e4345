policy "x" { # want policy "Missing required argument" "\x22units\x22"
  reference = "r"
}
