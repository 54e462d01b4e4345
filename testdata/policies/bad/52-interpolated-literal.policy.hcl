policy "x" {
  units     = "si"
  reference = "manual, edition ${2}" # want policy "Templates not allowed" "interpolation"
}
