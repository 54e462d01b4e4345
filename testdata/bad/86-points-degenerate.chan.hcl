# Points sections of no real size: a width of 1e-12 m, a depth of 1e-12 m
# below the lower end, banks 1e-12 m apart, and an elevation beyond the
# Earth's surface.
units = "si"
section "needle" {
  shape     = "points"
  points    = [[0, 1], [1e-12, 0], [2e-12, 1]] # want model "Section too narrow.*the width of the points"
  roughness = 0.03
}
section "film" {
  shape     = "points"
  points    = [[0, 1e-12], [5, 0], [10, 1e-12]] # want model "Section too shallow.*the depth below the lower end of the points of section \x22film\x22 is 1e-12 m"
  roughness = 0.03
}
section "banks" {
  shape     = "points"
  points    = [[0, 2], [5, 0], [10, 2]]
  banks     = [5, 5.000000000001] # want model "Main channel too narrow"
  roughness = 0.03
}
section "orbit" {
  shape     = "points"
  points    = [[0, 2], [5, 0], [10, 2e8]] # want model "Elevation out of range.*the elevation of point 3 of section \x22orbit\x22 is 2e\+08 m; elevations lie within ±20000 m"
  roughness = 0.03
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 400
  section = "needle"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
