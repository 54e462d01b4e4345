policy "x" {
  units   = "si"
  extends = "/etc/base.policy.hcl" # want policy "Absolute path in extends" "relative to this policy file"
}
