# A misspelt argument: HCL suggests the right name ("Did you mean") and the real one is reported missing.
units = "si"
section "lined" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.2
  roughness    = 0.015
  lining       = "concrete"
}
reach "main" { # want model "Missing required argument"
  from    = "top"
  to      = "outfall"
  lenght  = 400 # want model "Unsupported argument"
  section = "lined"
  slope   = 0.002

}
event "q100" {
  inflow = { "main" = 3.0 }
  outlet = { depth = 0.8 }
}
