package geo

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"gonum.org/v1/gonum/floats/scalar"
)

// rectFace is a face over the plan rectangle [0, w] × [0, d] (local metres) whose eave is the
// edge facing aspectDeg (one of 0, 90, 180, 270).
func rectFace(id string, w, d, pitchDeg, aspectDeg, eaveM float64) Face {
	f := Face{ID: id, Plan: orb.Ring{{0, 0}, {w, 0}, {w, d}, {0, d}, {0, 0}}, PitchDeg: pitchDeg, AspectDeg: aspectDeg, EaveHeightM: eaveM}
	f.SetEave()
	return f
}

// writeArtifact saves input, expected and result as GeoJSON in local metres (x east, y north)
// for a person to look at when a geometry test fails.
func writeArtifact(t *testing.T, name string, site *Site, mods []Module, expected string) {
	t.Helper()
	var fs []map[string]any
	ring := func(r orb.Ring) any {
		var c [][2]float64
		for _, p := range r {
			c = append(c, [2]float64{p[0], p[1]})
		}
		return map[string]any{"type": "Polygon", "coordinates": [][][2]float64{c}}
	}
	for _, f := range site.Faces {
		fs = append(fs, map[string]any{"type": "Feature", "properties": map[string]any{"role": "input", "kind": "roof", "id": f.ID}, "geometry": ring(f.Plan)})
	}
	for _, a := range site.Avoids {
		fs = append(fs, map[string]any{"type": "Feature", "properties": map[string]any{"role": "input", "kind": "avoid", "id": a.ID}, "geometry": ring(a.Area)})
	}
	for _, b := range site.Blocks {
		fs = append(fs, map[string]any{"type": "Feature", "properties": map[string]any{"role": "input", "kind": "block", "id": b.ID}, "geometry": ring(b.Footprint)})
	}
	for _, m := range mods {
		c := m.Corners()
		fs = append(fs, map[string]any{"type": "Feature", "properties": map[string]any{"role": "result", "id": m.ID},
			"geometry": ring(orb.Ring{c[0].Plan(), c[1].Plan(), c[2].Plan(), c[3].Plan(), c[0].Plan()})})
	}
	fs = append(fs, map[string]any{"type": "Feature", "properties": map[string]any{"role": "expected", "text": expected}, "geometry": nil})
	b, _ := json.MarshalIndent(map[string]any{"type": "FeatureCollection", "features": fs}, "", " ")
	p := filepath.Join(t.ArtifactDir(), strings.ReplaceAll(name, "/", "_")+".geojson")
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Log(err)
	}
	t.Logf("geometry written to %s", p)
}

func TestFillCounts(t *testing.T) {
	// Module 1.72 × 1.13 m, gap 0.02 m, setback 0.4 m (common practice) on a 10 m × 5 m plan
	// rectangle with its eave on the 10 m side.
	base := FillOptions{LengthM: 1.72, WidthM: 1.13, SetbackM: 0.4, GapM: 0.02}
	with := func(f func(*FillOptions)) FillOptions { o := base; f(&o); return o }
	tests := []struct {
		name     string
		face     Face
		extra    func(*Site)
		opt      FillOptions
		want     int
		portrait bool
		note     string
	}{
		// Along the eave 10 − 2·0.4 = 9.2 m: floor((9.2 + 0.02)/1.15) = 8 columns.
		// Up the slope 5/cos 30° = 5.7735 m, less 0.8 = 4.9735: floor(4.9935/1.74) = 2 rows.
		{"portrait 30° south", rectFace("S", 10, 5, 30, 180, 3), nil, base, 16, true, ""},
		// Landscape: floor(9.22/1.74) = 5 columns, floor(4.9935/1.15) = 4 rows.
		{"landscape 30° south", rectFace("S", 10, 5, 30, 180, 3), nil, with(func(o *FillOptions) { o.Orientation = Landscape }), 20, false, ""},
		{"best picks landscape", rectFace("S", 10, 5, 30, 180, 3), nil, with(func(o *FillOptions) { o.Orientation = Best }), 20, false, ""},
		// Flat: up the slope 5 − 0.8 = 4.2 m: portrait floor(4.22/1.74) = 2 rows × 8 = 16;
		// landscape floor(4.22/1.15) = 3 rows × 5 = 15.
		{"best picks portrait when flat", rectFace("F", 10, 5, 0, 180, 3), nil, with(func(o *FillOptions) { o.Orientation = Best }), 16, true, ""},
		// East-facing: eave on the 5 m side x = 10. Along the eave 5 − 0.8 = 4.2 m: 3 columns
		// (floor(4.22/1.15)); up the slope 10/cos 20° = 10.642 m − 0.8 = 9.842:
		// floor(9.862/1.74) = 5 rows.
		{"portrait 20° east", rectFace("E", 10, 5, 20, 90, 3), nil, base, 15, true, ""},
		// An avoid area across the middle of the first row takes out the columns it touches:
		// columns start at x = 0.4 + 1.15·k; the area x ∈ [4.5, 4.6] hits column 4 (x 3.85–4.98)
		// in both rows (it spans the whole slope).
		{"avoid area", rectFace("S", 10, 5, 30, 180, 3), func(s *Site) {
			s.Avoids = []Avoid{{ID: "hatch", Area: orb.Ring{{4.5, 0}, {4.6, 0}, {4.6, 5}, {4.5, 5}, {4.5, 0}}}}
		}, base, 14, true, ""},
		// A chimney below the roof plane (top 2 m, eave 3 m) is inside the house: no obstacle.
		{"block under the roof", rectFace("S", 10, 5, 30, 180, 3), func(s *Site) {
			s.Blocks = []Block{{ID: "wall", Footprint: orb.Ring{{4.5, 1}, {4.6, 1}, {4.6, 2}, {4.5, 2}, {4.5, 1}}, HeightM: 2}}
		}, base, 16, true, ""},
		// The same chimney rising to 9 m with 0.3 m clearance: its footprint x 4.5–4.6 grown
		// to 4.2–4.9 bars modules starting in (4.2 − 1.13, 4.9) = (3.07, 4.9), leaving 0.4–3.07
		// (3 modules) and 4.9–8.47 (floor(3.57/1.15) + 1 = 4): 7 in a row it crosses. It spans
		// plan y 1–2, slope 1.155–2.309 m, grown 0.855–2.609. Rows at the setback line
		// (0.4–2.12, 2.14–3.86) both meet it: 14, what the fill placed before it searched row
		// starts. Two rows leave 4.9735 − 3.46 = 1.51 m to spare; starting 0.47 m up, row 2
		// (from 2.61) clears it and takes 8: 7 + 8 = 15. Row 1 cannot clear it as well.
		{"chimney with clearance", rectFace("S", 10, 5, 30, 180, 3), func(s *Site) {
			s.Blocks = []Block{{ID: "chimney", Footprint: orb.Ring{{4.5, 1}, {4.6, 1}, {4.6, 2}, {4.5, 2}, {4.5, 1}}, HeightM: 9}}
		}, with(func(o *FillOptions) { o.ObstacleClearanceM = 0.3 }), 15, true, ""},
		{"minimum count skips the face", rectFace("S", 10, 5, 30, 180, 3), nil, with(func(o *FillOptions) { o.MinModules = 17 }), 0, true, "fewer than the minimum of 17"},
		// 2 m × 1.5 m: 2 − 0.8 = 1.2 m across, less than one module width.
		{"too small", rectFace("T", 2, 1.5, 30, 180, 3), nil, base, 0, true, "no module fits"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			site := &Site{Faces: []Face{tc.face}}
			if tc.extra != nil {
				tc.extra(site)
			}
			mods, notes, err := Fill(site, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			if len(mods) != tc.want {
				writeArtifact(t, t.Name(), site, mods, fmt.Sprintf("%d modules", tc.want))
				t.Fatalf("placed %d modules, want %d (hand count)", len(mods), tc.want)
			}
			for _, m := range mods {
				if m.Portrait != tc.portrait {
					t.Fatalf("%s: portrait = %v, want %v", m.ID, m.Portrait, tc.portrait)
				}
			}
			if tc.note != "" && !strings.Contains(strings.Join(notes, "\n"), tc.note) {
				t.Errorf("notes %q lack %q", notes, tc.note)
			}
		})
	}
}

// TestFillFrame checks the module frame on random faces: U×V is the face's outward normal, the
// corners are counter-clockwise seen from outside, every corner lies on the face plane and
// inside the outline less the setback, row 1 is at the eave and column 1 at the left.
func TestFillFrame(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for i := range 60 {
		pitch := rng.Float64() * 60
		aspect := rng.Float64() * 360
		o := FillOptions{Orientation: Orientation(i % 3), SetbackM: 0.3, GapM: 0.02}
		// A rectangle rotated so that its long side follows the eave.
		a := aspect * math.Pi / 180
		d := orb.Point{math.Sin(a), math.Cos(a)}
		r := orb.Point{-d[1], d[0]}
		w, h := 6+rng.Float64()*8, 4+rng.Float64()*4
		pt := func(s, u float64) orb.Point { return orb.Point{s*r[0] - u*d[0], s*r[1] - u*d[1]} }
		f := Face{ID: "R", Plan: orb.Ring{pt(0, 0), pt(w, 0), pt(w, h), pt(0, h), pt(0, 0)}, PitchDeg: pitch, AspectDeg: aspect, EaveHeightM: 3}
		f.SetEave()
		site := &Site{Faces: []Face{f}}
		mods, _, err := Fill(site, o)
		if err != nil {
			t.Fatal(err)
		}
		if len(mods) == 0 {
			t.Fatalf("case %d: nothing placed on a %.1f × %.1f m face", i, w, h)
		}
		n := f.Normal()
		for _, m := range mods {
			// 1e-12: unit vectors built from sines and cosines of the same angles.
			mn := m.Normal()
			if !scalar.EqualWithinAbs(mn.Dot(n), 1, 1e-12) {
				t.Fatalf("case %d %s: module normal %v, face normal %v", i, m.ID, mn, n)
			}
			c := m.Corners()
			for k := range 4 {
				turn := c[(k+1)%4].Sub(c[k]).Cross(c[(k+2)%4].Sub(c[(k+1)%4]))
				if turn.Dot(n) <= 0 {
					t.Fatalf("case %d %s: corners not counter-clockwise from outside", i, m.ID)
				}
				// 1e-9 m: the lift is exact up to rounding.
				if !scalar.EqualWithinAbs(c[k].U, f.HeightAt(c[k].Plan()), 1e-9) {
					t.Fatalf("case %d %s: corner %d off the face plane", i, m.ID, k)
				}
				// Inside the outline less the setback, which on the slope shrinks by cos(pitch)
				// across the eave direction; 1 mm slack as in the fill.
				if dist := ringBoundaryDist(f.Plan, c[k].Plan()); dist < 0.3*math.Cos(pitch*math.Pi/180)-1e-3 {
					t.Fatalf("case %d %s: corner %d is %.3f m from the edge", i, m.ID, k, dist)
				}
			}
		}
		// Row 1, column 1 is lowest and leftmost: no module has a lower centre, and within
		// row 1 none lies further left (left = against r).
		first := mods[0]
		if first.Row != 1 || first.Col != 1 {
			t.Fatalf("case %d: first module %s", i, first.ID)
		}
		for _, m := range mods {
			if m.Center().U < first.Center().U-1e-9 {
				t.Fatalf("case %d: %s lower than %s", i, m.ID, first.ID)
			}
			if m.Row == 1 && m.Center().Plan()[0]*r[0]+m.Center().Plan()[1]*r[1] < first.Center().Plan()[0]*r[0]+first.Center().Plan()[1]*r[1]-1e-9 {
				t.Fatalf("case %d: %s left of %s", i, m.ID, first.ID)
			}
		}
	}
}

func TestParseOrientation(t *testing.T) {
	tests := []struct {
		in   string
		want Orientation
		ok   bool
	}{{"portrait", Portrait, true}, {"Landscape", Landscape, true}, {" best ", Best, true}, {"diagonal", 0, false}}
	for _, tc := range tests {
		t.Run(tc.in, func(t *testing.T) {
			got, err := ParseOrientation(tc.in)
			if (err == nil) != tc.ok || got != tc.want {
				t.Fatalf("ParseOrientation(%q) = %v, %v", tc.in, got, err)
			}
			if err == nil && got.String() != strings.ToLower(strings.TrimSpace(tc.in)) {
				t.Fatalf("String() = %q", got.String())
			}
		})
	}
}
