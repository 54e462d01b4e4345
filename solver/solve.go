package solver

import (
	"errors"
	"fmt"
	"math"

	"github.com/chanlint/chanlint/model"
)

// ErrTooManyPoints ends Solve when the model (all its events together)
// needs more computed points than Options.MaxPoints allows.
var ErrTooManyPoints = errors.New("too many computed points")

// ErrWorkBudget ends Solve when the model needs more work than
// Options.MaxWork allows (see DefaultMaxWork).
var ErrWorkBudget = errors.New("work budget exceeded")

// Defaults of Options.
const (
	// DefaultTolerance is the closure of the energy equation on the water
	// surface, in the model's length unit, when Options.Tolerance is 0. It
	// is far tighter than the 0.003 m / 0.01 ft of common practice so that
	// the accuracy is that of the step control alone.
	DefaultTolerance = 1e-7
	// DefaultMaxPoints bounds the computed points of one Solve call, all
	// events together, when Options.MaxPoints is 0. Every point computed
	// counts, including those of a subcritical or supercritical trial
	// profile that the final profile does not use, so the points kept in
	// the result never exceed it. A kept point holds about 150 bytes of
	// live heap, and about 450 bytes are allocated per point with the
	// growth of the work buffers (BenchmarkPointMemory: 152 heap B/point,
	// 446 B/op per point), so one Solve call stays near 300 MB resident
	// whatever the number of events: the 200-event file of
	// TestPointBudgetCoversTheModel stops at the budget within about 1 s
	// at a peak resident set of 287 MB, where a budget per event needed
	// about 17 GB.
	DefaultMaxPoints = 1_000_000
	// DefaultMaxWork bounds the total work of one Solve call, all events
	// together, when Options.MaxWork is 0. Work is counted in units of
	// about one section evaluation: a computed point costs workPerPoint
	// (a standard step with its error control), a normal and
	// critical depth search workPerSearch plus one unit per 16 depths of
	// a points section's scan grid (see gridTable). The computed-point
	// limit bounds the profiles; this bound adds the depth searches, which
	// a model of many reaches and events on large points sections
	// multiplies (60 sections of 5,000 points under 200 events, each
	// reach with its own discharge, took about a minute before the grid
	// was tabulated). At about 0.1–0.3 µs a unit, 50 million units end a
	// Solve within seconds; a model beyond it gets a diagnostic, not a
	// kill.
	DefaultMaxWork = 50_000_000
	workPerPoint   = 16
	workPerSearch  = 64
)

// Solve computes the steady water-surface profiles of every event of m (in
// model order; opts.Events restricts them by name) over every reach.
//
// The method, per event:
//
//  1. Subcritical pass, outlet to headwaters (reverse topological order):
//     each reach's subcritical profile is computed upstream by the standard
//     step from its downstream control — the outlet condition, or the
//     energy grade elevation at the start of the reach below (junctions
//     without loss), or the head a sluice gate needs.
//  2. Supercritical pass, headwaters to outlet: each reach is walked
//     downstream from its upstream control (gate vena contracta, entrance
//     depth, supercritical flow arriving from upstream, or critical depth
//     where the subcritical profile could not exist, as at the head of a
//     steep reach). Where the supercritical profile's specific force falls
//     below that of the subcritical profile a hydraulic jump forms; its toe
//     is found by root finding on the difference of the two forces.
//
// Conventions of the method:
//   - Standard step: z₁ + y₁ + α₁V₁²/2g = z₂ + y₂ + α₂V₂²/2g + hf with
//     hf = Δx·(Sf₁ + Sf₂)/2, the average friction slope (Chow 1959,
//     §10-3), solved for the unknown depth by Newton's method from a
//     predicted depth, or by Brent's method on the branch of the regime
//     where that fails (see flowCtx.solveBranch). Where it has no
//     solution on that branch, critical depth is taken and a
//     NoteCriticalFallback records it (one note per run of points).
//   - Step control: a predicted depth (Adams–Bashforth on
//     dy/dx = (S0 − Sf)/(1 − F²)) corrected by the standard step solved by
//     Newton's method, the difference estimating the error (Milne's
//     device), which is held under 1e-4 of the depth per step; the step
//     grows by up to four times per step as the profile nears normal
//     depth. Next to critical depth the depth is stepped and the distance
//     solved (direct step); the first step of a run is taken by step
//     doubling (see stepper). Against an independent quadrature of the
//     varied-flow equation the depths agree within 3e-4
//     (TestProfileAgainstQuadrature). Every point is a solution of the
//     energy equation from its neighbour, so the equation holds between
//     all neighbouring points. Reach.MaxSpacing caps the distance between
//     points.
//   - Points are always computed at the reach ends, segment boundaries,
//     basin and bend ends, and at station 0 where a gate stands.
//   - A change of section (a segment boundary) is a transition without
//     friction loss: two points share the station, one in each section,
//     with equal energy less the local loss there (losses.go), or, where
//     that has no subcritical solution under a level above the upstream
//     critical level, drowned at that level (Borda–Carnot).
//   - Jumps: the toe is where the specific forces of the two profiles are
//     equal; the profile reports the supercritical depth y1 and the
//     subcritical depth y2 at the toe (two points at one station) and the
//     subcritical profile from there on; the roller's length is reported
//     on the Jump, not drawn into the profile.
//   - Points sections: the energy coefficient α varies with depth, so the
//     depth of least specific energy differs from the critical depth
//     (Froude number 1). The branches of the energy equation are split,
//     and fallbacks taken, at the former; Point.CriticalDepth and the
//     profile zones use the latter. A jump whose two depths cannot balance
//     in specific force (held at a section change, a junction, or the start
//     of the subcritical profile) carries a NoteInfo at its toe.
//   - Junctions, gates and outlet controls: see network.go; free and
//     drowned outlets nodes.go, local losses losses.go, drops and free
//     overfalls drops.go, sluice gates gates.go.
//   - Slope classes and profile types: see classOf and profileType.
//
// The error is only for limits (ErrTooManyPoints, Options.MaxPoints,
// default DefaultMaxPoints for the whole call, all events together;
// ErrWorkBudget, Options.MaxWork, default DefaultMaxWork); numerical trouble and controls that
// cannot act are Notes on the reach. Every number of the result is finite.
func Solve(m *model.Model, opts Options) (*Result, error) {
	res := &Result{Model: m}
	if m == nil {
		return res, nil
	}
	s := newSolver(m, opts)
	for _, ev := range m.Events {
		if ev == nil || !wanted(opts.Events, ev.Name) {
			continue
		}
		er, err := s.solveEvent(ev)
		if err != nil {
			return nil, err
		}
		res.Events = append(res.Events, er)
	}
	return res, nil
}

// wanted reports whether the event name passes the filter.
func wanted(filter []string, name string) bool {
	if filter == nil {
		return true
	}
	for _, f := range filter {
		if f == name {
			return true
		}
	}
	return false
}

// solver holds what is shared by the events of one Solve call; its
// buffers are reused from event to event.
type solver struct {
	m          *model.Model
	units      model.Units
	tol        float64
	maxPoints  int
	order      []*model.Reach // topological, upstream first
	geos       map[geoKey]*Geometry
	depthCache map[depthKey]depthVal
	layouts    []reachLayout // by reach index
	work       []reachWork   // by reach index
	subBuf     []pt
	subM       []float64 // the specific force at each point of subBuf where known (0: not known)
	finBuf     []pt
	points     int // computed points of the whole Solve call, all events
	tooMany    bool
	maxWork    int64
	spent      int64     // work units of the whole Solve call (see DefaultMaxWork)
	overBudget bool      // tooMany because of the work budget
	entrance   []float64 // by reach index, per event; 0 = none
	vary       Vary      // a sensitivity run's perturbation (zero: none)
}

func newSolver(m *model.Model, opts Options) *solver {
	s := &solver{
		m:          m,
		units:      m.Units,
		tol:        opts.Tolerance,
		maxPoints:  opts.MaxPoints,
		maxWork:    opts.MaxWork,
		vary:       opts.Vary,
		geos:       map[geoKey]*Geometry{},
		depthCache: map[depthKey]depthVal{},
	}
	if !(s.tol > 0) || math.IsInf(s.tol, 0) {
		s.tol = DefaultTolerance
	}
	if s.maxPoints <= 0 {
		s.maxPoints = DefaultMaxPoints
	}
	if s.maxWork <= 0 {
		s.maxWork = DefaultMaxWork
	}
	s.order = topoOrder(m)
	s.layouts = make([]reachLayout, len(m.Reaches))
	s.work = make([]reachWork, len(m.Reaches))
	s.entrance = make([]float64, len(m.Reaches))
	for i, r := range m.Reaches {
		s.layouts[i] = s.layout(r)
	}
	return s
}

// geoKey identifies a cached Geometry: a section and its number of
// barrels.
type geoKey struct {
	sec     *model.Section
	barrels int
}

// geometry returns the cached Geometry of a section with n barrels (1
// for anything but a culvert barrel).
func (s *solver) geometry(sec *model.Section, n int) *Geometry {
	key := geoKey{sec, max(n, 1)}
	if g, ok := s.geos[key]; ok {
		return g
	}
	g := newScaled(sec, s.units, key.barrels, scale(s.vary.Roughness))
	s.geos[key] = g
	return g
}

// topoOrder is the network's topological order; for a model whose network
// pass did not run it is rebuilt from the Upstream links (each reach after
// everything upstream of it), starting from the reaches with no
// downstream reach, in model order.
func topoOrder(m *model.Model) []*model.Reach {
	if m.Network != nil && len(m.Network.Order) == len(m.Reaches) {
		return m.Network.Order
	}
	var out []*model.Reach
	seen := make(map[*model.Reach]bool, len(m.Reaches))
	var visit func(r *model.Reach, depth int)
	visit = func(r *model.Reach, depth int) {
		if r == nil || seen[r] || depth > len(m.Reaches) {
			return
		}
		seen[r] = true
		for _, u := range r.Upstream {
			visit(u, depth+1)
		}
		out = append(out, r)
	}
	for _, r := range m.Reaches {
		if r.Downstream == nil {
			visit(r, 0)
		}
	}
	for _, r := range m.Reaches {
		visit(r, 0)
	}
	return out
}

// count adds computed points to the budget of the Solve call (every
// event counts against one budget, so a model of many events cannot
// multiply it).
func (s *solver) count(n int) {
	s.points += n
	if s.points > s.maxPoints {
		s.tooMany = true
	}
	s.spend(int64(n) * workPerPoint)
}

// spend adds work units to the budget of the Solve call.
func (s *solver) spend(units int64) {
	s.spent += units
	if s.spent > s.maxWork {
		s.tooMany, s.overBudget = true, true
	}
}

// solveEvent runs both passes for one event.
func (s *solver) solveEvent(ev *model.Event) (*EventResult, error) {
	s.subBuf = s.subBuf[:0]
	s.subM = s.subM[:0]
	for i := range s.entrance {
		s.entrance[i] = 0
	}
	for _, e := range ev.Entrances {
		if e.Reach != nil && e.Reach.Index >= 0 && e.Reach.Index < len(s.entrance) && e.Depth > 0 {
			s.entrance[e.Reach.Index] = e.Depth
		}
	}
	er := &EventResult{Event: ev, Reaches: make([]*ReachResult, len(s.m.Reaches))}
	for i, r := range s.m.Reaches {
		q := 0.0
		if i < len(ev.Discharge) {
			q = ev.Discharge[i] * scale(s.vary.Discharge)
		}
		if !(q > 0) || math.IsInf(q, 0) {
			q = 0
		}
		s.work[i] = reachWork{r: r, q: q, res: &ReachResult{Reach: r, Discharge: q}}
		s.prepare(&s.work[i], &s.layouts[i])
		er.Reaches[i] = s.work[i].res
		if s.tooMany {
			return nil, s.limitError(ev)
		}
	}
	// Pass 1: subcritical profiles, outlet first.
	for i := len(s.order) - 1; i >= 0; i-- {
		w := &s.work[s.order[i].Index]
		s.subcritical(w, ev)
		if s.tooMany {
			return nil, s.limitError(ev)
		}
	}
	// Pass 2: supercritical walk and the final profiles, headwaters first.
	for _, r := range s.order {
		w := &s.work[r.Index]
		s.combine(w)
		if s.tooMany {
			return nil, s.limitError(ev)
		}
		s.finish(w)
	}
	for _, c := range s.m.Culverts {
		if r := c.Reach; r != nil && r.Culvert == c && r.Index >= 0 && r.Index < len(s.work) {
			w := &s.work[r.Index]
			if cr := w.culvert; cr != nil {
				var g *Geometry
				if n := len(w.pieces); n > 0 {
					g = w.pieces[n-1].geo
				}
				finishCulvert(cr, g)
				er.Culverts = append(er.Culverts, cr)
			}
		}
	}
	return er, nil
}

func (s *solver) limitError(ev *model.Event) error {
	if s.overBudget {
		return fmt.Errorf("%w: the model needs more than %d units of work (about one section evaluation each), reached in event %q (the solver's limit for one model, all events together; many events on many reaches with large points sections raise it)",
			ErrWorkBudget, s.maxWork, ev.Name)
	}
	return fmt.Errorf("%w: the model needs more than %d computed points, reached in event %q (the solver's limit for one model, all events together; a very small max_spacing on long reaches, or many events, raise the count)",
		ErrTooManyPoints, s.maxPoints, ev.Name)
}
