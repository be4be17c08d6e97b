package shading

import (
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"

	"sunstring/geo"
)

// TestHippedBlock holds the ray test of a hipped block to geo.Block.TopAt, the roof written as
// the lowest of four planes: a point just under the roof is inside the solid (an upward ray
// starts in it), a point just over it is not. Seeded random points over a 12 × 8 m block turned
// 30°, ridge 3 m above 6 m eaves.
func TestHippedBlock(t *testing.T) {
	turn := func(x, y float64) orb.Point {
		// 30° clockwise, the ridge along azimuth 120°
		const c, s = 0.8660254037844387, 0.5
		return orb.Point{x*c + y*s + 20, -x*s + y*c - 10}
	}
	b := geo.Block{ID: "n", Footprint: orb.Ring{turn(-6, -4), turn(6, -4), turn(6, 4), turn(-6, 4), turn(-6, -4)},
		HeightM: 6, RidgeM: 9, RidgeAzimuthDeg: 120, Hipped: true}
	o, err := blockObject(&b)
	if err != nil {
		t.Fatal(err)
	}
	r := rand.New(rand.NewPCG(7, 8))
	up := geo.Vec3{U: 1}
	for range 2000 {
		p := turn(r.Float64()*11.8-5.9, r.Float64()*7.8-3.9)
		top := b.TopAt(p)
		if !o.hit(geo.Vec3{E: p[0], N: p[1], U: top - 0.01}, up) {
			t.Fatalf("%v: a point 1 cm under the roof (%.3f m) is not in the solid", p, top)
		}
		if o.hit(geo.Vec3{E: p[0], N: p[1], U: top + 0.01}, up) {
			t.Fatalf("%v: a point 1 cm over the roof (%.3f m) hits the solid", p, top)
		}
	}
	// The hipped ends: 2 m in from an end wall along the ridge the roof is 2·(3/4) = 1.5 m above
	// the eaves (slope 3 m over the 4 m half-width, hand calculation); on a gable it would be the
	// ridge.
	if got := b.TopAt(turn(4, 0)); got < 7.5-1e-9 || got > 7.5+1e-9 {
		t.Errorf("TopAt 2 m from the end wall = %.6f, want 7.5", got)
	}
}
