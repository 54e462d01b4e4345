# The culvert test policy in US customary units: the same criteria as
# culvert.policy.hcl converted at 0.3048 m/ft. Test inputs, not design
# criteria.
policy "golden-culvert-us" {
  units     = "us"
  reference = "golden culvert criteria"

  headwater {
    max_hw_d  = 2.0
    freeboard = 0.984251968503937
  }
  overtopping {}
  outlet_velocity {
    limit = { default = 6.561679790026247 }
  }
}
