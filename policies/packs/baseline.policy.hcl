# chanlint built-in pack "baseline" (SI units: m, m/s, N/m²).
#
# A conservative screening policy built from published guidance. Every number
# names its source beside it or on the line above. "(from memory)" marks a
# value recalled rather than re-read from the source; "common practice" marks
# a value of the trade with no single published source. These are screening
# values, not a local design code: extend this pack and replace the blocks
# your criteria set differently.
#
# Lining words the limits use (a section's `lining`): concrete, riprap, grass,
# earth, clay, gravel, sand, shale, hardpan. Any other word, or none, gets
# `default` in an open channel; a closed conduit (circle, box) whose lining
# is not listed has no erosion limit (max_velocity, shear_stress).

policy "baseline" {
  units      = "si"
  reference  = "chanlint baseline pack (published screening values, not a local design code)"
  exceptions = "report"

  freeboard {
    # 0.3 m (about 1 ft) least freeboard: common practice (no published source).
    minimum = 0.3
    # 20 % of the flow depth: Chow, Open-Channel Hydraulics (1959) §7-6 says
    # 5 % to 30 % of the depth is commonly used (from memory); 0.2 is in the
    # upper half of that range. (USBR canals use F = √(C·y), Chow 1959 §7-6.)
    fraction = 0.2
    severity = "error"
  }

  # Permissible mean velocities for clear water, Fortier & Scobey (1926),
  # reproduced in Chow 1959 Table 7-3 (ft/s, converted at 0.3048 m/ft and
  # rounded to 0.01 m/s). Clear-water values are the lower, conservative set.
  max_velocity {
    limit = {
      concrete = 6.0  # ≈ 20 ft/s, low end of the 20–30 ft/s common for concrete-lined flood channels (common practice)
      riprap   = 3.0  # ≈ 10 ft/s screening value for placed riprap: common practice (no published source); size the stone by HEC-11
      grass    = 1.22 # 4 ft/s grass mixture, easily eroded soil, slope 0–5 %: SCS-TP-61 (1954) in Chow 1959 Table 7-5 (from memory)
      earth    = 0.76 # 2.5 ft/s ordinary firm loam, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      clay     = 1.14 # 3.75 ft/s stiff clay, very colloidal, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      gravel   = 1.22 # 4.0 ft/s coarse gravel, noncolloidal, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      sand     = 0.46 # 1.5 ft/s fine sand, colloidal, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      shale    = 1.83 # 6.0 ft/s shales and hardpans: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      hardpan  = 1.83 # 6.0 ft/s shales and hardpans: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      default  = 0.76 # an unknown lining is treated as firm loam (earth), Fortier & Scobey 1926
    }
    severity = "error"
  }

  # min_velocity is not switched on: a self-cleansing velocity applies only
  # to the events a policy names (frequent flows, e.g. return_period =
  # [null, 2]) and the pack cannot know a model's events; see the review
  # pack.

  froude_band {
    # Unstable near-critical flow, Froude numbers of roughly 0.86–1.13:
    # common practice, usually cited to the flood-control channel guidance
    # of the U.S. Army Corps of Engineers (EM 1110-2-1601, from memory; the
    # page is not confirmed). Many local manuals avoid a wider band (for
    # example 0.7–1.3): set your own.
    avoid    = [[0.86, 1.13]]
    severity = "warning"
  }

  jump_containment {
    severity = "error"
  }

  jump_type {
    # Oscillating jumps, upstream Froude number 2.5–4.5: Peterka, USBR
    # Engineering Monograph 25 (1958); Chow 1959 ch. 15.
    avoid    = [[2.5, 4.5]]
    severity = "warning"
  }

  superelevation {
    # Δy = C·V²·T/(g·rc), rc the centreline radius, T the top width.
    subcritical_coefficient   = 0.5 # tranquil flow: USACE EM 1110-2-1601 (1994) (from memory)
    supercritical_coefficient = 1.0 # rapid flow, simple curve: USACE EM 1110-2-1601 (1994) (from memory)
    # The outer bank keeps the 0.3 m freeboard above the raised surface:
    # EM 1110-2-1601 (1994) adds the bend rise to the freeboard (from memory).
    minimum  = 0.3
    severity = "error"
  }

  # Permissible shear stress on the bed, N/m² (lb/ft² × 47.88, rounded),
  # compared with the maximum shear τd = γ·d·S (quantity = "maximum").
  # Riprap and grass: Chen & Cotton, FHWA HEC-15 (1988), Table 2 (from
  # memory); that edition was superseded by Kilgore & Cotton's 3rd edition
  # (2005), which gives the permissible shear of riprap from its D50 and of
  # vegetation from its cover: check these values against it.
  # Soils: the tractive-force column of Chow 1959 Table 7-3 is the USBR
  # (Lane 1955) conversion of Fortier & Scobey's velocities, not figures of
  # Fortier & Scobey's own (from memory).
  shear_stress {
    limit = {
      concrete = null # rigid lining: not limited by tractive stress (common practice)
      riprap   = 96   # 2.0 lb/ft², rock riprap D50 = 6 in (150 mm): HEC-15 (1988) Table 2 (from memory)
      grass    = 28.7 # 0.60 lb/ft², retardance class D vegetation: HEC-15 (1988) Table 2 (from memory)
      earth    = 3.6  # 0.075 lb/ft² ordinary firm loam, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      clay     = 12.4 # 0.26 lb/ft² stiff clay, very colloidal, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      gravel   = 14.4 # 0.30 lb/ft² coarse gravel, noncolloidal, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      sand     = 1.3  # 0.027 lb/ft² fine sand, colloidal, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      shale    = 32   # 0.67 lb/ft² shales and hardpans, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      hardpan  = 32   # 0.67 lb/ft² shales and hardpans, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      default  = 3.6  # an unknown open-channel lining is treated as firm loam (earth), USBR/Lane in Chow 1959 Table 7-3 (from memory)
    }
    severity = "error"
  }

  # Culverts (FHWA HDS-5, Hydraulic Design of Highway Culverts, 3rd ed. 2012):
  # HDS-5 leaves the allowable headwater to site criteria (from memory).
  headwater {
    # HW/D of 1.5 at most: the upper end of the 1.2–1.5 that highway agencies
    # commonly allow for a design flow (common practice, no published source).
    max_hw_d = 1.5
    # 0.3 m (about 1 ft) below the shoulder, else the crest: common practice
    # (no published source).
    freeboard = 0.3
    severity  = "error"
  }

  overtopping {
    # The road stays dry in every event: a screening stance; the road owner
    # sets the events and depths allowed (common practice, no published
    # source). Extend and list the design events, or allow a depth.
    max_depth = 0
    severity  = "error"
  }

  # Culvert outlet velocity above which the receiving channel needs outlet
  # protection: FHWA HEC-14 (2006) compares it with the velocity the channel
  # withstands (from memory); the values are max_velocity's permissible
  # velocities above (Fortier & Scobey 1926, Chow 1959 Table 7-3).
  outlet_velocity {
    limit = {
      concrete = 6.0  # ≈ 20 ft/s, as max_velocity for concrete (common practice)
      riprap   = 3.0  # ≈ 10 ft/s screening value for placed riprap (common practice); size the apron by HEC-14
      grass    = 1.22 # 4 ft/s, SCS-TP-61 (1954) in Chow 1959 Table 7-5 (from memory)
      earth    = 0.76 # 2.5 ft/s ordinary firm loam, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      clay     = 1.14 # 3.75 ft/s stiff clay: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      gravel   = 1.22 # 4.0 ft/s coarse gravel: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      sand     = 0.46 # 1.5 ft/s fine sand: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      shale    = 1.83 # 6.0 ft/s shales and hardpans: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      hardpan  = 1.83 # 6.0 ft/s shales and hardpans: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      default  = 0.76 # an unknown receiving lining is treated as firm loam (earth), Fortier & Scobey 1926
    }
    severity = "warning"
  }
}
