# A US-unit culvert with no diameter: messages speak in feet.
units = "us"
section "pipe" {
  shape     = "circle"
  diameter  = 0 # want model "Value must be positive"
  roughness = 0.013
}
reach "main" {
  from    = "top"
  to      = "outfall"
  length  = 1200
  section = "pipe"
  slope   = 0.002
}
event "q100" {
  inflow = { "main" = 60 }
  outlet = { depth = 2.5 }
}
