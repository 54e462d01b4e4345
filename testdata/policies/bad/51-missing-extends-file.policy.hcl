policy "x" {
  units   = "si"
  extends = "shared/county.policy.hcl" # want policy "Policy file not found" "shared/county\.policy\.hcl"
}
