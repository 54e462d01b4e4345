# Golden model for FromDiagnostics: a file the model language rejects
# because of one misspelt attribute, which also leaves the section without
# its width. Each "# want model - -..-" names a diagnostic on the next line
# that is not a comment. An invented culvert.

units = "si"

# want model - -..-
section "box" {
  shape        = "rectangle"
  # want model - -..-
  widht        = 2.0
  height       = 1.5
  roughness    = 0.013
}

reach "culvert" {
  from    = "inlet"
  to      = "outlet"
  length  = 30
  section = "box"
  slope   = 0.005
}

event "q" {
  inflow = { "culvert" = 2.0 }
  outlet = { condition = "normal" }
}
