# A hostile submittal for the escaping test (invented).
units = "si"
title = "<script>alert('title')</script> Quarry & \"Mill\" <b>bold</b>"

section "s<script>x</script>" {
  shape        = "rectangle"
  bottom_width = 2.0
  height       = 1.0
  roughness    = 0.015
  lining       = "<img src=x onerror=alert(1)>&amp;"
}

reach "r<script>alert(\"reach\")</script>&'" {
  from    = "a<svg onload=alert(1)>"
  to      = "b\" onmouseover=\"alert(1)"
  length  = 100
  section = "s<script>x</script>"
  slope   = 0.002
}

event "e</title><script>alert(2)</script>" {
  inflow = { "r<script>alert(\"reach\")</script>&'" = 1.0 }
  outlet = { condition = "normal" }
}

exception "freeboard" {
  reach        = "r<script>alert(\"reach\")</script>&'"
  from_station = 0
  to_station   = 100
  reason       = "</td></tr></table><script>alert('reason')</script> & \"quoted\" ]]> `tick` | pipe"
}
