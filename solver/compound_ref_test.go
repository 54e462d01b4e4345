package solver

import (
	"math"
	"testing"

	"pgregory.net/rapid"

	"github.com/chanlint/chanlint/model"
)

// geoDirectProps integrates a points section segment by segment at depth
// y: the reference the band tables are checked against. Each segment from
// (x_a, e_a) to (x_b, e_b) contributes, over its wetted part, with
// d = y − e(x) linear along it:
//
//	A = ∫ d dx     T = wetted horizontal length     P = wetted length
//	A·z̄ = ∫ d²/2 dx = Δx·(d_a² + d_a·d_b + d_b²)/6 for a fully wet segment
//
// (exact for a polyline; common practice, no published source).
func geoDirectProps(c *compound, y float64) Props {
	var a, p, t, m [3]float64
	e := c.e
	for i, z := range c.zone {
		ea, eb := e[i], e[i+1]
		if ea >= y && eb >= y {
			continue
		}
		dx := c.dx[i]
		if dx <= 0 {
			// Vertical segment: wetted height only.
			lo, hi := math.Min(ea, eb), math.Min(math.Max(ea, eb), y)
			p[z] += hi - lo
			continue
		}
		da, db := y-ea, y-eb
		l := c.l[i]
		switch {
		case da >= 0 && db >= 0:
			a[z] += dx * (da + db) / 2
			t[z] += dx
			p[z] += l
			m[z] += dx * (da*da + da*db + db*db) / 6
		case da > 0: // wet at a, dry at b
			f := da / (da - db)
			a[z] += f * dx * da / 2
			t[z] += f * dx
			p[z] += f * l
			m[z] += f * dx * da * da / 6
		default: // dry at a, wet at b
			f := db / (db - da)
			a[z] += f * dx * db / 2
			t[z] += f * dx
			p[z] += f * l
			m[z] += f * dx * db * db / 6
		}
	}
	if w := y - e[0]; w > 0 {
		p[c.wallL] += w
	}
	if w := y - e[len(e)-1]; w > 0 {
		p[c.wallR] += w
	}
	return c.assemble(a, p, t[0]+t[1]+t[2], m[0]+m[1]+m[2])
}

func TestPointsBandsMatchDirectIntegration(t *testing.T) {
	// Source: common practice (no published source): exact polyline
	// integration segment by segment (geoDirectProps) against the band
	// polynomials used by Props, on random sections with pockets, flats,
	// vertical walls and banks, at random depths including vertex
	// elevations and depths above the end points.
	rapid.Check(t, func(rt *rapid.T) {
		s := drawPointsSection(rt, 40, [3]float64{0.05, 0.03, 0.07}, 20, 100)
		g := NewGeometry(s, model.SI)
		c := &g.pts
		depths := []float64{rapid.Float64Range(1e-6, 8).Draw(rt, "y")}
		depths = append(depths, c.levels[rapid.IntRange(0, len(c.levels)-1).Draw(rt, "lv")]+1e-7)
		for _, y := range depths {
			want, got := geoDirectProps(c, y), g.Props(y)
			for _, f := range []struct {
				name string
				w, g float64
			}{{"area", want.Area, got.Area}, {"perimeter", want.Perimeter, got.Perimeter},
				{"top width", want.TopWidth, got.TopWidth}, {"first moment", want.FirstMoment, got.FirstMoment},
				{"conveyance", want.Conveyance, got.Conveyance}, {"alpha", want.Alpha, got.Alpha}} {
				// 1e-9 relative to the quantity, with an absolute floor
				// scaled to the section (sums of terms of its size).
				scale := math.Max(math.Abs(f.w), 1e-9)
				if math.Abs(f.w-f.g) > 1e-9*scale+1e-12 {
					rt.Fatalf("%s at y=%g: band %.15g, direct %.15g", f.name, y, f.g, f.w)
				}
			}
		}
	})
}

func BenchmarkPointsNewGeometry(b *testing.B) {
	// A 5000-point section (the model's limit): building its bands.
	s := &model.Section{Shape: model.Points, Roughness: [3]float64{0.06, 0.035, 0.06}, Banks: [2]float64{1000, 4000}}
	for i := range 5000 {
		x := float64(i)
		s.Points = append(s.Points, model.Point{Offset: x, Elevation: 1e-6*(x-2500)*(x-2500) + 0.3*math.Sin(x/7)})
	}
	b.ReportAllocs()
	for b.Loop() {
		g := NewGeometry(s, model.SI)
		geoSink += g.Props(3).Area
	}
}

func BenchmarkPointsProps5000(b *testing.B) {
	s := &model.Section{Shape: model.Points, Roughness: [3]float64{0.06, 0.035, 0.06}, Banks: [2]float64{1000, 4000}}
	for i := range 5000 {
		x := float64(i)
		s.Points = append(s.Points, model.Point{Offset: x, Elevation: 1e-6*(x-2500)*(x-2500) + 0.3*math.Sin(x/7)})
	}
	g := NewGeometry(s, model.SI)
	b.Run("bands", func(b *testing.B) {
		b.ReportAllocs()
		for i := 0; b.Loop(); i++ {
			geoSink += g.Props(2 + 1e-3*float64(i&255)).Conveyance
		}
	})
	b.Run("direct", func(b *testing.B) {
		for i := 0; b.Loop(); i++ {
			geoSink += geoDirectProps(&g.pts, 2+1e-3*float64(i&255)).Conveyance
		}
	})
	b.Run("critical", func(b *testing.B) {
		b.ReportAllocs()
		for i := 0; b.Loop(); i++ {
			y, _ := CriticalDepth(g, 500+float64(i&7))
			geoSink += y
		}
	})
	b.Run("normal", func(b *testing.B) {
		b.ReportAllocs()
		for i := 0; b.Loop(); i++ {
			y, _ := NormalDepth(g, 500+float64(i&7), 0.001)
			geoSink += y
		}
	})
}

// drawPointsSection draws a random points section of 3 to maxN points
// with pockets, flats (repeated levels), vertical walls (repeated
// offsets) and banks anywhere across it: offsets step by up to maxDx,
// elevations lie within 6.5 above base. It skips a draw with no width.
func drawPointsSection(rt *rapid.T, maxN int, roughness [3]float64, maxDx, base float64) *model.Section {
	n := rapid.IntRange(3, maxN).Draw(rt, "n")
	s := &model.Section{Shape: model.Points, Roughness: roughness}
	x := 0.0
	for i := range n {
		if i > 0 && !(i >= 2 && s.Points[i-2].Offset == x) && rapid.IntRange(0, 5).Draw(rt, "wall") > 0 {
			x += rapid.Float64Range(0.01, maxDx).Draw(rt, "dx")
		}
		e := float64(rapid.IntRange(0, 12).Draw(rt, "ei")) * 0.5 // repeated levels: flats
		if rapid.Bool().Draw(rt, "jitter") {
			e += rapid.Float64Range(0, 0.5).Draw(rt, "ej")
		}
		s.Points = append(s.Points, model.Point{Offset: x, Elevation: base + e})
	}
	if x == 0 {
		rt.Skip("no width")
	}
	b0 := rapid.Float64Range(0, x).Draw(rt, "b0")
	b1 := rapid.Float64Range(0, x).Draw(rt, "b1")
	s.Banks = [2]float64{math.Min(b0, b1), math.Max(b0, b1)}
	return s
}
