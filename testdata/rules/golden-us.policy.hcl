# The golden test criteria written in US customary units: every length and
# velocity of golden.policy.hcl divided by 0.3048 m/ft, and every stress
# divided by 47.880259 N/m² per lb/ft² (exact definitions), so that it must
# give the same findings as the SI policy on any model.
policy "golden-us" {
  units     = "us"
  reference = "golden test criteria"

  freeboard {
    minimum  = 0.9842519685039369
    fraction = 0.2
  }
  max_velocity {
    limit = { grass = 4.921259842519685, default = 9.84251968503937 }
  }
  min_velocity {
    events = ["q-low"]
    limit  = { grass = 1.9685039370078738 }
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
    minimum                   = 0.9842519685039369
  }
  shear_stress {
    limit = { grass = 0.12531260534743557 }
  }
}
