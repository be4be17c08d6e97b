package shading

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/paulmach/orb"
	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/geo"
)

// Bad drawings are errors that say what is wrong, never panics.
func TestNewSceneRejects(t *testing.T) {
	ok := flatModule("M", geo.Vec3{}, 1, 1)
	cases := []struct {
		name string
		site *geo.Site
		mods []geo.Module
		opt  Options
	}{
		{"negative grid", nil, []geo.Module{ok}, Options{Grid: geo.CellGrid{Cols: -1, Rows: 3}}},
		{"half a grid", nil, []geo.Module{ok}, Options{Grid: geo.CellGrid{Cols: 3}}},
		{"zero-width module", nil, []geo.Module{flatModule("M", geo.Vec3{}, 0, 1)}, Options{}},
		{"parallel U and V", nil, []geo.Module{{ID: "M", U: geo.Vec3{E: 1}, V: geo.Vec3{E: 1}, WidthM: 1, LengthM: 1}}, Options{}},
		{"NaN origin", nil, []geo.Module{flatModule("M", geo.Vec3{E: math.NaN()}, 1, 1)}, Options{}},
		{"vertical face", &geo.Site{Faces: []geo.Face{{ID: "F", Plan: rect(0, 0, 1, 1), PitchDeg: 90}}}, nil, Options{}},
		{"face of two points", &geo.Site{Faces: []geo.Face{{ID: "F", Plan: orb.Ring{{0, 0}, {1, 1}}}}}, nil, Options{}},
		{"block top below base", &geo.Site{Blocks: []geo.Block{{ID: "B", Footprint: rect(0, 0, 1, 1), BaseM: 3, HeightM: 2}}}, nil, Options{}},
		{"tree crown upside down", &geo.Site{Trees: []geo.Tree{{ID: "T", HeightM: 2, CrownBaseM: 3, CrownRadiusM: 1}}}, nil, Options{}},
		{"tree without crown", &geo.Site{Trees: []geo.Tree{{ID: "T", HeightM: 5, CrownBaseM: 1}}}, nil, Options{}},
		{"tree of unknown shape", &geo.Site{Trees: []geo.Tree{{ID: "T", HeightM: 5, CrownBaseM: 1, CrownRadiusM: 1, Shape: 7}}}, nil, Options{}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := NewScene(c.site, c.mods, c.opt)
			var se *SceneError
			if !errors.Is(err, ErrBadScene) || !errors.As(err, &se) || !se.BadInput() {
				t.Errorf("err %v, want a *SceneError wrapping ErrBadScene", err)
			}
		})
	}
}

// The zero values work: no site, no modules, no steps give an empty result; zero Options
// use geo.DefaultGrid, the fill's default too.
func TestZeroValues(t *testing.T) {
	sc, err := NewScene(nil, nil, Options{})
	if err != nil {
		t.Fatal(err)
	}
	r, err := sc.Compute(context.Background(), nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(float64(r.Steps()+sc.Modules()), 0, 0) || sc.Grid() != geo.DefaultGrid { // documented defaults
		t.Errorf("steps %d modules %d grid %v", r.Steps(), sc.Modules(), sc.Grid())
	}
	sc, err = NewScene(nil, []geo.Module{flatModule("M", geo.Vec3{}, 1, 1)}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	// a zero sun vector is not up: dark, not a panic
	r, err = sc.Compute(context.Background(), []Step{{}, {Sun: [3]float64{math.NaN(), 0, 1}}}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for s := range 2 {
		if got := r.LitFraction(0, s); !scalar.EqualWithinAbs(got, 0, 0) { // no sun, no beam
			t.Errorf("step %d: lit %g, want 0", s, got)
		}
	}
}
