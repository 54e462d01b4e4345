package solver

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"pgregory.net/rapid"
)

// TestNewtonStepMatchesBrent: the Newton solution of a standard step from
// a predicted depth is the root Brent's method brackets on the same
// branch, for random trapezoids, circles, discharges, slopes, depths,
// step lengths and predictions (good and poor), within the tolerance.
//
// Source: common practice (no published source) — a bracketed Brent
// root (Brent 1973, ch. 4) as the reference for another root finder of
// the same equation.
func TestNewtonStepMatchesBrent(t *testing.T) {
	rapid.Check(t, func(t *rapid.T) {
		var sec *model.Section
		if rapid.Bool().Draw(t, "circle") {
			d := rapid.Float64Range(0.5, 4).Draw(t, "d")
			sec = &model.Section{Name: "c", Shape: model.Circle, Diameter: d, Height: d, Roughness: [3]float64{0.013, 0.013, 0.013}}
		} else {
			sec = trapezoid("t", rapid.Float64Range(0.5, 10).Draw(t, "b"), rapid.Float64Range(0, 3).Draw(t, "z"), 0.015, 6)
		}
		g := NewGeometry(sec, model.SI)
		q := rapid.Float64Range(0.2, 20).Draw(t, "q")
		s0 := rapid.Float64Range(1e-4, 0.05).Draw(t, "s0")
		yc, err := CriticalDepth(g, q)
		if err != nil {
			t.Skip("no critical depth")
		}
		f := flowCtx{q: q, zUp: 10, s0: s0, length: 1000, tol: DefaultTolerance}
		p := piece{from: 0, to: 1000, geo: g, yc: yc, ycF: yc}
		super := rapid.Bool().Draw(t, "super")
		yk := yc * rapid.Float64Range(1.05, 2).Draw(t, "above")
		if super {
			yk = yc * rapid.Float64Range(0.3, 0.95).Draw(t, "below")
		}
		if sec.Shape == model.Circle && yk > 0.95*sec.Diameter {
			t.Skip("near the crown")
		}
		xk := 500.0
		h := rapid.Float64Range(0.1, 200).Draw(t, "h")
		xu := xk - h
		if super {
			xu = xk + h
		}
		k := f.eval(&p, yk)
		yp := yk * rapid.Float64Range(0.9, 1.1).Draw(t, "prediction")
		y, ok, st := f.newtonStep(&p, xk, k, xu, super, yp, yk)
		half := h / 2
		zk, zu := f.invert(xk), f.invert(xu)
		w, target := -half, zk+k.e+half*k.sf
		if super {
			w, target = half, zk+k.e-half*k.sf
		}
		ref, okRef := f.solveBranch(&p, zu, w, target, super, 0, 0)
		// Above the depth of largest conveyance of a circle (0.9382·D) the
		// conveyance falls as the depth rises, and so the friction slope
		// rises: the step equation z + E(y) ± (h/2)·Sf(y) = target is no
		// longer monotone on the branch and can have several roots there,
		// or none in the bracket Brent's method sets from the critical
		// depth (rapid found D = 0.5625 m with roots 0.55603 m below the
		// crown and 0.56262 m in the slot above it; and D = 0.5 m with a
		// critical depth above the crown, where Newton found 0.4949 m and
		// the bracket held none). Each finder may then return a different,
		// equally valid root, or only one of them a root: Newton's must
		// still be a root of the equation on its branch.
		// Source: Chow, Open-Channel Hydraulics (1959), ch. 6: the largest
		// discharge of a partly full circle at about 0.94·D (from memory;
		// 0.9382 computed in circle.go).
		if sec.Shape == model.Circle && max(y, ref, yc) >= circleQmaxDepthRatio*sec.Diameter {
			if !ok {
				return // the solver falls back to Brent's method
			}
			res := func(y float64) float64 { s := f.eval(&p, y); return zu + s.e + w*s.sf - target }
			d := 10 * DefaultTolerance
			if res(y-d)*res(y+d) > 0 || (y > yc) == super {
				t.Fatalf("newton %.12g is no root on its branch (brent %.12g %v; residuals %g, %g)", y, ref, okRef, res(y-d), res(y+d))
			}
		} else {
			if ok != okRef {
				t.Fatalf("newton ok %v, brent ok %v (y %v, ref %v)", ok, okRef, y, ref)
			}
			if !ok {
				return
			}
			if math.Abs(y-ref) > 10*DefaultTolerance {
				t.Fatalf("newton %.12g, brent %.12g", y, ref)
			}
		}
		// The state returned is that at the depth found, within what the
		// tolerance of the depth allows: its energy within the tolerance
		// (as a head), its friction loss over the step too.
		want := f.eval(&p, y)
		if math.Abs(st.e-want.e) > DefaultTolerance || half*math.Abs(st.sf-want.sf) > DefaultTolerance {
			t.Fatalf("state %+v, want %+v", st, want)
		}
		// Its squared Froude number too, which the next step's profile
		// slope (S0 − Sf)/(1 − F²) is taken from: a state carried by a
		// last correction of up to 1e-4 of the depth is within the
		// second order of it, 1e-6 of F² (F² varies as about y⁻³ in these
		// sections, so a stale one would be off by up to 3e-4 of it).
		if math.Abs(st.f2-want.f2) > 1e-6*want.f2 || st.y != y {
			t.Fatalf("state at %.12g: F² %.12g at depth %.12g, want %.12g", y, st.f2, st.y, want.f2)
		}
	})
}

// TestNewtonStepCarriedEnergySteepSupercritical is the case rapid found
// for TestNewtonStepMatchesBrent: a supercritical step at 0.375 of the
// critical depth (F² = 24) whose last correction was applied without a
// new evaluation on a secant estimate of E″ that fell short, so that the
// carried energy was 1.005e-7 m off at a tolerance of 1e-7 m.
func TestNewtonStepCarriedEnergySteepSupercritical(t *testing.T) {
	g := NewGeometry(trapezoid("t", 0.671875, 0.06640625, 0.015, 6), model.SI)
	q := 20.0
	yc, err := CriticalDepth(g, q)
	if err != nil {
		t.Fatal(err)
	}
	f := flowCtx{q: q, zUp: 10, s0: 0.05, length: 1000, tol: DefaultTolerance}
	p := piece{from: 0, to: 1000, geo: g, yc: yc, ycF: yc}
	yk := 0.375 * yc
	k := f.eval(&p, yk)
	y, ok, st := f.newtonStep(&p, 500, k, 500+0.126953125, true, yk*1.0060958862304688, yk)
	if !ok {
		t.Fatal("no step")
	}
	// Source: common practice (no published source): the state of the
	// depth found is that of a fresh evaluation there, within the
	// tolerance as a head.
	want := f.eval(&p, y)
	if math.Abs(st.e-want.e) > DefaultTolerance {
		t.Fatalf("energy %.12g, want %.12g (off %.3g)", st.e, want.e, st.e-want.e)
	}
}
