policy "x" {
  units = "si"
  freeboard { minimum = local.freeboard } # want policy "Variables not allowed"
}
