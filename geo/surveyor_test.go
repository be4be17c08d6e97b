package geo

import (
	"bytes"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb/planar"
	"gonum.org/v1/gonum/floats/scalar"
)

// houseMap is an invented gable house at 47.05° N, 15.43° E: faces "S" and "N", 10 × 4 m in
// plan, pitch 35°, eaves at 6 m; extraS and extraBlock are added to the south face's and the
// chimney's properties (the chimney stands 2.5–3.1 m up the south slope).
func houseMap(extraS, extraBlock string) string {
	const lat0, lon0 = 47.05, 15.43
	mLat := 1 / 111195.0
	mLon := mLat / math.Cos(lat0*math.Pi/180)
	ring := func(pts ...[2]float64) string {
		var parts []string
		for _, p := range append(pts, pts[0]) {
			parts = append(parts, fmt.Sprintf("[%.8f,%.8f]", lon0+p[0]*mLon, lat0+p[1]*mLat))
		}
		return "[[" + strings.Join(parts, ",") + "]]"
	}
	feat := func(geom, props string) string {
		return `{"type":"Feature","geometry":{"type":"Polygon","coordinates":` + geom + `},"properties":{` + props + `}}`
	}
	return `{"type":"FeatureCollection","features":[` +
		feat(ring([2]float64{0, 0}, [2]float64{10, 0}, [2]float64{10, 4}, [2]float64{0, 4}),
			`"kind":"roof","id":"S","pitch_deg":35,"aspect_deg":180,"eave_height_m":6`+extraS) + "," +
		feat(ring([2]float64{0, 4}, [2]float64{10, 4}, [2]float64{10, 8}, [2]float64{0, 8}),
			`"kind":"roof","id":"N","pitch_deg":35,"aspect_deg":0,"eave_height_m":6`) + "," +
		feat(ring([2]float64{6, 2.5}, [2]float64{6.6, 2.5}, [2]float64{6.6, 3.1}, [2]float64{6, 3.1}),
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
	const lat0, lon0 = 47.05, 15.43
	mLat := 1 / 111195.0
	mLon := mLat / math.Cos(lat0*math.Pi/180)
	ring := func(pts ...[2]float64) string {
		var parts []string
		for _, p := range append(pts, pts[0]) {
			parts = append(parts, fmt.Sprintf("[%.8f,%.8f]", lon0+p[0]*mLon, lat0+p[1]*mLat))
		}
		return "[[" + strings.Join(parts, ",") + "]]"
	}
	feat := func(geom, props string) string {
		return `{"type":"Feature","geometry":{"type":"Polygon","coordinates":` + geom + `},"properties":{` + props + `}}`
	}
	y0 := 4 - depth
	x1 := 1 + 1.134 + gap
	return `{"type":"FeatureCollection","features":[` +
		feat(ring([2]float64{0, 0}, [2]float64{10, 0}, [2]float64{10, 4}, [2]float64{0, 4}),
			`"kind":"roof","id":"S","pitch_deg":35,"aspect_deg":180,"eave_height_m":6`) + "," +
		feat(ring([2]float64{0, y0}, [2]float64{10, y0}, [2]float64{10, 8}, [2]float64{0, 8}),
			`"kind":"roof","id":"N","pitch_deg":35,"aspect_deg":0,"eave_height_m":6`) + "," +
		feat(ring([2]float64{1, 5}, [2]float64{1 + 1.134, 5}, [2]float64{1 + 1.134, 6.4}, [2]float64{1, 6.4}),
			`"kind":"panel","id":"P1"`) + "," +
		feat(ring([2]float64{x1, 5}, [2]float64{x1 + 1.134, 5}, [2]float64{x1 + 1.134, 6.4}, [2]float64{x1, 6.4}),
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
		{"3 cm overlap", 0.03, 0.02, []string{`feature 1 (id "N")`, `roof face "S"`, "about 3 cm wide", "0.30 m²", "accepted as drawn"}, nil},
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
