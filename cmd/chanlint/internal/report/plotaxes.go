package report

import (
	"math"
	"strconv"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/solver"
)

// scale maps stations and elevations to user units of the plot's frame.
type scale struct {
	xmin, xmax, ymin, ymax float64
	xt, yt                 []float64 // tick values
	fr                     Rect      // the frame the mapping fills
	anyPoints              bool      // some piece has computed points
}

// x is the horizontal position of a distance along the plotted line.
func (s *scale) x(v float64) float64 { return s.fr.X + (v-s.xmin)/(s.xmax-s.xmin)*s.fr.W }

// y is the vertical position of an elevation.
func (s *scale) y(v float64) float64 { return s.fr.Bottom() - (v-s.ymin)/(s.ymax-s.ymin)*s.fr.H }

// newScale finds the extent of what the pieces draw: inverts, tops of
// bank, water surface and critical depth of every point, the water
// surface's envelope over a sensitivity run, and the energy
// grade unless it stands so high that it would flatten the profile (then
// p.ClipEnergy is set and it is cut off at the frame).
func newScale(pieces []piece, p *Plot, culverts map[*model.Reach]*solver.CulvertResult) *scale {
	s := &scale{fr: p.Frame}
	for _, pc := range pieces {
		s.xmax = math.Max(s.xmax, pc.offset+pc.reach.Length)
	}
	if !(s.xmax > s.xmin) {
		s.xmax = s.xmin + 1
	}
	ymin, ymax := math.Inf(1), math.Inf(-1)
	grow := func(y float64) {
		if numfmt.Finite(y) {
			ymin, ymax = math.Min(ymin, y), math.Max(ymax, y)
		}
	}
	emax := math.Inf(-1)
	for _, pc := range pieces {
		grow(pc.reach.InvertUp)
		grow(pc.reach.InvertDown)
		grow(pc.reach.InvertUp + sectionHeight(pc.reach.Section))
		grow(pc.reach.InvertDown + sectionHeight(pc.reach.SectionAt(pc.reach.Length)))
		if cr := culverts[pc.reach]; cr != nil {
			grow(cr.Headwater)
			if road := cr.Culvert.Road; road != nil {
				grow(road.Crest)
			}
		}
		if o := pc.old; o != nil {
			for _, v := range o.OldWSE {
				grow(v)
			}
		}
		if b := pc.band; b != nil {
			for i := range b.Station {
				grow(b.Low[i])
				grow(b.High[i])
			}
		}
		if pc.rr == nil {
			continue
		}
		for i := range pc.rr.Points {
			pt := &pc.rr.Points[i]
			s.anyPoints = true
			grow(pt.Invert)
			grow(pt.WSE)
			if numfmt.Finite(pt.Energy) {
				emax = math.Max(emax, pt.Energy)
			}
			grow(pt.Invert + pt.CriticalDepth)
			grow(pt.Invert + sectionHeight(pt.Section))
		}
	}
	if !numfmt.Finite(ymin, ymax) {
		ymin, ymax = 0, 1
	}
	if ymax-ymin < 1e-6 {
		ymin, ymax = ymin-0.5, ymax+0.5
	}
	// The energy grade of a fast jet (below a gate) can stand far above
	// everything else; rather than flatten the profile, it is clipped.
	if numfmt.Finite(emax) && emax > ymax {
		if emax <= ymax+0.5*(ymax-ymin) {
			ymax = emax
		} else {
			p.ClipEnergy = true
		}
	}
	pad := 0.06 * (ymax - ymin)
	ymin, ymax = ymin-pad, ymax+pad
	s.yt = niceTicks(ymin, ymax, 6)
	if len(s.yt) > 0 {
		ymin = math.Min(ymin, s.yt[0])
		ymax = math.Max(ymax, s.yt[len(s.yt)-1])
	}
	s.ymin, s.ymax = ymin, ymax
	s.xt = niceTicks(s.xmin, s.xmax, 10)
	return s
}

// addAxes places the ticks of both axes, the fixed texts around the
// frame, and the note on vertical exaggeration.
func (p *Plot) addAxes(sc *scale) {
	fr := p.Frame
	for _, v := range sc.xt {
		if v >= sc.xmin-1e-9 && v <= sc.xmax+1e-9 {
			p.XTicks = append(p.XTicks, Tick{Pos: round1(sc.x(v)), Label: formatTick(v, sc.xt)})
		}
	}
	for _, v := range sc.yt {
		p.YTicks = append(p.YTicks, Tick{Pos: round1(sc.y(v)), Label: formatTick(v, sc.yt)})
	}
	p.Text = TextPos{
		TitleX: fr.X, TitleY: 20,
		YTickX: fr.X - 7, XTickY: fr.Bottom() + 16,
		XLabelX: fr.CentreX(), XLabelY: fr.Bottom() + 37,
		YLabelX: 16, YLabelY: fr.CentreY(),
		BendY: fr.Bottom() - 4,
	}
	// Vertical exaggeration: horizontal units per user unit over vertical ones.
	if hx, hy := (sc.xmax-sc.xmin)/fr.W, (sc.ymax-sc.ymin)/fr.H; hy > 0 {
		if ve := hx / hy; ve > 1.5 {
			p.Caption = "Vertical scale exaggerated about " + sig2(ve) + "×."
		}
	}
}

// niceTicks returns tick values covering [lo, hi] with about n intervals,
// on steps of 1, 2, 2.5 or 5 times a power of ten.
func niceTicks(lo, hi float64, n int) []float64 {
	if !numfmt.Finite(lo, hi) || hi <= lo || n < 1 {
		return nil
	}
	step := niceStep((hi - lo) / float64(n))
	first := math.Floor(lo/step) * step
	var ts []float64
	for i := 0; i <= 4*n+2; i++ {
		v := first + float64(i)*step
		if v > hi+step*0.999 {
			break
		}
		ts = append(ts, roundTo(v, step))
	}
	return ts
}

// niceStep rounds a raw step up to 1, 2, 2.5 or 5 × 10^k.
func niceStep(raw float64) float64 {
	if !(raw > 0) || !numfmt.Finite(raw) {
		return 1
	}
	exp := math.Floor(math.Log10(raw))
	base := math.Pow(10, exp)
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if m*base >= raw*(1-1e-9) {
			return m * base
		}
	}
	return 10 * base
}

// roundTo removes the floating-point noise of a multiple of step.
func roundTo(v, step float64) float64 {
	d := decimals(step)
	r, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'f', d, 64), 64)
	if r == 0 {
		return 0
	}
	return r
}

// decimals is the number of decimals needed to print multiples of step.
func decimals(step float64) int {
	for d := 0; d < 8; d++ {
		s := step * math.Pow(10, float64(d))
		if math.Abs(s-math.Round(s)) < 1e-6*s {
			return d
		}
	}
	return 8
}

// formatTick prints a tick with the decimals its axis needs (numfmt.Fixed).
func formatTick(v float64, ticks []float64) string {
	d := 0
	if len(ticks) > 1 {
		d = decimals(ticks[1] - ticks[0])
	}
	return numfmt.Fixed(v, d)
}

// sig2 prints a positive number with two significant figures.
func sig2(x float64) string {
	if x <= 0 || !numfmt.Finite(x) {
		return "0"
	}
	d := 1 - int(math.Floor(math.Log10(x)))
	if d < 0 {
		d = 0
	}
	e := math.Pow(10, math.Floor(math.Log10(x))-1)
	return strconv.FormatFloat(math.Round(x/e)*e, 'f', d, 64)
}
