package geo

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
	"gonum.org/v1/gonum/floats/scalar"
)

// rect is the closed counter-clockwise ring of the axis-aligned rectangle [x0,x1]×[y0,y1].
func rect(x0, y0, x1, y1 float64) orb.Ring {
	return orb.Ring{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}, {x0, y0}}
}

// totalArea sums the rings' areas, m².
func totalArea(rs []orb.Ring) float64 {
	s := 0.0
	for _, r := range rs {
		s += math.Abs(planar.Area(r))
	}
	return s
}

// The L of the concave cases: 10 × 4 m along the bottom and 4 × 6 m up the left side, 64 m².
var ell = orb.Ring{{0, 0}, {10, 0}, {10, 4}, {4, 4}, {4, 10}, {0, 10}, {0, 0}}

func TestClipRings(t *testing.T) {
	// Every area is a hand calculation of rectangles and triangles (analytic).
	tests := []struct {
		name               string
		a, b               orb.Ring
		diff, inter        float64 // areas, m²
		diffParts, interPt int
		diffOK             bool
	}{
		{"apart", rect(0, 0, 10, 4), rect(20, 0, 30, 4), 40, 0, 1, 0, true},
		// Sharing the edge y = 4 whole: touching, no common area.
		{"edge to edge", rect(0, 0, 10, 4), rect(0, 4, 10, 8), 40, 0, 1, 0, true},
		// A 3 cm strip along the shared edge: 10 × 0.03 = 0.3 m² shared, 40 − 0.3 left.
		{"strip along an edge", rect(0, 0, 10, 4), rect(0, 3.97, 10, 8), 39.7, 0.3, 1, 1, true},
		// The same strip with b's ends short of a's: 8 × 0.03 = 0.24 m².
		{"strip inside an edge", rect(0, 0, 10, 4), rect(1, 3.97, 9, 8), 39.76, 0.24, 1, 1, true},
		// A 4 × 4 cm square at the corner: 0.0016 m².
		{"corner", rect(0, 0, 10, 4), rect(9.96, 3.96, 14, 8), 40 - 0.0016, 0.0016, 1, 1, true},
		// Sharing part of the edge y = 0 and the edge x = 10: a half, 20 m², each way.
		{"half along two edges", rect(0, 0, 10, 4), rect(5, 0, 15, 4), 20, 20, 1, 1, true},
		{"same outline", rect(0, 0, 10, 4), rect(0, 0, 10, 4), 0, 40, 0, 1, true},
		{"a inside b", rect(2, 1, 4, 2), rect(0, 0, 10, 4), 0, 2, 0, 1, true},
		// A hole in a: not an outline a face can have.
		{"b inside a", rect(0, 0, 10, 4), rect(2, 1, 4, 2), 38, 2, 1, 1, false},
		// Touching at one corner only.
		{"corner to corner", rect(0, 0, 10, 4), orb.Ring{{10, 4}, {15, 2}, {15, 6}, {10, 4}}, 40, 0, 1, 0, true},
		// Clockwise input is read as the same outline.
		{"clockwise b", rect(0, 0, 10, 4), orb.Ring{{0, 3.97}, {0, 8}, {10, 8}, {10, 3.97}, {0, 3.97}}, 39.7, 0.3, 1, 1, true},
		// A square of side 2 and the same square turned 45° about its centre share a regular
		// octagon: 4 less four corner triangles with legs 2 − √2, 2(2 − √2)² = 0.6863 m².
		{"square and diamond", rect(-1, -1, 1, 1), orb.Ring{{0, -math.Sqrt2}, {math.Sqrt2, 0}, {0, math.Sqrt2}, {-math.Sqrt2, 0}, {0, -math.Sqrt2}},
			2 * (2 - math.Sqrt2) * (2 - math.Sqrt2), 4 - 2*(2-math.Sqrt2)*(2-math.Sqrt2), 4, 1, true},
		// The L less a strip 3 cm wide along its inner upright edge (x 3.97 … 4, y 4 … 10):
		// 64 − 0.18; b's lower edge runs along the L's inner edge the other way.
		{"L, strip along the inner edge", ell, rect(3.97, 4, 8, 10), 64 - 0.18, 0.18, 1, 1, true},
		// A band y 3 … 3.5 across the L's foot cuts it in two: 10 × 3 = 30 below, 10 × 0.5 +
		// 4 × 6 = 29 above.
		{"L cut in two", ell, rect(-1, 3, 11, 3.5), 59, 5, 2, 1, true},
		// A square over the L's inner corner: 1 × 1 m of the square lies in the notch, 3 m² on the L.
		{"L, square over the inner corner", ell, rect(3, 3, 5, 5), 61, 3, 1, 1, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			d, ok := ringDifference(tc.a, tc.b)
			if ok != tc.diffOK {
				t.Errorf("difference ok = %v, want %v", ok, tc.diffOK)
			}
			if tc.diffOK {
				if got := totalArea(d); !scalar.EqualWithinAbsOrRel(got, tc.diff, 1e-9, 1e-9) || len(d) != tc.diffParts {
					t.Errorf("a less b: %d parts of %.6f m², want %d of %.6f m²", len(d), got, tc.diffParts, tc.diff)
				}
			}
			in := ringIntersection(tc.a, tc.b)
			if got := totalArea(in); !scalar.EqualWithinAbsOrRel(got, tc.inter, 1e-9, 1e-9) || len(in) != tc.interPt {
				t.Errorf("a and b: %d parts of %.6f m², want %d of %.6f m²", len(in), got, tc.interPt, tc.inter)
			}
			for _, r := range append(d, in...) {
				if r.Orientation() != orb.CCW || r[0] != r[len(r)-1] {
					t.Errorf("ring %v is not closed and counter-clockwise", r)
				}
			}
		})
	}
}

// TestClipRingsRandom: on seeded random star-shaped (so simple, mostly concave) polygons the
// two operations split a exactly (a less b plus a and b is a), and what they share agrees with
// the grid count of overlapArea, an independent measurement, within its sampling error.
func TestClipRingsRandom(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	star := func(cx, cy float64) orb.Ring {
		n := 3 + rng.IntN(6)
		var r orb.Ring
		for k := range n {
			ang := (float64(k) + 0.8*rng.Float64()) * 2 * math.Pi / float64(n)
			rad := 1 + 3*rng.Float64()
			r = append(r, orb.Point{cx + rad*math.Cos(ang), cy + rad*math.Sin(ang)})
		}
		return append(r, r[0])
	}
	checked, shared := 0, 0
	for k := range 300 {
		a, b := star(0, 0), star(3*rng.Float64()-1.5, 3*rng.Float64()-1.5)
		if k%3 == 0 {
			// Share a corner and part of an edge now and then: b takes a's first edge.
			b[0], b[1] = a[1], a[0]
			b[len(b)-1] = b[0]
			if _, c := selfCrossing(b); c >= 0 {
				continue
			}
		}
		in := totalArea(ringIntersection(a, b))
		d, ok := ringDifference(a, b)
		if !ok {
			continue // b inside a: a hole, checked above
		}
		if got, want := totalArea(d)+in, math.Abs(planar.Area(a)); !scalar.EqualWithinAbsOrRel(got, want, 1e-8, 1e-8) {
			t.Fatalf("case %d: a less b (%.6f) plus a and b (%.6f) = %.6f, want a's %.6f\na %v\nb %v", k, totalArea(d), in, got, want, a, b)
		}
		checked++
		if in > 0 {
			shared++
		}
		if k%5 != 0 {
			continue // the grid is slow: every fifth pair
		}
		grid, _, _ := overlapArea(a, b)
		// The grid (1 cm, or coarser on large bounds) miscounts about a cell's share along
		// the overlap's outline: a few hundredths of a square metre here.
		if !scalar.EqualWithinAbs(grid, in, 0.05) {
			t.Fatalf("case %d: a and b share %.4f m², the grid counts %.4f\na %v\nb %v", k, in, grid, a, b)
		}
	}
	// Most pairs must reach the checks and share area, or the test proves little.
	if checked < 200 || shared < 200 {
		t.Errorf("%d of 300 pairs checked, %d sharing area: want at least 200 of each", checked, shared)
	}
	t.Logf("%d pairs checked, %d sharing area", checked, shared)
}

// FuzzClipRings: for any two simple quadrilaterals the two operations split a exactly (a less
// b plus a and b is a), whenever a less b needs no hole, what they share is the same both
// ways round, and nothing panics. Coordinates are
// rounded to the centimetre so that shared corners and edges, the case between roof faces,
// come up often.
func FuzzClipRings(f *testing.F) {
	f.Add(0.0, 0.0, 10.0, 0.0, 10.0, 4.0, 0.0, 4.0, 0.0, 3.97, 10.0, 3.97, 10.0, 8.0, 0.0, 8.0)
	f.Add(0.0, 0.0, 10.0, 0.0, 10.0, 4.0, 0.0, 4.0, 5.0, 0.0, 15.0, 0.0, 15.0, 4.0, 5.0, 4.0)
	f.Add(0.0, 0.0, 10.0, 0.0, 10.0, 4.0, 0.0, 4.0, 9.96, 3.96, 14.0, 3.96, 14.0, 8.0, 9.96, 8.0)
	f.Fuzz(func(t *testing.T, ax0, ay0, ax1, ay1, ax2, ay2, ax3, ay3, bx0, by0, bx1, by1, bx2, by2, bx3, by3 float64) {
		cm := func(v float64) float64 {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return 0
			}
			return math.Round(math.Mod(v, 50)*100) / 100
		}
		ring := func(v ...float64) orb.Ring {
			r := orb.Ring{}
			for i := 0; i < len(v); i += 2 {
				r = append(r, orb.Point{cm(v[i]), cm(v[i+1])})
			}
			return append(r, r[0])
		}
		a := ring(ax0, ay0, ax1, ay1, ax2, ay2, ax3, ay3)
		b := ring(bx0, by0, bx1, by1, bx2, by2, bx3, by3)
		for _, r := range []orb.Ring{a, b} {
			if i, _ := selfCrossing(r); i >= 0 || math.Abs(planar.Area(r)) < 1e-4 {
				return // not a face outline
			}
		}
		in := totalArea(ringIntersection(a, b))
		d, ok := ringDifference(a, b)
		if !ok {
			return
		}
		// Snapping points within clipEps moves an edge by at most that much: the areas may
		// differ by clipEps times the outlines' lengths.
		tol := clipEps * (planar.Length(a) + planar.Length(b))
		if got, want := totalArea(d)+in, math.Abs(planar.Area(a)); !scalar.EqualWithinAbs(got, want, tol) {
			t.Errorf("a less b (%.6f) plus a and b (%.6f) = %.6f, want a's %.6f\na %v\nb %v", totalArea(d), in, got, want, a, b)
		}
		// What the two share does not depend on which is cut from which.
		if ba := totalArea(ringIntersection(b, a)); !scalar.EqualWithinAbs(in, ba, tol) {
			t.Errorf("a and b share %.6f m², b and a %.6f m²\na %v\nb %v", in, ba, a, b)
		}
	})
}
