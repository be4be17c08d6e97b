package geo

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb/planar"
	"gonum.org/v1/gonum/floats/scalar"
)

func decodeBuildings(t *testing.T) *Site {
	t.Helper()
	s, err := decodeFile(t, "testdata/buildings.geojson", DecodeOptions{OriginLonDeg: ptr(15.4), OriginLatDeg: ptr(47.1)})
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// facesOf returns the faces a building made, by id.
func facesOf(s *Site, building string) map[string]*Face {
	out := map[string]*Face{}
	for i := range s.Faces {
		if s.Faces[i].Building == building {
			out[s.Faces[i].ID] = &s.Faces[i]
		}
	}
	return out
}

// TestBuildingRoofs checks every shape's faces against the geometry of its roof, worked by hand
// from the footprints in testdata/gen.py: the plan areas of the faces, their aspects and
// pitches, and that the faces meet without a step (one roof, not a heap of planes).
func TestBuildingRoofs(t *testing.T) {
	s := decodeBuildings(t)
	const (
		tolM2  = 0.01 // m²: the fixture's longitude/latitude are rounded to about 0.01 mm
		tolDeg = 0.01
	)
	tan := func(deg float64) float64 { return math.Tan(deg * math.Pi / 180) }
	tests := []struct {
		building string
		pitch    float64
		// face id → aspect and plan area
		aspects map[string]float64
		areas   map[string]float64
		// the roof's top above ground: eave + half the span × tan(pitch)
		ridgeM float64
	}{
		// 10 × 8, ridge east-west: two 10 × 4 halves.
		{"gable", 35, map[string]float64{"gable-S": 180, "gable-N": 0}, map[string]float64{"gable-S": 40, "gable-N": 40}, 3 + 4*tan(35)},
		// 12 × 8 hipped: trapezoids (12 + 4)/2 × 4 = 32 m² on the long sides, triangles 8 × 4 / 2
		// = 16 m² at the ends.
		{"hip", 30, map[string]float64{"hip-S": 180, "hip-N": 0, "hip-E": 90, "hip-W": 270},
			map[string]float64{"hip-S": 32, "hip-N": 32, "hip-E": 16, "hip-W": 16}, 3 + 4*tan(30)},
		// Skillion 6 × 6 falling toward 200°: one face; its top is the corner farthest uphill.
		{"lean", 10, map[string]float64{"lean-S": 200}, map[string]float64{"lean-S": 36},
			2.5 + (6*math.Sin(200*math.Pi/180)*-1+6*math.Cos(200*math.Pi/180)*-1)*tan(10)},
		// Flat 10 × 7: one face, rows along the 10 m walls, looking south (equator side).
		{"box", 0, map[string]float64{"box-S": 180}, map[string]float64{"box-S": 70}, 6},
		// L of two 6 m wings (12 × 6 and 6 × 14): hip at the outer corner, valley at the inner
		// one. South: (12 + 9)/2 × 3 = 31.5; north: (9 + 6)/2 × 3 = 22.5; west: (14 + 11)/2 × 3
		// = 37.5; east: (11 + 8)/2 × 3 = 28.5; together 120 = 12 × 6 + 6 × 8.
		{"ell", 40, map[string]float64{"ell-S": 180, "ell-N": 0, "ell-W": 270, "ell-E": 90},
			map[string]float64{"ell-S": 31.5, "ell-N": 22.5, "ell-W": 37.5, "ell-E": 28.5}, 4 + 3*tan(40)},
		// L of a 14 × 8 main wing and a 4 m wide wing 16 long: the main roof runs through (14 × 4
		// each side less the narrow wing's valley triangle 4 × 2 / 2 = 4 on the north), the narrow
		// wing's faces run from its valleys: west (16 − 8 + 16 − 6)/2 × 2 = 18, east the same.
		{"wide", 35, map[string]float64{"wide-S": 180, "wide-N": 0, "wide-W": 270, "wide-E": 90},
			map[string]float64{"wide-S": 56, "wide-N": 52, "wide-W": 18, "wide-E": 18}, 3 + 4*tan(35)},
	}
	for _, tc := range tests {
		t.Run(tc.building, func(t *testing.T) {
			fs := facesOf(s, tc.building)
			var ids []string
			for id := range fs {
				ids = append(ids, id)
			}
			slices.Sort(ids)
			if len(fs) != len(tc.aspects) {
				t.Fatalf("faces %v, want %d", ids, len(tc.aspects))
			}
			top := math.Inf(-1)
			for id, want := range tc.aspects {
				f := fs[id]
				if f == nil {
					t.Fatalf("no face %q among %v", id, ids)
				}
				if angleDiffDeg(f.AspectDeg, want) > tolDeg || !scalar.EqualWithinAbs(f.PitchDeg, tc.pitch, tolDeg) {
					t.Errorf("%s: aspect %.3f pitch %.3f, want %g and %g", id, f.AspectDeg, f.PitchDeg, want, tc.pitch)
				}
				if a := planar.Area(f.Plan); !scalar.EqualWithinAbs(a, tc.areas[id], tolM2) {
					t.Errorf("%s: plan area %.4f m², want %g", id, a, tc.areas[id])
				}
				for _, p := range f.Plan {
					top = math.Max(top, f.HeightAt(p))
				}
			}
			if !scalar.EqualWithinAbs(top, tc.ridgeM, 1e-3) {
				t.Errorf("top of the roof %.4f m, want %.4f", top, tc.ridgeM)
			}
			checkWatertight(t, fs)
		})
	}
}

// checkWatertight holds every corner of a face that lies on another face's outline to one height
// on both: the faces meet at hips, valleys and ridges without a step.
func checkWatertight(t *testing.T, fs map[string]*Face) {
	t.Helper()
	for ia, a := range fs {
		for ib, b := range fs {
			if ia == ib {
				continue
			}
			for _, p := range a.Plan {
				if ringBoundaryDist(b.Plan, p) < 1e-6 {
					if ha, hb := a.HeightAt(p), b.HeightAt(p); !scalar.EqualWithinAbs(ha, hb, 1e-6) {
						t.Errorf("faces %s and %s meet at %v at %.4f and %.4f m", ia, ib, p, ha, hb)
					}
				}
			}
			if ringsOverlap(a.Plan, b.Plan, overlapTolM) {
				t.Errorf("faces %s and %s overlap", ia, ib)
			}
		}
	}
}

// TestBuildingNearRectangle: a footprint turned 30° with one corner 5 cm off square still makes
// a gable roof whose faces look across the walls (aspects 30° + 180° ± 90°, i.e. 30° off south
// and north) and cover the footprint.
func TestBuildingNearRectangle(t *testing.T) {
	s := decodeBuildings(t)
	fs := facesOf(s, "skew")
	var b *Building
	for i := range s.Buildings {
		if s.Buildings[i].ID == "skew" {
			b = &s.Buildings[i]
		}
	}
	if len(fs) != 2 || b == nil {
		t.Fatalf("faces %v", fs)
	}
	total := 0.0
	var aspects []float64
	for _, f := range fs {
		total += planar.Area(f.Plan)
		aspects = append(aspects, f.AspectDeg)
	}
	slices.Sort(aspects)
	// gen.py turns the footprint by −30° (counter-clockwise), so its 10 m walls run at 60° and
	// 240° and the faces look to 150° and 330°, exactly across them.
	if angleDiffDeg(aspects[0], 150) > 1 || angleDiffDeg(aspects[1], 330) > 1 {
		t.Errorf("aspects %v, want 150 and 330 within 1°", aspects)
	}
	if a := planar.Area(b.Footprint); !scalar.EqualWithinAbs(total, a, 0.01) {
		t.Errorf("faces cover %.3f m², footprint %.3f m²", total, a)
	}
	checkWatertight(t, fs)
}

// TestBuildingFillsAsDrawn: the gabled footprint fills exactly as the same roof drawn as two
// faces (and its walls as a block) does: same modules at the same places.
func TestBuildingFillsAsDrawn(t *testing.T) {
	opt := DecodeOptions{OriginLonDeg: ptr(15.4), OriginLatDeg: ptr(47.1)}
	gen := decodeBuildings(t)
	drawn, err := decodeFile(t, "testdata/gable-drawn.geojson", opt)
	if err != nil {
		t.Fatal(err)
	}
	fopt := FillOptions{SetbackM: 0.4}
	mg, _, err := Fill(&Site{Faces: []Face{*facesOf(gen, "gable")["gable-S"], *facesOf(gen, "gable")["gable-N"]}, Buildings: gen.Buildings[:1]}, fopt)
	if err != nil {
		t.Fatal(err)
	}
	md, _, err := Fill(&Site{Faces: drawn.Faces}, fopt)
	if err != nil {
		t.Fatal(err)
	}
	if len(mg) == 0 || len(mg) != len(md) {
		t.Fatalf("%d modules from the footprint, %d drawn", len(mg), len(md))
	}
	byID := map[string]Module{}
	for _, m := range md {
		byID[m.ID] = m
	}
	for _, m := range mg {
		d, ok := byID[m.ID]
		if !ok {
			t.Fatalf("module %s not among the drawn roof's", m.ID)
		}
		if dist := m.Center().Sub(d.Center()).Norm(); dist > 1e-3 {
			t.Errorf("module %s %.4f m from the drawn roof's", m.ID, dist)
		}
	}
}

// TestBuildingWallsNotOwnObstacle: the building's walls keep modules off other faces but never
// off its own roof.
func TestBuildingWallsNotOwnObstacle(t *testing.T) {
	s := decodeBuildings(t)
	fopt := FillOptions{SetbackM: 0.4}
	mods, notes, err := Fill(s, fopt)
	if err != nil {
		t.Fatal(err)
	}
	per := map[string]int{}
	for _, m := range mods {
		per[m.Face]++
	}
	for _, id := range []string{"gable-S", "hip-S", "lean-S", "box-S", "ell-S", "wide-S"} {
		if per[id] == 0 {
			t.Errorf("face %s got no module (notes %v)", id, notes)
		}
	}
	var walls int
	for _, o := range s.Obstacles() {
		if o.Kind == "building" {
			walls++
			if o.Prism.HeightM != o.Prism.TopAt(o.Prism.Footprint[0]) || o.Prism.BaseM != 0 {
				t.Errorf("walls of %s: %+v", o.ID, o.Prism)
			}
		}
	}
	if walls != len(s.Buildings) {
		t.Errorf("%d wall obstacles for %d buildings", walls, len(s.Buildings))
	}
}

// TestBuildingExportReadsBack: an exported map with buildings decodes to the same faces.
func TestBuildingExportReadsBack(t *testing.T) {
	s := decodeBuildings(t)
	js, err := ExportGeoJSON(s, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(string(js), `"kind":"roof"`) {
		t.Error("building faces exported as roof features: they would clash with the building on reading")
	}
	s2, err := Decode(strings.NewReader(string(js)), DecodeOptions{OriginLonDeg: ptr(15.4), OriginLatDeg: ptr(47.1)})
	if err != nil {
		t.Fatal(err)
	}
	if len(s2.Faces) != len(s.Faces) {
		t.Fatalf("%d faces read back, %d written", len(s2.Faces), len(s.Faces))
	}
	for i := range s.Faces {
		a, b := s.Faces[i], s2.Faces[i]
		if a.ID != b.ID || angleDiffDeg(a.AspectDeg, b.AspectDeg) > 1e-4 ||
			!scalar.EqualWithinAbs(planar.Area(a.Plan), planar.Area(b.Plan), 1e-3) {
			t.Errorf("face %d: %s %.4f° %.3f m² became %s %.4f° %.3f m²", i, a.ID, a.AspectDeg, planar.Area(a.Plan), b.ID, b.AspectDeg, planar.Area(b.Plan))
		}
	}
}

// TestBuildingBad is the catalogue of footprints and shapes that are refused.
func TestBuildingBad(t *testing.T) {
	tests := []struct {
		file string
		want []string
	}{
		{"building-pentagon", []string{`(id "house"): geometry: the footprint has 5 corners`, "draw the roof's faces as roof features"}},
		{"building-hipped-ell", []string{`(id "house"): geometry: a hipped roof is made for a rectangular footprint only`, "draw the roof's faces"}},
		{"building-shape", []string{`(id "house"): roof_shape: "mansard" is not a roof shape`, "gabled, hipped, skillion, flat"}},
		{"building-skillion-no-direction", []string{`(id "shed"): ridge_azimuth_deg: missing; a skillion roof needs the direction its slope faces`}},
		{"building-ridge-askew", []string{`(id "house"): ridge_azimuth_deg: 45° does not run along the footprint's walls`}},
		{"building-face-id", []string{`(id "house"): id: the roof face "house-S" this building makes has the id of feature 1`}},
	}
	for _, tc := range tests {
		t.Run(tc.file, func(t *testing.T) {
			_, err := decodeFile(t, "testdata/bad/"+tc.file+".geojson", DecodeOptions{})
			var ps Problems
			if !errors.As(err, &ps) {
				t.Fatalf("error %v is not Problems", err)
			}
			if len(ps) != 1 {
				t.Errorf("%d problems, want 1: %v", len(ps), err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("message %q lacks %q", err.Error(), w)
				}
			}
		})
	}
}
