# Example: a reviewer's overlay in SI on top of the county policy (US). The
# county numbers are converted to metres before this file's blocks apply.
policy "alder-flats-review" {
  units      = "si"
  extends    = "county-drainage.policy.hcl"
  exceptions = "deny"

  jump_type {
    avoid    = [[2.5, 4.5]]
    severity = "error"
  }

  min_velocity {
    enabled = false
  }
}
