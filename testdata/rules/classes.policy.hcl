# Test policy for the selector golden model: criteria by storm class and by
# facility class. Its numbers are test inputs chosen to pass or fail clearly
# on the model; they are not design criteria.
policy "classes" {
  units     = "si"
  reference = "golden test manual"
  version   = "2026.1"

  freeboard {
    minimum = 0.3
    section = "4.1"
  }
  freeboard {
    return_period = [50, null]
    minimum       = 0.6
    section       = "4.2"
  }
  freeboard {
    return_period = [50, null]
    reach_classes = ["roadside-ditch"]
    minimum       = 0.5
    section       = "4.3"
  }
  freeboard {
    return_period = [null, 20]
    reach_classes = ["roadside-ditch"]
    minimum       = 0.8
    section       = "4.4"
  }
  freeboard {
    return_period = [null, 20]
    reach_classes = ["natural-stream"]
    minimum       = 0.9
    section       = "4.5"
  }

  max_velocity {
    limit = 3.0
  }
  max_velocity {
    event_classes = ["major"]
    limit         = 1.4
    section       = "6.2"
  }
}
