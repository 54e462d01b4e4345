# Segments whose stations nearly meet: a piece of 1e-9 m of the reach's
# own section left at the downstream end, and one of 1e-10 m between two
# segments.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
section "narrow" {
  shape        = "rectangle"
  bottom_width = 1.5
  height       = 1.2
  roughness    = 0.015
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
  segment {
    from_station = 100
    to_station   = 200
    section      = "narrow"
  }
  segment {
    from_station = 200.0000000001 # want model "Sliver between section changes.*from_station of this segment of reach \x22main\x22 is 200.0000000001, which leaves 1e-10 m of the reach's own section after the segment of line"
    to_station   = 399.999999999 # want model "Sliver between section changes.*to_station .* at the downstream end"
    section      = "narrow"
  }
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
