policy "x" {
  units = "si"
  freeboard { severity = "error" } # want policy "Missing freeboard setting" "minimum"
}
