policy "x" {
  units     = "si"
  reference = "%{ for x in [1, 2] }manual%{ endfor }" # want policy "Templates not allowed" "directives"
}
