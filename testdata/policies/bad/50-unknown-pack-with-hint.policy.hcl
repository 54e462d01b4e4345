policy "x" {
  units   = "si"
  extends = "basline" # want policy "Unknown pack or policy file" "Did you mean \x22baseline\x22\?"
}
