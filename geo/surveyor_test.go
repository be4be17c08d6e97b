package geo

import (
	"bytes"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
	"gonum.org/v1/gonum/floats/scalar"
)

// testRing writes points (east and north, metres, from 47.05° N, 15.43° E) as a closed GeoJSON
// polygon ring.
func testRing(pts ...[2]float64) string {
	const lat0, lon0 = 47.05, 15.43
	mLat := 1 / 111195.0
	mLon := mLat / math.Cos(lat0*math.Pi/180)
	var parts []string
	for _, p := range append(pts, pts[0]) {
		parts = append(parts, fmt.Sprintf("[%.9f,%.9f]", lon0+p[0]*mLon, lat0+p[1]*mLat))
	}
	return "[[" + strings.Join(parts, ",") + "]]"
}

// testFeature is a GeoJSON polygon feature of the ring geom with the properties props (JSON
// members without braces).
func testFeature(geom, props string) string {
	return `{"type":"Feature","geometry":{"type":"Polygon","coordinates":` + geom + `},"properties":{` + props + `}}`
}

// houseMap is an invented gable house at 47.05° N, 15.43° E: faces "S" and "N", 10 × 4 m in
// plan, pitch 35°, eaves at 6 m; extraS and extraBlock are added to the south face's and the
// chimney's properties (the chimney stands 2.5–3.1 m up the south slope).
func houseMap(extraS, extraBlock string) string {
	return `{"type":"FeatureCollection","features":[` +
		testFeature(testRing([2]float64{0, 0}, [2]float64{10, 0}, [2]float64{10, 4}, [2]float64{0, 4}),
			`"kind":"roof","id":"S","pitch_deg":35,"aspect_deg":180,"eave_height_m":6`+extraS) + "," +
		testFeature(testRing([2]float64{0, 4}, [2]float64{10, 4}, [2]float64{10, 8}, [2]float64{0, 8}),
			`"kind":"roof","id":"N","pitch_deg":35,"aspect_deg":0,"eave_height_m":6`) + "," +
		testFeature(testRing([2]float64{6, 2.5}, [2]float64{6.6, 2.5}, [2]float64{6.6, 3.1}, [2]float64{6, 3.1}),
			`"kind":"block","id":"C1"`+extraBlock) + `]}`
}

func TestKeepEmpty(t *testing.T) {
	fill := FillOptions{LengthM: 1.72, WidthM: 1.134, SetbackM: 0.3, GapM: 0.02}
	count := func(s *Site) map[string]int {
		mods, notes, err := Fill(s, fill)
		if err != nil {
			t.Fatal(err)
		}
		for _, n := range notes {
			if strings.Contains(n, `"S"`) {
				t.Errorf("a note about the empty face: %q", n)
			}
		}
		n := map[string]int{}
		for _, m := range mods {
			n[m.Face]++
		}
		return n
	}
	s, err := Decode(strings.NewReader(houseMap(`,"keep_empty":true`, `,"height_m":8.5`)), DecodeOptions{File: "m.geojson"})
	if err != nil {
		t.Fatal(err)
	}
	if !s.Faces[0].KeepEmpty || s.Faces[1].KeepEmpty {
		t.Fatalf("keep_empty read as %v, %v", s.Faces[0].KeepEmpty, s.Faces[1].KeepEmpty)
	}
	if n := count(s); n["S"] != 0 || n["N"] == 0 {
		t.Errorf("modules per face %v: want none on S, some on N", n)
	}
	// The empty face is still drawn and exported with its flag.
	out, err := ExportGeoJSON(s, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(bytes.ReplaceAll(out, []byte(" "), nil), []byte(`"keep_empty":true`)) {
		t.Error("export lost keep_empty")
	}
	_, err = Decode(strings.NewReader(houseMap(`,"keep_empty":"yes"`, `,"height_m":8.5`)), DecodeOptions{File: "m.geojson"})
	if err == nil || !strings.Contains(err.Error(), `keep_empty: must be true or false, got "yes"`) {
		t.Errorf("keep_empty as text: %v", err)
	}
}

func TestHeightAboveRoof(t *testing.T) {
	// The roof under the chimney rises from 6 + 2.5·tan 35° = 7.7505 m to
	// 6 + 3.1·tan 35° = 8.1707 m (analytic); 1.2 m above its highest point is 9.3707 m.
	s, err := Decode(strings.NewReader(houseMap("", `,"height_above_roof_m":1.2`)), DecodeOptions{File: "m.geojson"})
	if err != nil {
		t.Fatal(err)
	}
	want := 6 + 3.1*math.Tan(35*math.Pi/180) + 1.2
	if b := s.Blocks[0]; !scalar.EqualWithinAbs(b.HeightM, want, 2e-3) || b.AboveRoofM != 1.2 {
		t.Errorf("chimney top %.4f m (above roof %g), want %.4f ± 2 mm (the map's coordinates round to 1 mm)", b.HeightM, b.AboveRoofM, want)
	}
	if sunk := s.SunkBlocks(); len(sunk) != 0 {
		t.Errorf("a chimney given above the roof flagged as sunk: %v", sunk)
	}
	for _, tc := range []struct{ name, props, want string }{
		{"both heights", `,"height_m":9,"height_above_roof_m":1.2`, "not both"},
		{"with a ridge", `,"height_above_roof_m":1.2,"ridge_m":10,"ridge_azimuth_deg":90`, "flat-topped"},
		{"out of range", `,"height_above_roof_m":-1`, "height_above_roof_m: -1 is out of range"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Decode(strings.NewReader(houseMap("", tc.props)), DecodeOptions{File: "m.geojson"})
			if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), `feature 2 (id "C1")`) {
				t.Errorf("error %v, want one on feature 2 holding %q", err, tc.want)
			}
		})
	}
}

// overlapMap is houseMap's two faces with the north face's eave drawn depth metres into the
// south face, and two hand-drawn panels on the north face shifted by gap metres apart
// (negative: overlapping).
func overlapMap(depth, gap float64) string {
	y0 := 4 - depth
	x1 := 1 + 1.134 + gap
	return `{"type":"FeatureCollection","features":[` +
		testFeature(testRing([2]float64{0, 0}, [2]float64{10, 0}, [2]float64{10, 4}, [2]float64{0, 4}),
			`"kind":"roof","id":"S","pitch_deg":35,"aspect_deg":180,"eave_height_m":6`) + "," +
		testFeature(testRing([2]float64{0, y0}, [2]float64{10, y0}, [2]float64{10, 8}, [2]float64{0, 8}),
			`"kind":"roof","id":"N","pitch_deg":35,"aspect_deg":0,"eave_height_m":6`) + "," +
		testFeature(testRing([2]float64{1, 5}, [2]float64{1 + 1.134, 5}, [2]float64{1 + 1.134, 6.4}, [2]float64{1, 6.4}),
			`"kind":"panel","id":"P1"`) + "," +
		testFeature(testRing([2]float64{x1, 5}, [2]float64{x1 + 1.134, 5}, [2]float64{x1 + 1.134, 6.4}, [2]float64{x1, 6.4}),
			`"kind":"panel","id":"P2"`) + `]}`
}

func TestFaceOverlaps(t *testing.T) {
	tests := []struct {
		name       string
		depth, gap float64
		note, err  []string
	}{
		{"edges meeting", 0, 0.02, nil, nil},
		// 3 cm × 10 m = 0.30 m² (analytic), within the 5 cm tolerance: accepted with a note.
		{"3 cm overlap", 0.03, 0.02, []string{`feature 1 (id "N")`, `roof face "S"`, "about 3 cm wide", "0.30 m²", `cut off face "N" (feature 1)`, "longitude"}, nil},
		// 30 cm × 10 m = 3.00 m².
		{"30 cm overlap", 0.3, 0.02, nil, []string{`feature 1 (id "N")`, "geometry", `roof face "S"`, "by 3.0", "longitude", "0.30 m wide", "5 cm"}},
		// Panels overlapping by 10 cm × 1.4 m = 0.14 m².
		{"panels overlap", 0, -0.1, nil, []string{`feature 3 (id "P2")`, `panel "P1"`, "0.14 m²", "cannot overlap"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Decode(strings.NewReader(overlapMap(tc.depth, tc.gap)), DecodeOptions{File: "m.geojson"})
			if len(tc.err) > 0 {
				if err == nil {
					t.Fatal("accepted")
				}
				for _, w := range tc.err {
					if !strings.Contains(err.Error(), w) {
						t.Errorf("error %q lacks %q", err, w)
					}
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			notes := strings.Join(s.Notes, "\n")
			for _, w := range tc.note {
				if !strings.Contains(notes, w) {
					t.Errorf("notes %q lack %q", notes, w)
				}
			}
			if len(tc.note) == 0 && len(s.Notes) != 0 {
				t.Errorf("unexpected notes %q", s.Notes)
			}
		})
	}
}

// face is a roof face for the overlap tests, its plan counter-clockwise.
func face(id string, index int, aspect float64, plan orb.Ring) Face {
	f := Face{ID: id, Index: index, Plan: plan, PitchDeg: 35, AspectDeg: aspect, EaveHeightM: 6}
	f.SetEave()
	return f
}

// TestTrimFaceOverlaps: a strip up to OverlapTolM wide is cut off the face that comes later
// in the map, with a note naming both faces, the area and the width; a wider one, or one whose
// cut would split the face, is an error naming both, the area and the place. Areas are hand
// calculations of rectangles (analytic).
func TestTrimFaceOverlaps(t *testing.T) {
	// A dumbbell: two 2 × 2 m squares joined by a bridge 1 m long and 4 cm wide (y 0.98 … 1.02).
	dumbbell := orb.Ring{{0, 0}, {2, 0}, {2, 0.98}, {3, 0.98}, {3, 0}, {5, 0}, {5, 2}, {3, 2}, {3, 1.02}, {2, 1.02}, {2, 2}, {0, 2}, {0, 0}}
	tests := []struct {
		name    string
		faces   []Face
		cut     int     // index in faces of the face cut, −1 none
		area    float64 // its plan area after the cut, m²
		msg     []string
		problem bool
	}{
		// A porch roof (eave 2 m lower) drawn 3 cm up over the house's eave: 10 × 0.03 = 0.30 m²;
		// the porch, later in the map, keeps 10 × 2.03 − 0.30 = 20 m².
		{"sliver along a shared eave", []Face{face("S", 0, 180, rect(0, 0, 10, 4)), face("porch", 1, 180, rect(0, -2, 10, 0.03))},
			1, 20, []string{`roof face "S" (feature 0)`, "about 3 cm wide", "(0.30 m²)", `cut off face "porch" (feature 1)`, `edge of face "S"`, "around 5.0 m east, 0.0 m north"}, false},
		// A 4 × 4 cm square at a corner: 16 cm², width 0.0016 / 0.04 = 4 cm; the east face keeps
		// 4.04² − 0.0016 = 16.32 m².
		{"sliver at a corner", []Face{face("S", 0, 180, rect(0, 0, 10, 4)), face("E", 1, 90, rect(9.96, 3.96, 14, 8))},
			1, 16.32, []string{`roof face "S" (feature 0)`, "about 4 cm wide", "(16 cm²)", `cut off face "E" (feature 1)`}, false},
		// 5 cm × 10 m = 0.50 m², exactly at the tolerance: cut, N keeps 10 × 4 = 40 m².
		{"overlap exactly at the tolerance", []Face{face("S", 0, 180, rect(0, 0, 10, 4)), face("N", 1, 0, rect(0, 3.95, 10, 8))},
			1, 40, []string{"about 5 cm wide", "(0.50 m²)", `cut off face "N" (feature 1)`}, false},
		// 6 cm × 10 m = 0.60 m²: an error, nothing cut.
		{"just over the tolerance", []Face{face("S", 0, 180, rect(0, 0, 10, 4)), face("N", 1, 0, rect(0, 3.94, 10, 8))},
			-1, 0, []string{`roof face "S" (feature 0)`, "by 0.60 m²", "around 5.0 m east, 4.0 m north", "0.06 m wide", "more than the 5 cm"}, true},
		// A concave (L-shaped) face whose inner upright edge is drawn 3 cm into the face in its
		// notch: 6 × 0.03 = 0.18 m²; the L keeps 10 × 4 + 4 × 6 = 64 m² and stays an L.
		{"concave face", []Face{face("notch", 0, 180, rect(4, 4, 10, 10)),
			face("L", 1, 180, orb.Ring{{0, 0}, {10, 0}, {10, 4}, {4.03, 4}, {4.03, 10}, {0, 10}, {0, 0}})},
			1, 64, []string{"about 3 cm wide", "(0.18 m²)", `cut off face "L" (feature 1)`}, false},
		// The later feature is cut whatever the order the faces are read in.
		{"later feature read first", []Face{face("N", 4, 0, rect(0, 3.97, 10, 8)), face("S", 2, 180, rect(0, 0, 10, 4))},
			0, 40, []string{`roof face "N" (feature 4)`, `cut off face "N" (feature 4)`}, false},
		// A face crossing the dumbbell's bridge: 0.2 × 0.04 = 0.008 m² (80 cm²), 4 cm wide, but
		// cutting it would leave two squares.
		{"cut would split the face", []Face{face("R", 0, 90, rect(2.4, -1, 2.6, 3)), face("D", 1, 180, dumbbell)},
			-1, 0, []string{`roof face "R" (feature 0)`, "about 4 cm wide", "(80 cm²)", `face "D" (feature 1) would split it in 2 pieces`}, true},
		{"edge to edge", []Face{face("S", 0, 180, rect(0, 0, 10, 4)), face("N", 1, 0, rect(0, 4, 10, 8))}, -1, 0, nil, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			before := make([]float64, len(tc.faces))
			for k := range tc.faces {
				before[k] = planar.Area(tc.faces[k].Plan)
			}
			d := &decoder{site: &Site{Faces: tc.faces}}
			accepted, msg, shared := d.faceOverlap(0, 1)
			if shared != (tc.msg != nil) || accepted == tc.problem && shared {
				t.Fatalf("shared %v, accepted %v (%q); want shared %v, a problem %v", shared, accepted, msg, tc.msg != nil, tc.problem)
			}
			for _, w := range tc.msg {
				if !strings.Contains(msg, w) {
					t.Errorf("message %q lacks %q", msg, w)
				}
			}
			for k, f := range tc.faces {
				got := planar.Area(f.Plan)
				want := before[k]
				if k == tc.cut {
					want = tc.area
				}
				if !scalar.EqualWithinAbsOrRel(got, want, 1e-6, 1e-9) {
					t.Errorf("face %s: plan area %.6f m², want %.6f m²", f.ID, got, want)
				}
				if k == tc.cut && f.Plan.Orientation() != orb.CCW {
					t.Errorf("face %s: the cut outline is not counter-clockwise", f.ID)
				}
			}
			if tc.cut >= 0 {
				if a, _, _ := overlapOf(tc.faces[0].Plan, tc.faces[1].Plan); a > 1e-9 {
					t.Errorf("after the cut the faces still share %.3g m²", a)
				}
			}
		})
	}
}

// gableMap is a gable roof 10 m long: the south face 4 m deep (y 0 … 4), the north face
// drawn from 4 − depth to 8.25 m north, so depth metres over the south face.
func gableMap(depth float64) string {
	y0 := 4 - depth
	return `{"type":"FeatureCollection","features":[` +
		testFeature(testRing([2]float64{0, 0}, [2]float64{10, 0}, [2]float64{10, 4}, [2]float64{0, 4}),
			`"kind":"roof","id":"S","pitch_deg":35,"aspect_deg":180,"eave_height_m":6`) + "," +
		testFeature(testRing([2]float64{0, y0}, [2]float64{10, y0}, [2]float64{10, 8.25}, [2]float64{0, 8.25}),
			`"kind":"roof","id":"N","pitch_deg":35,"aspect_deg":0,"eave_height_m":6`) + `]}`
}

// TestTrimmedFaceTakesTheModulesOfTheRoofDrawnRight: modules go on what is left of a cut
// face, never over the other face, and as many as on the same roof drawn without the overlap.
// The north face is 4.25 m deep in plan, 4.25 / cos 35° = 5.188 m on the slope: two rows of
// 1.72 m modules (three need 3 × 1.72 + 2 × 0.02 = 5.20 m); drawn 3 cm over the ridge it is
// 5.225 m deep, and a third row would fit, reaching over the south face (hand calculation).
func TestTrimmedFaceTakesTheModulesOfTheRoofDrawnRight(t *testing.T) {
	opt := FillOptions{LengthM: 1.72, WidthM: 1.134, GapM: 0.02} // no setback: the rows reach the edges
	count := func(depth float64) (map[string]int, *Site, []Module) {
		s, err := Decode(strings.NewReader(gableMap(depth)), DecodeOptions{File: "m.geojson"})
		if err != nil {
			t.Fatal(err)
		}
		mods, _, err := Fill(s, opt)
		if err != nil {
			t.Fatal(err)
		}
		n := map[string]int{}
		for _, m := range mods {
			n[m.Face]++
		}
		return n, s, mods
	}
	right, _, _ := count(0)
	// 10 m of eave takes 8 modules of 1.134 m with 2 cm gaps (8 × 1.154 − 0.02 = 9.21 m); the
	// south face's 4.883 m of slope takes 2 rows.
	if right["N"] != 2*8 || right["S"] != 2*8 {
		t.Fatalf("drawn right: %v modules, want 16 on each face (2 rows of 8)", right)
	}
	got, s, mods := count(0.03)
	if got["N"] != right["N"] || got["S"] != right["S"] {
		t.Errorf("drawn 3 cm over: %v modules, want %v as drawn right", got, right)
	}
	if len(s.Notes) != 1 || !strings.Contains(s.Notes[0], `cut off face "N"`) {
		t.Errorf("notes %q, want one saying N was cut", s.Notes)
	}
	south := s.Faces[0].Plan
	for _, m := range mods {
		if m.Face != "N" {
			continue
		}
		for _, c := range m.Corners() {
			if p := (orb.Point{c.E, c.N}); planar.RingContains(south, p) && ringBoundaryDist(south, p) > fitEps {
				t.Errorf("module %s reaches %.3f m over face S", m.ID, ringBoundaryDist(south, p))
			}
		}
	}
}

func TestAntimeridian(t *testing.T) {
	// A 10 × 8 m flat roof at 16.8° S straddling 180°: 5 m each side (invented, near Fiji).
	const lat0 = -16.8
	mLat := 1 / 111195.0
	mLon := mLat / math.Cos(lat0*math.Pi/180)
	lon := func(e float64) float64 {
		l := 180 + e*mLon
		if l > 180 {
			l -= 360
		}
		return l
	}
	var pts []string
	for _, p := range [][2]float64{{-5, 0}, {5, 0}, {5, 8}, {-5, 8}, {-5, 0}} {
		pts = append(pts, fmt.Sprintf("[%.8f,%.8f]", lon(p[0]), lat0+p[1]*mLat))
	}
	m := `{"type":"FeatureCollection","features":[{"type":"Feature","geometry":{"type":"Polygon","coordinates":[[` +
		strings.Join(pts, ",") + `]]},"properties":{"kind":"roof","id":"F","pitch_deg":10,"aspect_deg":0,"eave_height_m":3}}]}`
	s, err := Decode(strings.NewReader(m), DecodeOptions{File: "m.geojson"})
	if err != nil {
		t.Fatal(err)
	}
	// Analytic: 10 m × 8 m = 80 m² (the mean-sphere scale above is good to 0.5 %).
	if a := math.Abs(planar.Area(s.Faces[0].Plan)); !scalar.EqualWithinRel(a, 80, 0.01) {
		t.Errorf("plan area %.2f m², want 80 ± 1 %%", a)
	}
	lonC, latC, _ := s.Proj.Inverse(Vec3{})
	if math.Abs(math.Abs(lonC)-180) > 1e-3 || math.Abs(latC-(lat0+4*mLat)) > 1e-3 {
		t.Errorf("origin %.5f, %.5f: want the drawing's centre at 180°", lonC, latC)
	}
}
