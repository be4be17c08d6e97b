package shading

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"

	"sunstring/geo"
)

// TestConvexEdges: a footprint is taken as half-planes only when it is strictly convex, in
// either turning sense; a notch or a straight vertex leaves it to the general ring test.
func TestConvexEdges(t *testing.T) {
	for _, tc := range []struct {
		name   string
		ring   []orb.Point
		convex bool
	}{
		{"square anticlockwise", []orb.Point{{0, 0}, {4, 0}, {4, 3}, {0, 3}}, true},
		{"square clockwise", []orb.Point{{0, 0}, {0, 3}, {4, 3}, {4, 0}}, true},
		{"triangle", []orb.Point{{0, 0}, {5, 1}, {2, 4}}, true},
		{"L shape", []orb.Point{{0, 0}, {4, 0}, {4, 1}, {1, 1}, {1, 3}, {0, 3}}, false},
		{"a straight vertex", []orb.Point{{0, 0}, {2, 0}, {4, 0}, {4, 3}, {0, 3}}, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if got := convexEdges(tc.ring) != nil; got != tc.convex {
				t.Errorf("convex = %v, want %v", got, tc.convex)
			}
		})
	}
}

// A convex block's ray test by half-planes agrees with the general one (both ends of the plan
// segment tested in the ring, then its crossings with the ring's edges) on random rays towards
// the block, from points around and below it: the two differ only for a ray that grazes an
// edge or corner exactly, which random rays do not.
func TestConvexBlockAsRing(t *testing.T) {
	turn := func(x, y float64) orb.Point {
		const c, s = 0.8660254037844387, 0.5 // 30°
		return orb.Point{x*c + y*s + 3, -x*s + y*c + 1}
	}
	for _, tc := range []struct {
		name string
		b    geo.Block
	}{
		{"flat box turned 30°", geo.Block{ID: "box", Footprint: orb.Ring{turn(-1, -0.6), turn(1, -0.6), turn(1, 0.6), turn(-1, 0.6), turn(-1, -0.6)},
			BaseM: 0.5, HeightM: 1.8}},
		{"clockwise pentagon", geo.Block{ID: "five", Footprint: orb.Ring{{0, 0}, {-1, 2}, {1, 3.5}, {3, 2}, {2, 0}, {0, 0}}, HeightM: 2.5}},
		{"gabled house", geo.Block{ID: "house", Footprint: orb.Ring{turn(-5, -3), turn(5, -3), turn(5, 3), turn(-5, 3), turn(-5, -3)},
			HeightM: 5, RidgeM: 8, RidgeAzimuthDeg: 120}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			o, err := blockObject(&tc.b)
			if err != nil {
				t.Fatal(err)
			}
			if o.edges == nil {
				t.Fatal("the footprint was not taken as convex")
			}
			ring := o
			ring.edges = nil
			r := rand.New(rand.NewPCG(3, 11))
			hits := 0
			const rays = 20000
			for range rays {
				// A point up to 12 m away at up to 3 m height, a ray towards a point near the
				// block (up to 1 m outside its box), so that about half the rays hit.
				a := 2 * math.Pi * r.Float64()
				dist := 0.5 + 11.5*r.Float64()
				p := geo.Vec3{E: o.centre.E + dist*math.Cos(a), N: o.centre.N + dist*math.Sin(a), U: 3 * r.Float64()}
				q := geo.Vec3{E: o.minE - 1 + (o.maxE-o.minE+2)*r.Float64(), N: o.minN - 1 + (o.maxN-o.minN+2)*r.Float64(),
					U: o.base + (o.top-o.base+1)*r.Float64()}
				d := q.Sub(p)
				d = d.Scale(1 / d.Norm())
				got, want := o.hitBlock(p, d), ring.hitBlock(p, d)
				if got != want {
					t.Fatalf("ray from %v along %v: half-planes say %v, the ring says %v", p, d, got, want)
				}
				if got {
					hits++
				}
			}
			// Both answers must occur often (a tenth of the rays at least), or the comparison shows
			// little.
			if hits < rays/10 || hits > rays*9/10 {
				t.Errorf("%d of %d rays hit", hits, rays)
			}
		})
	}
}
