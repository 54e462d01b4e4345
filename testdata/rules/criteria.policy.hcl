# Test policy for the criteria golden models. Its numbers are test inputs
# chosen so that each rule passes or fails clearly; they are not design
# criteria.
policy "criteria" {
  units     = "si"
  reference = "golden test criteria"

  side_slope {
    reach_classes = ["roadside-ditch"]
    minimum       = 3
  }
  bottom_width {
    minimum = 0.6
  }
  bed_slope {
    minimum = { grass = 0.005, concrete = 0.002 }
    maximum = 0.02
  }
  public_safety {
    reach_classes  = ["constructed"]
    depth          = 1.2
    depth_velocity = 1.0
  }
  bend_radius {
    multiple = 3
  }
}
