// Package revdiff compares two revisions of a model solved and checked
// under one policy: the findings that are new, fixed or changed, how the
// water surface, the velocity and the freeboard moved along every reach
// and event the two share, the reaches added or removed, and the no_rise
// criterion, which only a comparison can judge.
package revdiff

import (
	"cmp"
	"math"
	"slices"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/baseline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
)

// Change is a finding present in both revisions whose value or span moved.
type Change struct {
	Old, New rules.Finding
}

// Extreme is the largest change of one quantity in one direction along a
// reach, and the station of the proposed model where it occurs.
type Extreme struct {
	Delta   float64
	Station float64
}

// Profile is how one reach moved in one event, at the proposed model's
// computed points that lie within the existing reach.
type Profile struct {
	Event, Reach string
	// Compared is the number of points compared; 0 when the reach is dry
	// in either revision.
	Compared int
	// Largest rise and fall of the water surface, increase and decrease
	// of the velocity, loss and gain of freeboard (freeboard only where
	// both revisions know the top of bank), outside the spans between the
	// toes of the jumps that moved (see Jumps).
	Rise, Fall         Extreme
	Faster, Slower     Extreme
	LessFree, MoreFree Extreme
	HasFreeboard       bool
	// Stations, OldWSE and NewWSE are the compared points, for a plot of
	// both profiles. Across gives for each the index in Jumps of the moved
	// jump whose toes it lies between, or −1; those points count in the
	// move, not in the extremes above.
	Stations, OldWSE, NewWSE []float64
	Across                   []int
	// Jumps are the hydraulic jumps of the reach that moved, appeared or
	// disappeared (JumpMove), in station order.
	Jumps []JumpMove
}

// Diff is the comparison of two revisions of a model.
type Diff struct {
	OldFile, NewFile string // file names as printed
	Units            model.Units
	// Invalid is true when either revision could not be read, parsed or
	// solved; the comparison is then only of their findings.
	Invalid bool
	// Findings failing in the proposed revision and not in the existing
	// one, failing before and not now, and failing in both with another
	// value or span. Findings covered by a design exception are left out
	// of all three: they fail neither revision.
	New, Fixed []rules.Finding
	Changed    []Change
	// Profiles per event and reach present in both, in the proposed
	// model's order.
	Profiles []Profile
	// Reaches added to and removed from the network, by name.
	Added, Removed []string
	// NoRise are the findings of the no_rise criterion (also counted in
	// New).
	NoRise []rules.Finding
}

// Compare compares the existing revision old with the proposed one new,
// both checked with Keep.Solved under pol (nil: no no_rise criterion).
func Compare(old, new *pipeline.Result, pol *policies.Policy) *Diff {
	d := &Diff{OldFile: old.File.Name, NewFile: new.File.Name, Units: new.Units, Invalid: old.Invalid || new.Invalid}
	d.compareFindings(old.Findings, new.Findings)
	if old.Model == nil || new.Model == nil || old.Solution == nil || new.Solution == nil {
		return d
	}
	d.compareNetworks(old.Model, new.Model)
	d.compareProfiles(old.Solution, new.Solution)
	if pol != nil {
		d.NoRise = noRise(new.Model, d.Profiles, old.Solution, new.Solution, pol)
		d.New = append(d.New, d.NoRise...)
		slices.SortStableFunc(d.New, func(a, b rules.Finding) int { return rules.Compare(&a, &b) })
	}
	return d
}

// failing keeps the findings that are not covered by an exception, moved
// to file (rules.Finding.Rename) so that both revisions share the
// proposed file's name.
func failing(fs []rules.Finding, file string) []rules.Finding {
	var out []rules.Finding
	for _, f := range fs {
		if f.Excepted {
			continue
		}
		f.Rename(file)
		out = append(out, f)
	}
	return out
}

// compareFindings matches the findings of the two revisions as a baseline
// matches a run (rule, reach, event, severity, message without numbers,
// span within its tolerance).
func (d *Diff) compareFindings(oldFs, newFs []rules.Finding) {
	olds, news := failing(oldFs, d.NewFile), failing(newFs, d.NewFile)
	known := baseline.Of(olds)
	matches, stale := known.Compare(news)
	for i, m := range matches {
		f := news[i]
		if m.Entry == nil {
			d.New = append(d.New, f)
			continue
		}
		if o, ok := findEntry(olds, m.Entry); ok && moved(&o, &f) {
			d.Changed = append(d.Changed, Change{Old: o, New: f})
		}
	}
	for _, e := range stale {
		if o, ok := findEntry(olds, &e); ok {
			d.Fixed = append(d.Fixed, o)
		}
	}
}

// findEntry is the finding of fs that an entry was recorded from.
func findEntry(fs []rules.Finding, e *baseline.Entry) (rules.Finding, bool) {
	for _, f := range fs {
		if baseline.Records(e, &f) {
			return f, true
		}
	}
	return rules.Finding{}, false
}

// moved reports whether a matched finding's value or span changed beyond
// the rounding of its message.
func moved(o, n *rules.Finding) bool {
	const eps = 5e-4
	return o.HasValue != n.HasValue || math.Abs(o.Value-n.Value) > eps || math.Abs(o.Limit-n.Limit) > eps ||
		o.HasSpan != n.HasSpan || math.Abs(o.FromStation-n.FromStation) > 0.05 || math.Abs(o.ToStation-n.ToStation) > 0.05
}

// compareNetworks lists the reaches added and removed.
func (d *Diff) compareNetworks(old, new *model.Model) {
	has := func(m *model.Model, name string) bool {
		return slices.ContainsFunc(m.Reaches, func(r *model.Reach) bool { return r.Name == name })
	}
	for _, r := range new.Reaches {
		if !has(old, r.Name) {
			d.Added = append(d.Added, r.Name)
		}
	}
	for _, r := range old.Reaches {
		if !has(new, r.Name) {
			d.Removed = append(d.Removed, r.Name)
		}
	}
}

// compareProfiles compares every reach of every event both revisions have.
func (d *Diff) compareProfiles(old, new *solver.Result) {
	oldEvents := map[string]*solver.EventResult{}
	for _, ev := range old.Events {
		oldEvents[ev.Event.Name] = ev
	}
	banks := bankCache{}
	for _, ev := range new.Events {
		oev := oldEvents[ev.Event.Name]
		if oev == nil {
			continue
		}
		oldReaches := map[string]*solver.ReachResult{}
		for _, rr := range oev.Reaches {
			if rr != nil && rr.Reach != nil {
				oldReaches[rr.Reach.Name] = rr
			}
		}
		for _, rr := range ev.Reaches {
			if rr == nil || rr.Reach == nil {
				continue
			}
			orr := oldReaches[rr.Reach.Name]
			if orr == nil {
				continue
			}
			d.Profiles = append(d.Profiles, compareReach(ev.Event.Name, orr, rr, banks, old.Model.Units))
		}
	}
}

// bankCache holds the height of each section (the top of bank above the
// invert; 0 when unknown), computed once.
type bankCache map[*model.Section]float64

func (c bankCache) height(sec *model.Section, u model.Units) float64 {
	h, ok := c[sec]
	if !ok {
		h = solver.NewGeometry(sec, u).Height()
		c[sec] = h
	}
	return h
}

// bank is the top-of-bank elevation of a reach at station x; ok is false
// when the section there has no known height.
func (c bankCache) bank(r *model.Reach, x float64, u model.Units) (float64, bool) {
	sec := r.SectionAt(x)
	if sec == nil {
		return 0, false
	}
	h := c.height(sec, u)
	return r.InvertAt(x) + h, h > 0
}

// compareReach compares one reach of one event at the proposed model's
// points within the existing reach's length, the points between the two
// toes of a jump that moved with the move (JumpMove) rather than in the
// extremes.
func compareReach(event string, old, new *solver.ReachResult, banks bankCache, u model.Units) Profile {
	p := Profile{Event: event, Reach: new.Reach.Name}
	if len(old.Points) == 0 || len(new.Points) == 0 {
		return p
	}
	first := true
	track := func(e *Extreme, delta, x float64, larger bool) {
		if first || (larger && delta > e.Delta) || (!larger && delta < e.Delta) {
			*e = Extreme{Delta: delta, Station: x}
		}
	}
	p.Jumps = jumpMoves(old, new)
	moves := newSweep(p.Jumps)
	limit := old.Points[len(old.Points)-1].Station
	for k, pt := range new.Points {
		x := pt.Station
		if x > limit+1e-9 {
			break
		}
		// The first of two points at one station (a jump, a section
		// change) is the upstream side: compare it with that side.
		upstream := k+1 < len(new.Points) && new.Points[k+1].Station == x
		ow := oldAt(old.Points, x, upstream, func(p *solver.Point) float64 { return p.WSE })
		ov := oldAt(old.Points, x, upstream, func(p *solver.Point) float64 { return p.Velocity })
		dw, dv := pt.WSE-ow, pt.Velocity-ov
		p.Stations = append(p.Stations, x)
		p.OldWSE = append(p.OldWSE, ow)
		p.NewWSE = append(p.NewWSE, pt.WSE)
		p.Compared++
		a := moves.across(x, upstream)
		p.Across = append(p.Across, a)
		if a >= 0 {
			// One revision is on each side of a jump that moved: the
			// difference is the move's, reported with it.
			p.Jumps[a].record(dw, dv, x)
			continue
		}
		track(&p.Rise, dw, x, true)
		track(&p.Fall, dw, x, false)
		track(&p.Faster, dv, x, true)
		track(&p.Slower, dv, x, false)
		nb, okN := banks.bank(new.Reach, x, u)
		ob, okO := banks.bank(old.Reach, x, u)
		if okN && okO {
			df := (nb - pt.WSE) - (ob - ow)
			if !p.HasFreeboard {
				p.LessFree, p.MoreFree = Extreme{df, x}, Extreme{df, x}
				p.HasFreeboard = true
			} else {
				if df < p.LessFree.Delta {
					p.LessFree = Extreme{df, x}
				}
				if df > p.MoreFree.Delta {
					p.MoreFree = Extreme{df, x}
				}
			}
		}
		first = false
	}
	return p
}

// oldAt is the existing profile's value at station x
// (solver.AtStation, which gives the downstream side where the profile
// holds two points at x), or with upstream the first of those points.
func oldAt(pts []solver.Point, x float64, upstream bool, v func(*solver.Point) float64) float64 {
	if upstream {
		if i, found := slices.BinarySearchFunc(pts, x, func(p solver.Point, x float64) int { return cmp.Compare(p.Station, x) }); found {
			return v(&pts[i])
		}
	}
	return solver.AtStation(pts, x, v)
}
