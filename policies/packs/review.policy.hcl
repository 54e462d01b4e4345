# chanlint built-in pack "review" (SI units): the strict pack plus the
# criteria a reviewer applies from a local drainage manual, by storm class
# and by facility class, with the manual's own numbers left to the policy
# that extends this pack. Every number names its source beside it or on the
# line above. Sections refer to the parts of this pack, not to a manual.

policy "review" {
  units     = "si"
  extends   = "strict"
  version   = "2026.1"
  # A reviewer's pack: a model's design exceptions count only where the
  # reviewer's --approvals file accepts them.
  exceptions = "approved"
  reference = "chanlint review pack (strict screening plus facility-class criteria, not a local design code)"

  min_velocity {
    # Self-cleansing at frequent flows only, the 1- to 2-year event that
    # carries most of the sediment over a channel's life: common practice
    # (no published source). Grass and natural linings get no default.
    return_period = [null, 2]
    limit = {
      # 3 ft/s, the higher self-cleansing velocity some agencies require of
      # lined channels and storm drains (FHWA HEC-22, 3rd ed. 2009, from memory).
      concrete = 0.9
      sand     = null # fine sand cannot meet a self-cleansing velocity below its maximum (Fortier & Scobey 1926)
      default  = 0.6  # 2 ft/s self-cleansing velocity: common practice for sewers, ASCE Manual of Practice 37 (from memory)
    }
    severity = "warning"
    section  = "R1"
  }

  side_slope {
    shapes = ["trapezoid", "triangle", "points"]
    # 3H:1V or flatter on open earth, grass and points banks for mowing and
    # stability: common practice (no published source).
    minimum = 3
    section = "R2.1"
  }

  side_slope {
    reach_classes = ["roadside-ditch"]
    shapes        = ["trapezoid", "triangle", "points"]
    # Roadside foreslopes 4H:1V or flatter are recoverable for an errant
    # vehicle: AASHTO Roadside Design Guide, 4th ed. 2011 (from memory).
    minimum = 4
    section       = "R2.2"
  }

  bend_radius {
    # Centreline radius at least 3 × the water-surface width: USACE
    # EM 1110-2-1601, Hydraulic Design of Flood Control Channels, 1994 (from memory).
    multiple = 3
    section  = "R3"
  }
}
