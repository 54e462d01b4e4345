package report

// addLegend lists only what is drawn, in rows that wrap to the frame's
// width under the station axis, and sets the plot's height to fit them.
func (p *Plot) addLegend() {
	fr := p.Frame
	x := fr.X
	y := fr.Bottom() + marginB - 16
	add := func(kind, label string) {
		w := 30 + float64(len([]rune(label)))*charW + 18
		if x > fr.X && x+w-18 > fr.Right() {
			x = fr.X
			y += legendRowH
		}
		p.Legend = append(p.Legend, LegendItem{X: round1(x), Y: round1(y), Kind: kind, Label: label})
		x += w
	}
	if p.Bed != "" {
		add("bed", "bed (invert)")
	}
	if p.WSE != "" {
		add("wse", "water surface")
	}
	if p.Existing != "" {
		add("existing", "existing water surface")
	}
	if p.Envelope != "" {
		add("envelope", "water-surface envelope, hatched")
	}
	if p.Critical != "" {
		add("critical", "critical depth")
	}
	if p.Energy != "" {
		add("energy", "energy grade")
	}
	if p.Bank != "" {
		add("bank", p.BankLabel)
	}
	if len(p.Culverts) > 0 {
		add("pool", "culvert headwater")
	}
	if p.HasRoad {
		add("road", "road crest")
	}
	if p.HasJmp {
		add("jump", "hydraulic jump")
	}
	if p.HasBasin {
		add("basin", "basin")
	}
	if len(p.Gates) > 0 {
		add("gate", "gate")
	}
	if p.HasBend {
		add("bend", "bend")
	}
	for _, b := range p.Boundaries {
		if !b.First {
			add("boundary", "reach boundary")
			break
		}
	}
	hatch := map[string]string{"error": "cross-hatched", "warning": "hatched", "info": "plain"}
	for _, sev := range []string{"error", "warning", "info"} {
		if p.failing[sev] {
			add("span-"+sev, sev+" span, "+hatch[sev]+" (#N: finding row)")
		}
	}
	if p.HasExcepted {
		add("excepted", "excepted span")
	}
	p.H = round1(y + 16)
}
