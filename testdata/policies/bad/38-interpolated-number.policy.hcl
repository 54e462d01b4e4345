policy "x" {
  units = "si"
  freeboard { minimum = "${0.3}" } # want policy "Templates not allowed" "interpolation"
}
