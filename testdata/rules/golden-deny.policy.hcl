# The golden test criteria under a reviewer who accepts no design exceptions.
policy "golden-deny" {
  units      = "si"
  extends    = "golden.policy.hcl"
  exceptions = "deny"
}
