# A gate opened 1e-9 m (closed, in all but name) and one whose jet would
# contract to a tenth of its opening.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
reach "main" {
  from    = "top"
  to      = "mid"
  length  = 400
  section = "lined"
  slope   = 0.002
}
reach "lower" {
  from    = "mid"
  to      = "outfall"
  length  = 400
  section = "lined"
  slope   = 0.002
}
gate "head" {
  reach   = "main"
  opening = 1e-9 # want model "Dimension too small.*opening of gate \x22head\x22 is 1e-09 m; the least accepted is 0.01 m"
}
gate "check" {
  reach       = "lower"
  opening     = 0.3
  contraction = 0.1 # want model "Contraction out of range.*Borda"
}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
