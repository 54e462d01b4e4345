# Example: a county's drainage criteria in US units, built on the baseline
# pack. Invented agency and numbers (a demo, not real criteria): the blocks
# below replace the pack's blocks of the same rule; every other rule keeps
# the pack's settings, converted to feet.
policy "millbrook-county-drainage" {
  units     = "us"
  extends   = "baseline"
  reference = "Millbrook County Drainage Criteria (demo), ch. 5"

  freeboard {
    minimum  = 1.0
    fraction = 0.25
    events   = ["q100"]
  }

  max_velocity {
    limit = { concrete = 25.0, riprap = 10.0, grass = 5.0, default = 3.0 }
  }

  min_velocity {
    return_period = [null, 2] # frequent flows
    limit         = 2.5
  }
}
