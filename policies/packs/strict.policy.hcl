# chanlint built-in pack "strict" (SI units): the baseline with tighter
# settings for a reviewer's second look. Only the blocks written here differ
# from "baseline"; each replaces baseline's block of the same rule entirely.
# Every number names its source beside it or on the line above.

policy "strict" {
  units     = "si"
  extends   = "baseline"
  reference = "chanlint strict pack (baseline with tighter screening values, not a local design code)"

  freeboard {
    # 0.3 m least freeboard, as baseline: common practice (no published source).
    minimum = 0.3
    # 30 % of the flow depth, the top of the 5 %–30 % range commonly used:
    # Chow, Open-Channel Hydraulics (1959) §7-6 (from memory).
    fraction = 0.3
    severity = "error"
  }

  # min_velocity is not switched on: a self-cleansing velocity applies only
  # to the events a policy names (frequent flows, e.g. return_period =
  # [null, 2]) and the pack cannot know a model's events; see the review
  # pack.

  froude_band {
    # Same band as baseline (common practice, usually cited to USACE
    # EM 1110-2-1601, from memory), reported as an error: near-critical flow
    # must be designed out.
    avoid    = [[0.86, 1.13]]
    severity = "error"
  }

  jump_type {
    # Oscillating jumps (F1 2.5–4.5, Peterka 1958) send waves far downstream
    # and are reported as errors (Peterka 1958, from memory).
    avoid    = [[2.5, 4.5]]
    severity = "error"
  }

  headwater {
    # HW/D of 1.2 at most, the lower end of the 1.2–1.5 commonly allowed
    # (common practice, no published source).
    max_hw_d  = 1.2
    freeboard = 0.3 # as baseline: common practice (no published source)
    severity  = "error"
  }
}
