package model

import (
	"cmp"
	"fmt"
	"slices"

	"github.com/hashicorp/hcl/v2"
)

// index registers named objects of one kind and reports duplicates at the
// second name, mentioning the line of the first.
func index[T any](d *decoder, kind string, items []T, name func(T) (string, hcl.Range)) map[string]T {
	m := make(map[string]T, len(items))
	for _, it := range items {
		n, rng := name(it)
		if n == "" {
			continue
		}
		if f, dup := m[n]; dup {
			_, first := name(f)
			d.Errorf(rng, "Duplicate name",
				"A %s named %q is already defined at line %d; rename one of them.", kind, n, first.Start.Line)
			continue
		}
		m[n] = it
	}
	return m
}

func names[T any](m map[string]T) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	slices.Sort(out)
	return out
}

// maxSuggestions bounds the "did you mean" searches of one file, which cost
// a comparison with every defined name, and suggestCells the edit-distance
// work they may do together, so that a hostile file full of long unknown
// names stays fast.
const (
	maxSuggestions = 100
	suggestCells   = 20_000_000
)

// suggestName proposes the closest defined section or reach name.
func (d *decoder) suggestName(got, kind string) string {
	if d.suggestions >= maxSuggestions {
		return ""
	}
	d.suggestions++
	if d.names == nil {
		d.names = map[string][]string{"reach": names(d.reaches), "section": names(d.sections)}
		d.cells = suggestCells
	}
	return suggestWithin(got, d.names[kind], &d.cells)
}

// lookupReach resolves a reach reference at rng.
func (d *decoder) lookupReach(name string, rng hcl.Range, what owner) *Reach {
	if name == "" {
		return nil
	}
	r, ok := d.reaches[name]
	if !ok {
		d.Errorf(rng, "Unknown reach", "%s names reach %q, which is not defined; use one of the reach names of this file.%s",
			what, name, d.suggestName(name, "reach"))
	}
	return r
}

// checkSpan checks that a station range lies on the reach.
func (d *decoder) checkSpan(r *Reach, src Src, from, to float64, what owner) bool {
	if r == nil || r.Length <= 0 {
		return false
	}
	ok := true
	for _, s := range []struct {
		attr string
		v    float64
	}{{"from_station", from}, {"to_station", to}} {
		if s.v > r.Length {
			d.Errorf(src.At(s.attr), "Station outside the reach",
				"%s of %s is %g, beyond the end of reach %q (length %g); stations run from 0 to the reach length.",
				s.attr, what, s.v, r.Name, r.Length)
			ok = false
		}
	}
	return ok && from < to
}

func byStation[T any](items []T, from func(T) float64) {
	slices.SortStableFunc(items, func(a, b T) int { return cmp.Compare(from(a), from(b)) })
}

// resolve checks names and references (sections, reaches named by
// structures, exceptions and events) and attaches gates, basins, bends and
// segments to their reaches.
func (d *decoder) resolve() {
	m := d.m
	d.sections = index(d, "section", m.Sections, func(s *Section) (string, hcl.Range) { return s.Name, s.LabelRange })
	d.reaches = index(d, "reach", m.Reaches, func(r *Reach) (string, hcl.Range) { return r.Name, r.LabelRange })
	index(d, "gate", m.Gates, func(g *Gate) (string, hcl.Range) { return g.Name, g.LabelRange })
	index(d, "culvert", m.Culverts, func(c *Culvert) (string, hcl.Range) { return c.Name, c.LabelRange })
	index(d, "basin", m.Basins, func(b *Basin) (string, hcl.Range) { return b.Name, b.LabelRange })
	index(d, "bend", m.Bends, func(b *Bend) (string, hcl.Range) { return b.Name, b.LabelRange })
	index(d, "event", m.Events, func(e *Event) (string, hcl.Range) { return e.Name, e.LabelRange })

	// section resolves the section named by the section attribute of
	// src (whose range is only looked up for a message).
	section := func(name string, src *Src, what owner) *Section {
		s, ok := d.sections[name]
		if !ok && name != "" {
			d.Errorf(src.At("section"), "Unknown section", "%s uses section %q, which is not defined; define it or use one of the section names of this file.%s",
				what, name, d.suggestName(name, "section"))
		}
		return s
	}
	for _, r := range m.Reaches {
		what := ownerOf("reach", r.Name)
		r.Section = section(r.SectionName, &r.Src, what)
		for _, s := range r.Segments {
			sw := ownerOf("a segment of reach", r.Name)
			s.Section = section(s.SectionName, &s.Src, sw)
			d.checkSpan(r, s.Src, s.FromStation, s.ToStation, sw)
		}
		byStation(r.Segments, func(s *Segment) float64 { return s.FromStation })
		for i := 1; i < len(r.Segments); i++ {
			prev, s := r.Segments[i-1], r.Segments[i]
			if s.FromStation < prev.ToStation {
				d.Errorf(s.At("from_station"), "Overlapping segments",
					"This segment of reach %q starts at station %g, inside the segment of line %d (stations %g to %g); make them meet end to end.",
					r.Name, s.FromStation, prev.DefRange.Start.Line, prev.FromStation, prev.ToStation)
			}
		}
		d.checkSlivers(r)
	}
	for _, g := range m.Gates {
		g.Reach = d.lookupReach(g.ReachName, g.At("reach"), ownerOf("gate", g.Name))
		if g.Reach == nil {
			continue
		}
		if prev := g.Reach.Gate; prev != nil {
			d.Errorf(g.At("reach"), "More than one gate on a reach",
				"Reach %q already has gate %q (line %d) at its upstream end; a reach takes one gate. Split the reach at the second gate.",
				g.ReachName, prev.Name, prev.DefRange.Start.Line)
			continue
		}
		g.Reach.Gate = g
		if s := g.Reach.SectionAt(0); s != nil && s.Height > 0 && g.Opening >= s.Height {
			d.Warnf(g.At("opening"), "Gate opening above the section",
				"gate %q opens %g %s, not less than the height %g of section %q at the head of reach %q, so it cannot hold water back. Check the opening.",
				g.Name, g.Opening, d.m.Units.Length(), s.Height, s.Name, g.ReachName)
		}
	}
	d.resolveCulverts()
	for _, b := range m.Basins {
		what := ownerOf("basin", b.Name)
		b.Reach = d.lookupReach(b.ReachName, b.At("reach"), what)
		if d.checkSpan(b.Reach, b.Src, b.FromStation, b.ToStation, what) {
			b.Reach.Basins = append(b.Reach.Basins, b)
		}
	}
	for _, b := range m.Bends {
		what := ownerOf("bend", b.Name)
		b.Reach = d.lookupReach(b.ReachName, b.At("reach"), what)
		if d.checkSpan(b.Reach, b.Src, b.FromStation, b.ToStation, what) {
			b.Reach.Bends = append(b.Reach.Bends, b)
		}
	}
	for _, e := range m.Exceptions {
		what := ownerOf("exception", e.Rule)
		e.Reach = d.lookupReach(e.ReachName, e.At("reach"), what)
		d.checkSpan(e.Reach, e.Src, e.FromStation, e.ToStation, what)
	}
	for _, ev := range m.Events {
		for i := range ev.Inflows {
			in := &ev.Inflows[i]
			in.Reach = d.lookupReach(in.ReachName, in.Range, ownerOf("The inflow of event", ev.Name))
		}
		for i := range ev.Entrances {
			en := &ev.Entrances[i]
			en.Reach = d.lookupReach(en.ReachName, en.Range, ownerOf("The entrance of event", ev.Name))
		}
	}
	d.resolveLosses()
	for _, r := range m.Reaches {
		byStation(r.Basins, func(b *Basin) float64 { return b.FromStation })
		byStation(r.Bends, func(b *Bend) float64 { return b.FromStation })
		for i := 1; i < len(r.Basins); i++ {
			if prev, b := r.Basins[i-1], r.Basins[i]; b.FromStation < prev.ToStation {
				d.Warnf(b.At("from_station"), "Overlapping basins",
					"Basin %q overlaps basin %q (line %d) on reach %q; they are treated as one hardened zone. Merge them into one block.",
					b.Name, prev.Name, prev.DefRange.Start.Line, r.Name)
			}
		}
		for i := 1; i < len(r.Bends); i++ {
			if prev, b := r.Bends[i-1], r.Bends[i]; b.FromStation < prev.ToStation {
				d.Errorf(b.At("from_station"), "Overlapping bends",
					"Bend %q overlaps bend %q (line %d) on reach %q; a station has one centreline radius. Make the bends meet end to end.",
					b.Name, prev.Name, prev.DefRange.Start.Line, r.Name)
			}
		}
	}
}

// checkSlivers refuses a piece of a reach's own section shorter than
// MinLength that its segments leave at either end or between two of
// them (segments sorted by station): stations that nearly meet are a slip
// for stations that meet.
func (d *decoder) checkSlivers(r *Reach) {
	least := MinLength.In(d.m.Units)
	if r.Length < least {
		return
	}
	sliver := func(s *Segment, attr string, from, to float64, where string) {
		if gap := to - from; gap > 0 && shorter(from, to, least) {
			d.Errorf(s.At(attr), "Sliver between section changes",
				"%s of this segment of reach %q is %g, which leaves %.3g%s of the reach's own section %s; the least piece accepted is %g%s: %s. Make the stations meet exactly, or leave a real piece between them.",
				attr, r.Name, stationOf(attr, s), gap, d.unitSuffix(), where, least, d.unitSuffix(), whyLength)
		}
	}
	for i, s := range r.Segments {
		if s.ToStation > r.Length || s.FromStation >= s.ToStation {
			return // reported already
		}
		if i == 0 {
			sliver(s, "from_station", 0, s.FromStation, "at the upstream end")
		} else if prev := r.Segments[i-1]; prev.ToStation <= s.FromStation {
			sliver(s, "from_station", prev.ToStation, s.FromStation, fmt.Sprintf("after the segment of line %d", prev.DefRange.Start.Line))
		}
		if i == len(r.Segments)-1 {
			sliver(s, "to_station", s.ToStation, r.Length, "at the downstream end")
		}
	}
}

// stationOf is a segment's from_station or to_station.
func stationOf(attr string, s *Segment) float64 {
	if attr == "from_station" {
		return s.FromStation
	}
	return s.ToStation
}
