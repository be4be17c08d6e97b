package geo

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"
)

func ptr(x float64) *float64 { return &x }

func decodeFile(t testing.TB, name string, opt DecodeOptions) (*Site, error) {
	t.Helper()
	data, err := os.ReadFile(name)
	if err != nil {
		t.Fatal(err)
	}
	opt.File = filepath.Base(name)
	return Decode(bytes.NewReader(data), opt)
}

func TestDecodeSite(t *testing.T) {
	s, err := decodeFile(t, "testdata/site.geojson", DecodeOptions{OriginLonDeg: ptr(15.4), OriginLatDeg: ptr(47.1)})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Faces) != 2 || len(s.Blocks) != 2 || len(s.Trees) != 2 || len(s.Avoids) != 1 || len(s.Panels) != 0 {
		t.Fatalf("got %d faces, %d blocks, %d trees, %d avoids, %d panels", len(s.Faces), len(s.Blocks), len(s.Trees), len(s.Avoids), len(s.Panels))
	}
	// The fixture lays the house out in metres about the origin (testdata/gen.py, WGS 84
	// radii of curvature, a few ppm): face S is x ∈ [−5, 5], y ∈ [−4, 0].
	const tol = 1e-4 // m: the fixture rounds longitude/latitude to 1e-10°, about 0.01 mm
	S := s.Faces[0]
	tests := []struct {
		name      string
		got, want float64
	}{
		{"S eave offset: eave at y = −4, downhill south", S.EaveOffsetM, 4},
		{"S height at the eave", S.HeightAt(S.Plan[0]), 3},
		// Ridge at y = 0, 4 m up the plan: 3 + 4·tan 30° = 5.3094 m.
		{"S height at the ridge", S.HeightAt([2]float64{0, 0}), 3 + 4*math.Tan(math.Pi/6)},
		{"S plan area 10 × 4", Summarize(s, nil)[0].PlanAreaM2, 40},
		{"S sloped area 40/cos 30°", Summarize(s, nil)[0].SlopedAreaM2, 40 / math.Cos(math.Pi/6)},
		{"N eave offset: clockwise ring read, eave at y = 4, downhill north", s.Faces[1].EaveOffsetM, 4},
		{"oak trunk east", s.Trees[0].Trunk[0], 8},
		{"oak trunk north", s.Trees[0].Trunk[1], -12},
		{"neighbour ridge", s.Blocks[1].TopAt([2]float64{20, -15}), 9},
		{"neighbour base", s.Blocks[1].BaseM, -0.5},
	}
	for _, tc := range tests {
		if !scalar.EqualWithinAbs(tc.got, tc.want, tol) {
			t.Errorf("%s: got %.6f, want %.6f", tc.name, tc.got, tc.want)
		}
	}
	for _, f := range s.Faces {
		if f.Plan.Orientation() != 1 { // orb.CCW
			t.Errorf("face %s not counter-clockwise", f.ID)
		}
	}
	oak, spruce := s.Trees[0], s.Trees[1]
	// Northern hemisphere default: leaf-off November to March (common practice).
	if !oak.Deciduous || oak.Transmittance(time.January) != 0.3 || oak.Transmittance(time.July) != 0 || oak.Transmittance(time.November) != 0.3 {
		t.Errorf("oak: %+v", oak)
	}
	if spruce.Deciduous || spruce.Shape != CrownCone || spruce.Transmittance(time.January) != 0 {
		t.Errorf("spruce: %+v", spruce)
	}
}

func TestDecode3D(t *testing.T) {
	// Without elevation_m the 3-D map is refused (see the bad catalogue); with it, the faces'
	// pitch and aspect come from the corners: atan(2/4) = 26.5651°, west and east.
	s, err := decodeFile(t, "testdata/site3d.geojson", DecodeOptions{OriginLonDeg: ptr(15.4), OriginLatDeg: ptr(47.1), ElevationM: ptr(420)})
	if err != nil {
		t.Fatal(err)
	}
	pitch := math.Atan(0.5) * 180 / math.Pi
	tests := []struct {
		name           string
		got, want, tol float64
	}{
		// 1e-4°: the fixture is exact to ~0.01 mm over 4 m; the Earth's curvature drops the
		// ground by d²/2R ≈ 2.5 µm at 5.7 m, also negligible.
		{"W pitch", s.Faces[0].PitchDeg, pitch, 1e-4},
		{"W aspect", s.Faces[0].AspectDeg, 270, 1e-4},
		{"W eave height", s.Faces[0].EaveHeightM, 3, 1e-4},
		{"W ridge height at x = 0", s.Faces[0].HeightAt([2]float64{0, 1}), 5, 1e-4},
		{"E pitch (given 26.6 agrees)", s.Faces[1].PitchDeg, pitch, 1e-4},
		{"E aspect", s.Faces[1].AspectDeg, 90, 1e-4},
		// Sphere of radius 2 touching 9 m: base 9 − 4 = 5 m.
		{"birch crown base", s.Trees[0].CrownBaseM, 5, 1e-12},
	}
	for _, tc := range tests {
		if !scalar.EqualWithinAbs(tc.got, tc.want, tc.tol) {
			t.Errorf("%s: got %.6f, want %.6f", tc.name, tc.got, tc.want)
		}
	}
	if s.Trees[0].Shape != CrownSphere || len(s.Trees[0].LeafOffMonths) != 5 {
		t.Errorf("birch: %+v", s.Trees[0])
	}
	// The hand-drawn panel on face E (1.13 m up the slope, 1.72 m along the eave) becomes
	// module E.1.1 in landscape, and face E gets no automatic fill.
	mods, _, err := Fill(s, FillOptions{SetbackM: 0.3})
	if err != nil {
		t.Fatal(err)
	}
	var onE []Module
	for _, m := range mods {
		if m.Face == "E" {
			onE = append(onE, m)
		}
	}
	if len(onE) != 1 || onE[0].ID != "E.1.1" || onE[0].Source != "p1" || onE[0].Portrait {
		t.Fatalf("modules on E: %+v", onE)
	}
	// 1e-3 m: the panel's corners were rounded to 0.1 mm in the fixture.
	if !scalar.EqualWithinAbs(onE[0].WidthM, 1.13, 1e-3) || !scalar.EqualWithinAbs(onE[0].LengthM, 1.72, 1e-3) {
		t.Errorf("panel module size %.4f × %.4f, want 1.13 × 1.72", onE[0].WidthM, onE[0].LengthM)
	}
	if n := onE[0].Normal(); !scalar.EqualWithinAbs(n.Dot(s.Faces[1].Normal()), 1, 1e-12) {
		t.Errorf("panel normal %v", n)
	}
}

func TestDefaultLeafOff(t *testing.T) {
	// Hemisphere defaults (common practice): bare in the local winter.
	tests := []struct {
		name string
		lat  float64
		in   time.Month
		out  time.Month
	}{{"north", 47, time.January, time.July}, {"south", -33, time.July, time.January}, {"equator counts as north", 0, time.December, time.June}}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			tr := Tree{Deciduous: true, LeafOffTransmittance: 0.5, LeafOffMonths: DefaultLeafOffMonths(tc.lat)}
			if tr.Transmittance(tc.in) != 0.5 || tr.Transmittance(tc.out) != 0 {
				t.Errorf("%v", tr.LeafOffMonths)
			}
		})
	}
}

// TestDecodeBad is the catalogue of broken drawings: each must be refused with one message that
// names the file, the feature, its id, the field and the rule.
func TestDecodeBad(t *testing.T) {
	tests := []struct {
		file string
		opt  DecodeOptions
		want []string
	}{
		{"missing-pitch", DecodeOptions{}, []string{`missing-pitch.geojson:2:`, `feature 0 (id "S"): pitch_deg: missing; a roof face needs pitch_deg between 0 and 70°`}},
		{"pitch-string", DecodeOptions{}, []string{`feature 0 (id "S"): pitch_deg: must be a number, got the string "30"`}},
		{"pitch-steep", DecodeOptions{}, []string{`pitch_deg: 75 is out of range`}},
		{"aspect-360", DecodeOptions{}, []string{`(id "S"): aspect_deg: 360 is out of range`, "below 360"}},
		{"missing-kind", DecodeOptions{}, []string{`feature 0 (id "S"): kind: missing`}},
		{"unknown-kind", DecodeOptions{}, []string{`feature 1 (id "c"): kind: "chimney" is not a known kind`}},
		{"open-ring", DecodeOptions{}, []string{`(id "S"): geometry: the ring is not closed`}},
		{"short-ring", DecodeOptions{}, []string{`geometry: a ring needs at least four positions`, "it has 3"}},
		{"self-crossing", DecodeOptions{}, []string{`(id "S"): geometry: the outline crosses itself`}},
		{"hole", DecodeOptions{}, []string{`geometry: holes are not supported`, "avoid area"}},
		{"duplicate-id", DecodeOptions{}, []string{`feature 1 (id "S"): id: "S" is already used by feature 0`}},
		{"swapped", DecodeOptions{}, []string{`feature 1 (id "N"): geometry:`, "longitude and latitude look swapped"}},
		{"swapped", DecodeOptions{OriginLonDeg: ptr(15.4), OriginLatDeg: ptr(47.1)}, []string{`feature 1 (id "N")`, "from the site's latitude 47.1", "look swapped"}},
		{"far", DecodeOptions{}, []string{`feature 2 (id "mast"): geometry: lies 2.0 km`, "500 m"}},
		{"overlap", DecodeOptions{}, []string{`feature 1 (id "S2"): geometry: overlaps roof face "S" (feature 0)`}},
		{"tree-crown-base", DecodeOptions{}, []string{`(id "elm"): crown_base_m: 12 is out of range`}},
		{"tree-too-tall", DecodeOptions{}, []string{`(id "elm"): height_m:`, "at most 150 m"}},
		{"tree-polygon", DecodeOptions{}, []string{`(id "elm"): geometry: a tree needs a Point, got Polygon`}},
		{"leaf-month", DecodeOptions{}, []string{`(id "elm"): leaf_off_months: 13 is not a new month number`}},
		{"block-inverted", DecodeOptions{}, []string{`(id "shed"): height_m: 2 is not above base_m 3`}},
		{"ridge-no-azimuth", DecodeOptions{}, []string{`(id "barn"): ridge_azimuth_deg: missing`}},
		{"panel-off-roof", DecodeOptions{}, []string{`(id "p"): geometry: a panel must lie on a roof face`}},
		{"latitude-range", DecodeOptions{}, []string{`geometry: latitude 200 is outside [-90, 90]`, "look swapped"}},
		{"dotted-id", DecodeOptions{}, []string{`id: "S.1": a roof face id may not contain a dot`}},
		{"three-d-no-elevation", DecodeOptions{}, []string{`(id "W"): geometry: 3-D coordinates need the site's elevation_m`}},
		{"three-d-not-flat", DecodeOptions{ElevationM: ptr(420)}, []string{`(id "W"): geometry: this corner lies`, "off the plane", "tolerance 0.10 m"}},
		{"three-d-pitch-disagrees", DecodeOptions{ElevationM: ptr(420)}, []string{`(id "W"): pitch_deg: 35 disagrees with the 3-D corners, which give 26.6°`}},
		{"three-d-above-ground", DecodeOptions{ElevationM: ptr(420)}, []string{`(id "W"): geometry:`, "above ground; it must be metres above the WGS 84 ellipsoid"}},
		{"multipolygon", DecodeOptions{}, []string{`geometry: a roof needs a Polygon, got MultiPolygon`}},
		{"truncated", DecodeOptions{}, []string{`truncated.geojson:2:`, "ends too early"}},
		{"duplicate-member", DecodeOptions{}, []string{`duplicate-member.geojson:2:`, `member "pitch_deg" appears twice`}},
		{"not-collection", DecodeOptions{}, []string{`type: the map must be a FeatureCollection, got "Feature"`}},
		{"crs", DecodeOptions{}, []string{`crs: RFC 7946 maps are in WGS 84`}},
	}
	for _, tc := range tests {
		t.Run(tc.file, func(t *testing.T) {
			s, err := decodeFile(t, "testdata/bad/"+tc.file+".geojson", tc.opt)
			if err == nil {
				t.Fatalf("accepted: %+v", s)
			}
			var ps Problems
			if !errors.As(err, &ps) || !ps.BadInput() || !errors.Is(err, ErrBadMap) {
				t.Fatalf("error %T is not a bad-input Problems: %v", err, err)
			}
			if len(ps) != 1 {
				t.Errorf("want one problem, got %d:\n%v", len(ps), err)
			}
			msg := err.Error()
			if !strings.HasPrefix(msg, tc.file+".geojson:") {
				t.Errorf("message does not start with the file name: %s", msg)
			}
			for _, w := range tc.want {
				if !strings.Contains(msg, w) {
					t.Errorf("message lacks %q:\n%s", w, msg)
				}
			}
			if ps[0].Line == 0 {
				t.Errorf("no line number: %+v", ps[0])
			}
			if ps[0].Index >= 0 && !strings.HasPrefix(ps[0].Pointer, "/features/") {
				t.Errorf("pointer %q does not locate the feature", ps[0].Pointer)
			}
		})
	}
}

func TestProblemLocation(t *testing.T) {
	// The pointer and line:col lead to the offending value itself.
	in := "{\"type\": \"FeatureCollection\", \"features\": [\n" +
		`{"type": "Feature", "properties": {"kind": "roof", "id": "S", "pitch_deg": 30, "aspect_deg": 180, "eave_height_m": 3},` + "\n" +
		` "geometry": {"type": "Polygon", "coordinates": [[[15.4, 47.1], [15.4001, 47.1], [15.4001, 47.1001], [15.4, 47.1001], [15.4, 47.1002]]]}}]}`
	_, err := Decode(strings.NewReader(in), DecodeOptions{File: "m.geojson"})
	var ps Problems
	if !errors.As(err, &ps) || len(ps) != 1 {
		t.Fatalf("%v", err)
	}
	// Line 3; the last position [15.4, 47.1002] starts at column 119 (118 characters precede
	// it on the line, counted with a script).
	want := Problem{File: "m.geojson", Index: 0, ID: "S", Field: "geometry", Line: 3, Col: 119, Pointer: "/features/0/geometry/coordinates/0/4"}
	got := ps[0]
	got.Msg = ""
	if got != want {
		t.Fatalf("got %+v\nwant %+v", got, want)
	}
}

func TestDecodeWarnings(t *testing.T) {
	in := `{"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {"kind": "roof", "id": "S", "pitch": 30, "pitch_deg": 30, "aspect_deg": 180, "eave_height_m": 3}, "geometry": {"type": "Polygon", "coordinates": [[[15.4, 47.1], [15.4001, 47.1], [15.4001, 47.1001], [15.4, 47.1001], [15.4, 47.1]]]}}]}`
	s, err := Decode(strings.NewReader(in), DecodeOptions{File: "m.geojson"})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Warnings) != 1 || !strings.Contains(s.Warnings[0], `m.geojson: feature 0 (id "S"): property "pitch" is not used by a roof`) {
		t.Fatalf("warnings %q", s.Warnings)
	}
}

func TestTreeThroughRoofWarning(t *testing.T) {
	// A roof face 3 m at the eave, 30° (its height at the centre of the ~11 m deep plan is
	// about 3 + 5.6·tan 30° ≈ 6.2 m); a tree on it with its crown from 2 m (through the roof)
	// gets a warning, one with its crown from 9 m (above the roof) does not.
	for _, c := range []struct {
		name      string
		crownBase float64
		warn      bool
	}{{"crown through the roof", 2, true}, {"crown above the roof", 9, false}} {
		t.Run(c.name, func(t *testing.T) {
			in := fmt.Sprintf(`{"type": "FeatureCollection", "features": [
{"type": "Feature", "properties": {"kind": "roof", "id": "S", "pitch_deg": 30, "aspect_deg": 180, "eave_height_m": 3}, "geometry": {"type": "Polygon", "coordinates": [[[15.4, 47.1], [15.4001, 47.1], [15.4001, 47.1001], [15.4, 47.1001], [15.4, 47.1]]]}},
{"type": "Feature", "properties": {"kind": "tree", "id": "t", "height_m": 14, "crown_radius_m": 2, "crown_base_m": %g}, "geometry": {"type": "Point", "coordinates": [15.40005, 47.10005]}}]}`, c.crownBase)
			s, err := Decode(strings.NewReader(in), DecodeOptions{File: "m.geojson"})
			if err != nil {
				t.Fatal(err)
			}
			got := strings.Join(s.Warnings, "\n")
			if strings.Contains(got, "passes through the roof") != c.warn {
				t.Errorf("warnings %q, want the through-the-roof warning: %v", got, c.warn)
			}
		})
	}
}

func TestDecodeEmpty(t *testing.T) {
	s, err := Decode(strings.NewReader(`{"type":"FeatureCollection","features":[]}`), DecodeOptions{})
	if err != nil || len(s.Faces) != 0 {
		t.Fatalf("%v %+v", err, s)
	}
	mods, notes, err := Fill(s, FillOptions{})
	if err != nil || len(mods) != 0 || len(notes) != 0 {
		t.Fatalf("%v %v %v", mods, notes, err)
	}
}
