# Magnitudes beyond any channel: a reach 5e7 m long (longer than the
# Earth's circumference), a bed 2e5 m wide, a points section 3e5 m across
# a triangle 180 km wide at its top and an outlet 5e5 m deep.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2e5 # want model "Dimension too large.*bottom_width of section \x22lined\x22 is 200000 m; the most accepted is 100000 m"
  height       = 1.2
  roughness    = 0.015
}
section "valley" {
  shape     = "points"
  points    = [[0, 5], [150000, 0], [300000, 5]] # want model "Section too wide.*is 300000 m; the most accepted is 100000 m"
  roughness = 0.05
}
section "sheet" {
  shape      = "triangle"
  side_slope = 900 # want model "Section too wide.*the top width at full height \(2 × side_slope × height\) of section \x22sheet\x22 is 180000 m"
  height     = 100
  roughness  = 0.05
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 5e7 # want model "Length too large.*length of reach \x22main\x22 is 5e\+07 m; the most accepted is 1e\+07 m"
  section = "valley"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 5e5 } # want model "Depth too large.*outlet depth of event \x22q100\x22 is 500000 m"
}
