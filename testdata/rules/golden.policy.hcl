# Test policy for the golden rule models. Its numbers are test inputs chosen
# so that each rule passes or fails clearly on the uniform-flow model; they
# are not design criteria.
policy "golden" {
  units     = "si"
  reference = "golden test criteria"

  freeboard {
    minimum  = 0.3
    fraction = 0.2
  }
  max_velocity {
    limit = { grass = 1.5, default = 3.0 }
  }
  min_velocity {
    events = ["q-low"]
    limit  = { grass = 0.6 }
  }
  froude_band {
    avoid = [[0.44, 0.5]]
  }
  jump_containment {}
  jump_type {
    avoid = [[2.5, 4.5]]
  }
  superelevation {
    subcritical_coefficient   = 0.5
    supercritical_coefficient = 1.0
    minimum                   = 0.3
  }
  shear_stress {
    limit = { grass = 6.0 }
  }
}
