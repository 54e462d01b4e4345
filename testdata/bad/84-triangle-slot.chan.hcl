# A triangle whose side slope of 1e-9 makes it a slot 2.4e-9 m wide at
# its full height.
units = "si"
section "lined" {
  shape      = "triangle"
  side_slope = 1e-9 # want model "Section too narrow.*the top width at full height \(2 × side_slope × height\) of section \x22lined\x22 is 2.4e-09 m"
  height     = 1.2
  roughness  = 0.015
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
