# chanlint built-in pack "baseline-us" (US customary units: ft, ft/s, lb/ft²).
#
# The baseline screening policy with every length, velocity and stress
# written natively in feet, with the values as the sources print them. The
# rules without units (froude_band, jump_containment, jump_type) and
# overtopping (no depth allowed) come from "baseline" unchanged. Every number names its source beside it or on the
# line above; "(from memory)" marks a value recalled rather than re-read, and
# "common practice" a value of the trade with no single published source.
#
# Lining words the limits use (a section's `lining`): concrete, riprap, grass,
# earth, clay, gravel, sand, shale, hardpan. Any other word, or none, gets
# `default` in an open channel; a closed conduit (circle, box) whose lining
# is not listed has no erosion limit (max_velocity, shear_stress).

policy "baseline-us" {
  units      = "us"
  extends    = "baseline"
  reference  = "chanlint baseline-us pack (published screening values, not a local design code)"
  exceptions = "report"

  freeboard {
    # 1.0 ft least freeboard: common practice (no published source).
    minimum = 1.0
    # 20 % of the flow depth: Chow, Open-Channel Hydraulics (1959) §7-6 says
    # 5 % to 30 % of the depth is commonly used (from memory).
    fraction = 0.2
    severity = "error"
  }

  # Permissible mean velocities for clear water (ft/s), Fortier & Scobey
  # (1926), reproduced in Chow 1959 Table 7-3.
  max_velocity {
    limit = {
      concrete = 20.0 # low end of the 20–30 ft/s common for concrete-lined flood channels (common practice)
      riprap   = 10.0 # screening value for placed riprap: common practice (no published source); size the stone by HEC-11
      grass    = 4.0  # grass mixture, easily eroded soil, slope 0–5 %: SCS-TP-61 (1954) in Chow 1959 Table 7-5 (from memory)
      earth    = 2.5  # ordinary firm loam, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      clay     = 3.75 # stiff clay, very colloidal, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      gravel   = 4.0  # coarse gravel, noncolloidal, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      sand     = 1.5  # fine sand, colloidal, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      shale    = 6.0  # shales and hardpans: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      hardpan  = 6.0  # shales and hardpans: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      default  = 2.5  # an unknown lining is treated as firm loam (earth), Fortier & Scobey 1926
    }
    severity = "error"
  }

  # min_velocity is not switched on: a self-cleansing velocity applies only
  # to the events a policy names (frequent flows, e.g. return_period =
  # [null, 2]) and the pack cannot know a model's events; see the review
  # pack.

  superelevation {
    # Δy = C·V²·T/(g·rc), rc the centreline radius, T the top width.
    subcritical_coefficient   = 0.5 # tranquil flow: USACE EM 1110-2-1601 (1994) (from memory)
    supercritical_coefficient = 1.0 # rapid flow, simple curve: USACE EM 1110-2-1601 (1994) (from memory)
    # The outer bank keeps the 1.0 ft freeboard above the raised surface:
    # EM 1110-2-1601 (1994) adds the bend rise to the freeboard (from memory).
    minimum  = 1.0
    severity = "error"
  }

  # Permissible shear stress on the bed, lb/ft², compared with the maximum
  # shear τd = γ·d·S. Riprap and grass: Chen & Cotton, FHWA HEC-15 (1988),
  # Table 2 (from memory), superseded by the 3rd edition (Kilgore & Cotton
  # 2005): check against it. Soils: the USBR (Lane 1955) conversion of
  # Fortier & Scobey's velocities printed in Chow 1959 Table 7-3 (from memory).
  shear_stress {
    limit = {
      concrete = null  # rigid lining: not limited by tractive stress (common practice)
      riprap   = 2.0   # rock riprap D50 = 6 in: HEC-15 (1988) Table 2 (from memory)
      grass    = 0.60  # retardance class D vegetation: HEC-15 (1988) Table 2 (from memory)
      earth    = 0.075 # ordinary firm loam, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      clay     = 0.26  # stiff clay, very colloidal, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      gravel   = 0.30  # coarse gravel, noncolloidal, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      sand     = 0.027 # fine sand, colloidal, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      shale    = 0.67  # shales and hardpans, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      hardpan  = 0.67  # shales and hardpans, clear water: USBR/Lane in Chow 1959 Table 7-3 (from memory)
      default  = 0.075 # an unknown open-channel lining is treated as firm loam (earth), USBR/Lane in Chow 1959 Table 7-3 (from memory)
    }
    severity = "error"
  }

  headwater {
    # HW/D of 1.5 at most: the upper end of the 1.2–1.5 commonly allowed for
    # a design flow (common practice, no published source); FHWA HDS-5
    # (2012) leaves the allowable headwater to site criteria (from memory).
    max_hw_d = 1.5
    # 1.0 ft below the shoulder, else the crest: common practice (no
    # published source).
    freeboard = 1.0
    severity  = "error"
  }

  # Outlet velocity before outlet protection (ft/s): FHWA HEC-14 (2006)
  # compares it with what the receiving channel withstands (from memory);
  # the values are max_velocity's above.
  outlet_velocity {
    limit = {
      concrete = 20.0 # as max_velocity for concrete (common practice)
      riprap   = 10.0 # screening value for placed riprap (common practice); size the apron by HEC-14
      grass    = 4.0  # SCS-TP-61 (1954) in Chow 1959 Table 7-5 (from memory)
      earth    = 2.5  # ordinary firm loam, clear water: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      clay     = 3.75 # stiff clay: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      gravel   = 4.0  # coarse gravel: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      sand     = 1.5  # fine sand: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      shale    = 6.0  # shales and hardpans: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      hardpan  = 6.0  # shales and hardpans: Fortier & Scobey 1926 (Chow 1959 Table 7-3)
      default  = 2.5  # an unknown receiving lining is treated as firm loam (earth), Fortier & Scobey 1926
    }
    severity = "warning"
  }
}
