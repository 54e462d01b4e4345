package solver

import (
	"testing"

	"github.com/chanlint/chanlint/model"
)

// geoBenchShapes are the sections the section-hydraulics benchmarks run
// on, with a discharge and a depth typical of each.
func geoBenchShapes() []struct {
	name string
	g    *Geometry
	q, y float64
} {
	// A 40-point natural section: the model format's example refined.
	var pts [][2]float64
	for i := range 40 {
		x := float64(i)
		e := 0.004 * (x - 20) * (x - 20)
		if i%5 == 0 {
			e += 0.05
		}
		pts = append(pts, [2]float64{x, e})
	}
	return []struct {
		name string
		g    *Geometry
		q, y float64
	}{
		{"rectangle", geoRect(3, 0.015, model.SI), 6, 1.1},
		{"trapezoid", geoTrap(3, 2, 0.015, model.SI), 12, 1.1},
		{"triangle", geoTri(2, 0.015, model.SI), 2, 0.9},
		{"circle", geoCircle(1.2, 0.013, model.SI), 1.2, 0.7},
		{"points7", geoNatural(), 30, 1.5},
		{"points40", geoPoints(pts, [2]float64{8, 32}, [3]float64{0.06, 0.035, 0.06}, model.SI), 5, 0.9},
	}
}

func BenchmarkProps(b *testing.B) {
	for _, s := range geoBenchShapes() {
		b.Run(s.name, func(b *testing.B) {
			b.ReportAllocs()
			y := s.y
			for i := 0; b.Loop(); i++ {
				p := s.g.Props(y + 1e-3*float64(i&15))
				geoSink += p.Conveyance
			}
		})
	}
}

func BenchmarkNormalDepth(b *testing.B) {
	for _, s := range geoBenchShapes() {
		b.Run(s.name, func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; b.Loop(); i++ {
				y, _ := NormalDepth(s.g, s.q*(1+0.01*float64(i&7)), 0.002)
				geoSink += y
			}
		})
	}
}

func BenchmarkCriticalDepth(b *testing.B) {
	for _, s := range geoBenchShapes() {
		b.Run(s.name, func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; b.Loop(); i++ {
				y, _ := CriticalDepth(s.g, s.q*(1+0.01*float64(i&7)))
				geoSink += y
			}
		})
	}
}

func BenchmarkSequentDepth(b *testing.B) {
	for _, s := range geoBenchShapes() {
		yc, _ := CriticalDepth(s.g, s.q)
		b.Run(s.name, func(b *testing.B) {
			b.ReportAllocs()
			for i := 0; b.Loop(); i++ {
				y, _ := SequentDepth(s.g, s.q, yc*(0.5+0.01*float64(i&7)))
				geoSink += y
			}
		})
	}
}
