# Test policy for overtop-once: freeboard and bend freeboard of 0.3 m.
policy "overtop-once" {
  units = "si"
  freeboard {
    minimum = 0.3
  }
  superelevation {
    minimum = 0.3
  }
}
