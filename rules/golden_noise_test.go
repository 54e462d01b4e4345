package rules

import (
	"math"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// rectBackwater is a rectangular channel as a backwater (side slope 0) for
// the independent quadrature of stationOf.
func rectBackwater(b, n, s0, q, length, yOut float64) backwater {
	u := model.SI
	return backwater{u: u, l: 1, b: b, n: n, s0: s0, q: q, length: length, yOut: yOut, g: u.Gravity(), k: u.Manning()}
}

// TestGoldenFroudeBuffer: the near-critical stretch of an M2 drawdown to a
// free outfall lies within the default buffer of ten critical depths, so
// froude_band reports nothing; with control_buffer = 0 it reports the band
// from where the drawdown enters it, at the station the quadrature gives.
func TestGoldenFroudeBuffer(t *testing.T) {
	c := rectBackwater(3, 0.015, 0.001, 3, 300, 0)
	// Source: critical depth of a rectangle yc = (q²/g)^(1/3), and
	// F = V/√(g·y) = 0.86 at y = (q²/(g·0.86²))^(1/3) (Chow 1959, ch. 3).
	q := c.q / c.b
	yc := math.Cbrt(q * q / c.g)
	yBand := math.Cbrt(q * q / (c.g * 0.86 * 0.86))
	c.yOut = yc // the brink
	// Source: direct integration of dx/dy = (1 − F²)/(S0 − Sf) from the
	// brink (Chow 1959, §10-2), Gauss–Legendre quadrature (see stationOf).
	enter := c.stationOf(yBand)
	require.Less(t, c.length-enter, defaultControlBuffer*yc, "the band must lie inside the default buffer")
	t.Logf("yc %.4f m, F = 0.86 at %.3f m (%.2f yc upstream of the brink)", yc, enter, (c.length-enter)/yc)

	m, _, fs := golden(t, "froude-buffer.chan.hcl", "froude-buffer.policy.hcl")
	matchWants(t, m.Source, "buffer", fs)
	m, _, fs = golden(t, "froude-buffer.chan.hcl", "froude-nobuffer.policy.hcl")
	got := matchWants(t, m.Source, "nobuffer", fs)
	require.Len(t, got, 1)
	for _, f := range got {
		assert.InDelta(t, enter, f.FromStation, 0.5, "band entered")
		assert.InDelta(t, 300, f.ToStation, 1e-9)
	}
}

// TestGoldenUndularThreshold: an undular jump in no basin is reported when
// every jump needs one, and not when the policy exempts jumps below F1 1.7
// or below a head loss of 0.05 m.
func TestGoldenUndularThreshold(t *testing.T) {
	// Source: Belanger's sequent depths y1/y2 = ½(√(1 + 8·F2²) − 1) from
	// the normal depth downstream, and the jump loss ΔE = (y2 − y1)³/(4·y1·y2)
	// (Chow 1959, ch. 15); undular below F1 = 1.7 (Peterka 1958).
	const g, b, n, s, q = 9.80665, 2.5, 0.014, 0.0019, 4.0
	y2 := manningNormalDepth(siUnits, q, b, n, s)
	f2 := q / (b * y2) / math.Sqrt(g*y2)
	y1 := y2 * 0.5 * (math.Sqrt(1+8*f2*f2) - 1)
	f1 := q / (b * y1) / math.Sqrt(g*y1)
	loss := math.Pow(y2-y1, 3) / (4 * y1 * y2)
	require.Less(t, f1, 1.7)
	require.Less(t, loss, 0.05)
	t.Logf("F1 %.3f, head loss %.4f m", f1, loss)
	for _, tc := range []struct{ policy, label string }{
		{"undular-all.policy.hcl", "all"},
		{"undular-froude.policy.hcl", "froude"},
		{"undular-loss.policy.hcl", "loss"},
	} {
		t.Run(tc.label, func(t *testing.T) {
			m, _, fs := golden(t, "undular.chan.hcl", tc.policy)
			got := matchWants(t, m.Source, tc.label, fs)
			for _, f := range got {
				assert.Contains(t, f.Message, "F1 "+numfmt.Num(f1))
			}
		})
	}
}

// TestGoldenOvertopOnce: capacity reports the overtopping stretch of an M1
// backwater once; freeboard and superelevation stop where it begins, at
// the station the quadrature gives for depth = height, and start where
// the freeboard left falls below 0.3 m.
func TestGoldenOvertopOnce(t *testing.T) {
	c := rectBackwater(2, 0.015, 0.003, 2, 600, 1.3)
	const h, minimum, rc = 1.0, 0.3, 25.0
	// Source: Chow 1959, §10-2, direct integration (see stationOf).
	overtop := c.stationOf(h)
	short := c.stationOf(h - minimum)
	// Source: Δy = C·V²·T/(g·rc), C = 0.5 (USACE EM 1110-2-1601, from
	// memory): the outer bank keeps 0.3 m where y + Δy ≤ 0.7.
	yBend := depthWhere(func(y float64) float64 {
		v := c.q / c.area(y)
		return y + 0.5*v*v*c.top(y)/(c.g*rc) - (h - minimum)
	}, 0.5, 1.0)
	bendShort := c.stationOf(yBend)
	tol := max(0.5, 1e-3*c.length)
	m, _, fs := golden(t, "overtop-once.chan.hcl", "overtop-once.policy.hcl")
	got := matchWants(t, m.Source, "", fs)
	require.Len(t, got, 3)
	var capFrom float64
	for w, f := range got {
		if w.Rule == "capacity" {
			capFrom = f.FromStation
		}
	}
	assert.InDelta(t, overtop, capFrom, tol, "overtopping begins")
	for w, f := range got {
		switch w.Rule {
		case "freeboard":
			assert.InDelta(t, short, f.FromStation, tol, "freeboard short")
			assert.InDelta(t, capFrom, f.ToStation, 2*locateTol(capFrom), "freeboard ends where capacity begins")
			assert.InDelta(t, 0, f.Value, 0.01, "freeboard at the overtopping edge")
			assert.Contains(t, f.Message, "reported once, by capacity")
		case "superelevation":
			assert.InDelta(t, bendShort, f.FromStation, tol, "bend freeboard short")
			assert.InDelta(t, capFrom, f.ToStation, 2*locateTol(capFrom), "superelevation ends where capacity begins")
		case "capacity":
			assert.Contains(t, f.Remedy, "to keep the freeboard the policy requires (0.3 m)")
		}
	}
}

// TestGoldenJumpClipped: a jump whose roller runs past its reach end is
// clipped to the reach, says it continues into the reach below, and is
// contained when a basin at the head of that reach takes the rest of it.
func TestGoldenJumpClipped(t *testing.T) {
	toe, _, _ := jumpExpect()
	for _, tc := range []struct {
		file      string
		tailBasin float64
	}{{"jump-clipped.chan.hcl", 10}, {"jump-clipped-short.chan.hcl", 2}} {
		t.Run(tc.file, func(t *testing.T) {
			m, res, fs := golden(t, tc.file, "jumps.policy.hcl")
			got := matchWants(t, m.Source, "", fs)
			jumps := res.Events[0].Reaches[0].Jumps
			require.Len(t, jumps, 1)
			over := jumps[0].End() - 12
			require.Greater(t, over, 0.0)
			for w, f := range got {
				assert.InDelta(t, toe, f.FromStation, 0.5, "toe")
				assert.InDelta(t, 12, f.ToStation, 1e-9, "clipped at the reach end")
				assert.Contains(t, f.Message, `into reach "tail"`)
				if w.Rule == "jump_containment" {
					assert.InDelta(t, over-tc.tailBasin, f.Value, 1e-9, "unprotected length below the node")
				}
			}
		})
	}
}
