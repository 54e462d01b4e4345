# Test policy for the culvert golden model. Its numbers are test inputs
# chosen so that each culvert rule passes in q-small and fails in q-big;
# they are not design criteria.
policy "golden-culvert" {
  units     = "si"
  reference = "golden culvert criteria"

  headwater {
    max_hw_d  = 2.0
    freeboard = 0.3
  }
  overtopping {}
  outlet_velocity {
    limit = { default = 2.0 }
  }
}
