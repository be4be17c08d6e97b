package shading

import (
	"context"
	"slices"
	"testing"

	"sunstring/geo"
)

// TestBlockers: analytic cases around a flat module (1 × 1.7 m, x 5…6, y 5…6.7, on a flat
// roof at 3 m): a wall south whose top is 3.5 m above the module and 7 m away (in the way of
// a southern sun below atan(3.5 / 8.7) = 21.9° for every cell, none above atan(3.5 / 7) =
// 26.6°); the flat roof of a taller house east, 9 m higher, x 15…20 (in the way of an eastern
// sun between atan(9 / 14.5) = 31.8° and atan(9 / 9.5) = 43.4°); a far horizon rising to 20°
// in the west. Hand calculation from the geometry.
func TestBlockers(t *testing.T) {
	own := geo.Face{ID: "F", Plan: rect(0, 0, 10, 10), EaveHeightM: 3}
	own.SetEave()
	east := geo.Face{ID: "house-E", Plan: rect(15, 0, 20, 10), EaveHeightM: 12}
	east.SetEave()
	site := &geo.Site{Faces: []geo.Face{own, east},
		Blocks: []geo.Block{{ID: "wall", Footprint: rect(0, -2.2, 10, -2), HeightM: 6.5}}}
	hz, err := HorizonFromPoints([]float64{0, 90, 180, 270}, []float64{0, 0, 0, 20})
	if err != nil {
		t.Fatal(err)
	}
	mods := []geo.Module{flatModule("M", geo.Vec3{E: 5, N: 5, U: 3}, 1, 1.7)}
	sc, err := NewScene(site, mods, Options{Horizon: hz, Workers: 1})
	if err != nil {
		t.Fatal(err)
	}
	steps := []Step{
		{Sun: sunAt(180, 15)}, // the wall
		{Sun: sunAt(180, 40)}, // free
		{Sun: sunAt(90, 38)},  // the house east
		{Sun: sunAt(90, 60)},  // free
		{Sun: sunAt(270, 10)}, // below the far horizon (20° there)
		{Sun: sunAt(270, 30)}, // free
		{Sun: sunAt(170, 12)}, // the wall again
		{Sun: sunAt(90, -5)},  // night
	}
	want := []Blocker{{Kind: "horizon", Steps: 1}, {ID: "house-E", Kind: "face", Steps: 1}, {ID: "wall", Kind: "block", Steps: 2}}
	res, err := sc.Compute(context.Background(), steps, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name string
		r    *Result
	}{
		{"from the shading result", res},
		{"every step", nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := sc.Blockers(0, steps, tc.r)
			slices.SortFunc(got, func(a, b Blocker) int {
				if a.ID < b.ID {
					return -1
				}
				if a.ID > b.ID {
					return 1
				}
				return 0
			})
			if !slices.Equal(got, want) {
				t.Errorf("Blockers = %+v, want %+v", got, want)
			}
		})
	}
	if got := sc.Blockers(1, steps, res); got != nil {
		t.Errorf("a module out of range: %+v, want nil", got)
	}
}
