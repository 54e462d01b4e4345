package rules

import (
	"math"
	"sync"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/solver"
)

// A run is a stretch of consecutive computed points of a reach result in
// one section (at most runLength of them), with the extremes over its points of the quantities the
// point rules hold to their limits. The runs of a reach result are worked
// out once per check and shared by every point rule: a rule whose limit no
// point of a run can reach, by the run's extremes, passes the run without
// judging its points one by one (see scan). Most of a profile passes every
// rule, so most points then cost the rules nothing beyond this one pass.
//
// A run holding a point with a figure that is not a finite number (which
// the solver promises never to return) is not usable: scan judges its
// points as it would without runs, and the solver rule reports them.
type run struct {
	first, last int            // point indices, inclusive
	sec         *model.Section // the section of every point (sectionAt)
	usable      bool           // every point is usable (sum is finite), so the extremes are numbers
	full        bool           // some point flows full (closed conduits)
	inBend      bool           // some point lies inside a bend of the reach

	maxDepth, maxStage   float64 // depth; WSE − invert
	maxElev              float64 // the largest |WSE| and |invert| (the scale of their rounding)
	minVel, maxVel       float64 // mean velocity Q/A
	minFroude, maxFroude float64
	maxDV                float64 // depth · mean velocity
	maxDSf, maxRSf       float64 // depth · |Sf| and R · |Sf|

	sum float64 // of every figure of its points (finite when they all are: usable)

	zoned    bool    // maxZoned is worked out
	maxZoned float64 // the highest zone velocity (highestVelocity)
}

// runLength is the most points a run holds: short enough that a failing
// stretch has its neighbourhood judged, not its whole reach, long enough
// that the screens are asked far less often than the judges would be.
// Sixteen costs the fewest instructions a check on the demo (under
// callgrind: 8 points 424.5k, 12 419.0k, 16 414.7k, 24 415.0k, 32
// 422.6k) and fewer than eight on a long reach with long failing spans
// (BenchmarkCheckLong: 8 points 10.75M, 16 9.93M).
const runLength = 16

// slack is the relative margin by which a run's extreme must clear a limit
// for the run to pass unjudged: far above the rounding of the products the
// judges form (a few units of 1e-16) and far below any margin a finding
// reports, so a run passed by its extremes holds no point a judge fails.
const slack = 1e-9

// below reports whether x lies below limit by the slack: false for a
// value or limit that is not a number.
func below(x, limit float64) bool {
	return x < limit-slack*max(1, math.Abs(limit))
}

// above reports whether x lies above limit by the slack: false for a value
// or limit that is not a number.
func above(x, limit float64) bool {
	return x > limit+slack*max(1, math.Abs(limit))
}

// belowStage reports whether the water surface of every point of the run
// lies below the level h above its invert by the slack, taken on the scale
// of the elevations as well (WSE − invert rounds on that scale).
func belowStage(r *run, h float64) bool {
	return r.maxStage < h-slack*max(1, math.Abs(h), r.maxElev)
}

// inBank reports whether no point of the run rises above the top of its
// open section (overtopsAt), by the run's extremes: false when in doubt,
// and for a closed conduit.
func inBank(r *run) bool {
	return r.usable && r.sec != nil && !r.sec.Closed() && finiteNum(r.sec.Height) && belowStage(r, r.sec.Height)
}

// screenedRuns are the runs of a reach result for a pass that skips the
// runs their extremes clear (as a screen does): nil when the check judges
// every point.
func (c *Context) screenedRuns(rr *solver.ReachResult) []run {
	if c.shared != nil && c.shared.judgeAll {
		return nil
	}
	return c.runsOf(rr)
}

// screened is the screen a rule's scan uses: s, or none when the check
// judges every point.
func (c *Context) screened(s screenFunc) screenFunc {
	if c.shared != nil && c.shared.judgeAll {
		return nil
	}
	return s
}

// runsOf are the runs of a reach result: cached for the check when the
// context belongs to one (the runner's), else worked out for this call.
func (c *Context) runsOf(rr *solver.ReachResult) []run {
	if c.shared == nil {
		return pointRuns(rr, nil)
	}
	sh := c.shared
	if rs, ok := sh.runs[rr]; ok {
		return rs
	}
	if len(sh.runs) == 0 && c.Result != nil {
		// One array for the runs of every reach result, sized for about
		// a run per runLength points and a section change per reach.
		n := 0
		for _, ev := range c.Result.Events {
			if ev != nil {
				for _, r := range ev.Reaches {
					if r != nil {
						n += len(r.Points)/runLength + 2
					}
				}
			}
		}
		if cap(sh.buf) < n {
			sh.buf = make([]run, 0, n)
		}
	}
	start := len(sh.buf)
	sh.buf = pointRuns(rr, sh.buf)
	// The reach's runs keep their place even when a later reach's runs
	// outgrow the array: appends never write inside them.
	rs := sh.buf[start:len(sh.buf):len(sh.buf)]
	sh.runs[rr] = rs
	return rs
}

// shared is what the rules of one check work out once and share: the runs
// of every reach result, appended to one array. Checks take one from a
// pool and give it back, so that its array serves the next check.
type shared struct {
	runs map[*solver.ReachResult][]run
	buf  []run
	// judgeAll has every point judged, no run passed by a screen (a test
	// compares the findings so).
	judgeAll bool
}

var sharedPool = sync.Pool{New: func() any { return &shared{runs: map[*solver.ReachResult][]run{}} }}

func getShared() *shared { return sharedPool.Get().(*shared) }

// putShared empties sh and returns it to the pool: nothing of a check
// refers to its runs once it has returned.
func putShared(sh *shared) {
	clear(sh.runs)
	sh.buf, sh.judgeAll = sh.buf[:0], false
	sharedPool.Put(sh)
}

// pointRuns splits the points of a reach result into runs of one section
// and appends them, with their extremes, to out.
func pointRuns(rr *solver.ReachResult, out []run) []run {
	pts := rr.Points
	var r *run
	var bends []*model.Bend
	if rr.Reach != nil {
		bends = rr.Reach.Bends
	}
	for i := range pts {
		p := &pts[i]
		sec := sectionAt(rr, p)
		stage, elev := p.WSE-p.Invert, math.Abs(p.WSE)
		if a := math.Abs(p.Invert); a > elev {
			elev = a
		}
		dv := p.Depth * p.Velocity
		sf := math.Abs(p.FrictionSlope)
		dsf, rsf := p.Depth*sf, p.HydraulicRadius*sf
		if r == nil || sec != r.sec || i-r.first == runLength {
			out = append(out, run{first: i, sec: sec, usable: true,
				maxDepth: p.Depth, maxStage: stage, maxElev: elev, minVel: p.Velocity, maxVel: p.Velocity,
				minFroude: p.Froude, maxFroude: p.Froude, maxDV: dv, maxDSf: dsf, maxRSf: rsf})
			r = &out[len(out)-1]
		} else {
			// Plain comparisons: a point that is not a number makes the
			// run unusable instead (below), which scan does not screen.
			raise(&r.maxDepth, p.Depth)
			raise(&r.maxStage, stage)
			raise(&r.maxElev, elev)
			raise(&r.maxVel, p.Velocity)
			raise(&r.maxFroude, p.Froude)
			raise(&r.maxDV, dv)
			raise(&r.maxDSf, dsf)
			raise(&r.maxRSf, rsf)
			if p.Velocity < r.minVel {
				r.minVel = p.Velocity
			}
			if p.Froude < r.minFroude {
				r.minFroude = p.Froude
			}
		}
		r.last = i
		r.full = r.full || p.Full
		// usable, spelled out over the run: the sum of the fields read and
		// of the products formed is finite only when they all are (the
		// points of a run whose finite figures overflow the sum are merely
		// judged one by one). One addition a figure, where a test of each
		// point (usable) costs a multiplication as well.
		r.sum += p.Station + p.Invert + p.Depth + p.WSE + p.Velocity + p.Froude +
			p.Energy + p.Area + p.TopWidth + p.HydraulicRadius + p.FrictionSlope + dv + dsf + rsf + stage
		r.usable = finiteNum(r.sum)
		if len(bends) > 0 && !r.inBend {
			for _, b := range bends {
				if b.Radius > 0 && p.Station >= b.FromStation && p.Station <= b.ToStation {
					r.inBend = true
				}
			}
		}
	}
	return out
}

// raise sets *hi to x where x is larger.
func raise(hi *float64, x float64) {
	if x > *hi {
		*hi = x
	}
}

// zonedVelocity is the highest zone velocity over the run's points (see
// highestVelocity), worked out on first use.
func (r *run) zonedVelocity(rr *solver.ReachResult) float64 {
	if !r.zoned {
		r.zoned = true
		r.maxZoned = r.maxVel
		if r.sec != nil && r.sec.Shape == model.Points {
			for i := r.first; i <= r.last; i++ {
				v, _ := highestVelocity(rr, &rr.Points[i])
				if math.IsNaN(v) {
					r.maxZoned = v // the screen then refuses the run
					break
				}
				r.maxZoned = max(r.maxZoned, v)
			}
		}
	}
	return r.maxZoned
}
