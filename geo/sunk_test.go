package geo

import (
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

func sunkSquare(x0, y0, side float64) orb.Ring {
	return orb.Ring{{x0, y0}, {x0 + side, y0}, {x0 + side, y0 + side}, {x0, y0 + side}, {x0, y0}}
}

func TestSunkBlocks(t *testing.T) {
	// A south face 10 m wide and 5 m deep, pitch 40°, eave 6 m along y = 0: the surface rises
	// tan 40° = 0.8391 m per metre northward (analytic).
	face := Face{ID: "S", Plan: orb.Ring{{0, 0}, {10, 0}, {10, 5}, {0, 5}, {0, 0}}, PitchDeg: 40, AspectDeg: 180, EaveHeightM: 6}
	face.SetEave()
	chimney := func(h float64) Block {
		return Block{ID: "C1", Index: 3, Footprint: sunkSquare(4, 3, 0.6), HeightM: h}
	}
	tests := []struct {
		name  string
		block Block
		want  []string // fragments; none when the block stands clear
	}{
		// Roof under the chimney: 6 + 3·0.8391 = 8.517 m to 6 + 3.6·0.8391 = 9.021 m.
		{"height above the roof", chimney(1.2), []string{`feature 3 (id "C1")`, "height_m", `roof face "S"`, "8.52 to 9.02 m", "height_m: 10.22", "height_above_roof_m: 1.20"}},
		{"height above the ground", chimney(10.2), nil},
		// Partly above the roof (the top at 8.8 m clears its lower edge): a block that
		// emerges somewhere is drawn as meant.
		{"emerging", chimney(8.8), nil},
		{"beside the face", Block{ID: "G", Index: 4, Footprint: sunkSquare(20, 20, 3), HeightM: 2.5}, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := &Site{Faces: []Face{face}, Blocks: []Block{tc.block}}
			got := s.SunkBlocks()
			if len(tc.want) == 0 {
				if len(got) != 0 {
					t.Fatalf("unexpected %v", got)
				}
				return
			}
			if len(got) != 1 {
				t.Fatalf("problems %v, want one", got)
			}
			got[0].File = "roof.geojson"
			msg := got[0].String()
			for _, w := range tc.want {
				if !strings.Contains(msg, w) {
					t.Errorf("%q lacks %q", msg, w)
				}
			}
		})
	}
	if h := face.HeightAt(orb.Point{4, 3}); math.Abs(h-(6+3*math.Tan(40*math.Pi/180))) > 1e-9 {
		t.Fatalf("roof height %.4f under the chimney's corner, want 8.5172", h)
	}
}

func TestSunkBlocksExample(t *testing.T) {
	// The drawings' chimneys and dormers are given above the ground: nothing to flag.
	for _, name := range []string{"testdata/site.geojson", "../examples/sample-house/roof.geojson"} {
		s, err := decodeFile(t, name, DecodeOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if got := s.SunkBlocks(); len(got) != 0 {
			t.Errorf("%s: blocks flagged: %v", name, got)
		}
		if len(s.Blocks) == 0 {
			t.Errorf("%s: no blocks to test", name)
		}
	}
}
