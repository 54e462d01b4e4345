# Station ranges 1e-12 m long: a segment, a basin, a bend and an
# exception that cover no real stretch.
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
    to_station   = 100.000000000001 # want model "Station range too short.*the station range 100 to 100.000000000001 of a segment of reach \x22main\x22 is 9.95e-13 m; the least accepted is 0.001 m"
    section      = "narrow"
  }
}
basin "pad" {
  reach        = "main"
  from_station = 10
  to_station   = 10.000000000001 # want model "Station range too short"
}
bend "kink" {
  reach        = "main"
  from_station = 50
  to_station   = 50.000000000001 # want model "Station range too short"
  radius       = 30
}
exception "freeboard" {
  reach        = "main"
  from_station = 200
  to_station   = 200.000000000001 # want model "Station range too short"
  reason       = "Reviewed by the county engineer, who accepts the low bank here."
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
