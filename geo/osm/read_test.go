package osm

import (
	"bytes"
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/geo"
)

func readFile(t *testing.T, name string) (*geo.Surroundings, error) {
	t.Helper()
	data, err := os.ReadFile(name)
	if err != nil {
		t.Fatal(err)
	}
	return Read(bytes.NewReader(data), geo.NewENU(15.4, 47.1, 0), Options{File: filepath.Base(name)})
}

func blockByID(s *geo.Surroundings, id string) *geo.Block {
	for i := range s.Blocks {
		if s.Blocks[i].ID == id {
			return &s.Blocks[i]
		}
	}
	return nil
}

// TestReadStreet reads the invented street (testdata/gen.py lays it out in metres) and checks
// each element's block or tree against its tags and the documented defaults.
func TestReadStreet(t *testing.T) {
	s, err := readFile(t, "testdata/street.osm")
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Blocks) != 5 || len(s.Trees) != 2 {
		t.Fatalf("%d blocks, %d trees; want 5 buildings (the road is no building) and 2 trees", len(s.Blocks), len(s.Trees))
	}
	const tol = 1e-3 // m: the extract's coordinates are rounded to 1e-10°, about 0.01 mm
	n := blockByID(s, "way/200")
	garage := blockByID(s, "way/400")
	hip := blockByID(s, "way/600")
	oak := s.Trees[0]
	tests := []struct {
		name      string
		got, want float64
	}{
		// height 9 with roof:height 3: eaves at 6, ridge at 9; roof:direction N → the ridge runs
		// east-west (90°).
		{"neighbour eaves", n.HeightM, 6},
		{"neighbour ridge", n.RidgeM, 9},
		{"neighbour ridge direction", n.RidgeAzimuthDeg, 90},
		{"neighbour top at the ridge", n.TopAt(orb.Point{20, -15}), 9},
		// No tags: DefaultLevels × DefaultStoreyM, flat.
		{"garage top", garage.HeightM, DefaultLevels * DefaultStoreyM},
		// building:levels 2 × 3 m under a roof 2.5 m high, hipped, its ridge along the 10 m walls.
		{"hipped eaves", hip.HeightM, 6},
		{"hipped ridge", hip.RidgeM, 8.5},
		{"hipped ridge direction", hip.RidgeAzimuthDeg, 90},
		// height 12, diameter_crown 6: radius 3, crown from 6 to 12 m.
		{"oak east", oak.Trunk[0], 8},
		{"oak north", oak.Trunk[1], -12},
		{"oak radius", oak.CrownRadiusM, 3},
		{"oak crown base", oak.CrownBaseM, 6},
		{"oak top", oak.HeightM, 12},
		// No tags: DefaultTreeHeightM, crown DefaultCrownFraction of it.
		{"untagged tree height", s.Trees[1].HeightM, DefaultTreeHeightM},
		{"untagged tree radius", s.Trees[1].CrownRadiusM, DefaultCrownFraction * DefaultTreeHeightM / 2},
	}
	for _, tc := range tests {
		if !scalar.EqualWithinAbs(tc.got, tc.want, tol) {
			t.Errorf("%s: got %.4f, want %.4f", tc.name, tc.got, tc.want)
		}
	}
	if !hip.Hipped || n.Hipped {
		t.Errorf("hipped: way/600 %v, way/200 %v", hip.Hipped, n.Hipped)
	}
	// Every assumed height is named.
	var notes []string
	for id, as := range s.Assumed {
		for _, a := range as {
			notes = append(notes, id+": "+a)
		}
	}
	w := strings.Join(notes, "\n")
	for _, want := range []string{
		"way/400: no height or building:levels: assumed 2 storeys of 3 m",
		"node/301: a tree without height: assumed 10 m",
		"node/301: a tree without diameter_crown",
	} {
		if !strings.Contains(w, want) {
			t.Errorf("warnings lack %q:\n%s", want, w)
		}
	}
	if !strings.Contains(w, "way/600: no height: 2 storeys of 3 m and the roof, 8.5 m in all") {
		t.Errorf("warnings lack the height from levels of way/600:\n%s", w)
	}
	for _, id := range []string{"way/200", "node/300"} {
		if strings.Contains(w, id+":") {
			t.Errorf("a warning names %s, whose heights are all tagged:\n%s", id, w)
		}
	}
}

// TestAddStreet puts the street around the roof of geo/testdata: the site's own house is left
// out, so is the building 300 m down the road, and the rest carry their source.
func TestAddStreet(t *testing.T) {
	data, err := os.ReadFile("../testdata/site.geojson")
	if err != nil {
		t.Fatal(err)
	}
	lon, lat := 15.4, 47.1
	site, err := geo.Decode(bytes.NewReader(data), geo.DecodeOptions{File: "site.geojson", OriginLonDeg: &lon, OriginLatDeg: &lat})
	if err != nil {
		t.Fatal(err)
	}
	drawn := len(site.Blocks)
	s, err := readFile(t, "testdata/street.osm")
	if err != nil {
		t.Fatal(err)
	}
	if err := site.AddSurroundings(s, "street.osm", 0); err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, b := range site.Blocks[drawn:] {
		got = append(got, b.ID+"@"+b.Source)
	}
	want := "way/200@street.osm way/400@street.osm way/600@street.osm"
	if strings.Join(got, " ") != want {
		t.Errorf("imported blocks %v, want %s (way/100 is the house itself, way/700 is 300 m away)", got, want)
	}
	w := strings.Join(site.Warnings, "\n")
	if !strings.Contains(w, `street.osm: way/100 is the site's own building (it holds roof face "S"); left out`) {
		t.Errorf("no note on the own building:\n%s", w)
	}
	// The assumptions reach the site for what is kept, not for what is left out.
	if !strings.Contains(w, "street.osm: way/400: no height or building:levels") || strings.Contains(w, "way/700:") {
		t.Errorf("assumptions of kept and left-out buildings:\n%s", w)
	}
	// Reading the same extract twice keeps one of each.
	before := len(site.Blocks) + len(site.Trees)
	if err := site.AddSurroundings(s, "copy.osm", 0); err != nil {
		t.Fatal(err)
	}
	if after := len(site.Blocks) + len(site.Trees); after != before {
		t.Errorf("a second copy added %d obstacles", after-before)
	}
}

// TestReadBad is the catalogue of broken extracts: each names the file, the line and the element.
func TestReadBad(t *testing.T) {
	tests := []struct {
		file string
		want []string
	}{
		{"syntax", []string{"syntax.osm:5: not valid XML"}},
		{"node-lat", []string{"node-lat.osm:4: node 2: does not read", "check its attributes"}},
		{"node-no-lat", []string{"node-no-lat.osm:4: node 2: a node needs lat and lon"}},
		{"missing-node", []string{"missing-node.osm:6: way 9: node 4 is not in the file"}},
		{"open-building", []string{"open-building.osm:6: way 9: a building outline must be closed"}},
		{"height-word", []string{"height-word.osm:6: way 9: height: \"tall\" is not a length in metres"}},
		{"roof-direction", []string{"roof-direction.osm:6: way 9: roof:direction: \"up\" is neither degrees"}},
		{"not-osm", []string{"not-osm.osm:1: not an OSM XML extract"}},
		{"pbf", []string{"pbf.osm: this is an OSM PBF file; export the neighbourhood as OSM XML"}},
	}
	for _, tc := range tests {
		t.Run(tc.file, func(t *testing.T) {
			_, err := readFile(t, "testdata/bad/"+tc.file+".osm")
			var ps geo.Problems
			if !errors.As(err, &ps) || !ps.BadInput() {
				t.Fatalf("error %v is not bad input", err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("message %q lacks %q", err.Error(), w)
				}
			}
		})
	}
}

// TestReadGeoJSON: the neighbour and the oak read from GeoJSON with OpenStreetMap tags are the
// same block and tree as from the XML extract; the road is passed over.
func TestReadGeoJSON(t *testing.T) {
	x, err := readFile(t, "testdata/street.osm")
	if err != nil {
		t.Fatal(err)
	}
	data, err := os.ReadFile("testdata/street.geojson")
	if err != nil {
		t.Fatal(err)
	}
	g, err := ReadGeoJSON(bytes.NewReader(data), geo.NewENU(15.4, 47.1, 0), Options{File: "street.geojson"})
	if err != nil {
		t.Fatal(err)
	}
	if len(g.Blocks) != 1 || len(g.Trees) != 1 {
		t.Fatalf("%d blocks, %d trees; want the neighbour and the oak", len(g.Blocks), len(g.Trees))
	}
	a, b := blockByID(x, "way/200"), g.Blocks[0]
	if b.ID != "way/200" || a.HeightM != b.HeightM || a.RidgeM != b.RidgeM || a.RidgeAzimuthDeg != b.RidgeAzimuthDeg {
		t.Errorf("GeoJSON block %+v, XML block %+v", b, a)
	}
	for k := range a.Footprint {
		if d := math.Hypot(a.Footprint[k][0]-b.Footprint[k][0], a.Footprint[k][1]-b.Footprint[k][1]); d > 1e-3 {
			t.Errorf("corner %d %.4f m apart", k, d)
		}
	}
	if ta, tb := x.Trees[0], g.Trees[0]; tb.ID != "node/300" || ta.HeightM != tb.HeightM || ta.CrownRadiusM != tb.CrownRadiusM || ta.CrownBaseM != tb.CrownBaseM {
		t.Errorf("GeoJSON tree %+v, XML tree %+v", tb, ta)
	}
	if HasKinds(data) {
		t.Error("OpenStreetMap-tagged GeoJSON taken for a map of kinds")
	}
	tests := []struct{ file, want string }{
		{"building-point", `building-point.geojson: feature 0 (id "way/5"): geometry: a building needs a Polygon or MultiPolygon, got Point`},
		{"open-ring", `open-ring.geojson: feature 0 (id "feature/0"): geometry: a building's outline must be a closed ring`},
	}
	for _, tc := range tests {
		data, err := os.ReadFile("testdata/bad/" + tc.file + ".geojson")
		if err != nil {
			t.Fatal(err)
		}
		_, err = ReadGeoJSON(bytes.NewReader(data), geo.NewENU(15.4, 47.1, 0), Options{File: tc.file + ".geojson"})
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want %q", tc.file, err, tc.want)
		}
	}
}

// FuzzRead: whatever the bytes, Read returns an error or obstacles with finite sizes.
func FuzzRead(f *testing.F) {
	for _, p := range []string{"testdata/street.osm", "testdata/bad/syntax.osm", "testdata/bad/missing-node.osm"} {
		b, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	proj := geo.NewENU(15.4, 47.1, 0)
	f.Fuzz(func(t *testing.T, b []byte) {
		s, err := Read(bytes.NewReader(b), proj, Options{})
		if err != nil {
			return
		}
		for _, bl := range s.Blocks {
			if math.IsNaN(bl.HeightM) || bl.HeightM < bl.BaseM || len(bl.Footprint) < 4 {
				t.Fatalf("block %+v", bl)
			}
		}
		for _, tr := range s.Trees {
			if !(tr.CrownRadiusM > 0) || !(tr.HeightM > tr.CrownBaseM) {
				t.Fatalf("tree %+v", tr)
			}
		}
	})
}

// FuzzReadGeoJSON: whatever the bytes, ReadGeoJSON returns an error or obstacles with finite
// sizes.
func FuzzReadGeoJSON(f *testing.F) {
	for _, p := range []string{"testdata/street.geojson", "testdata/bad/building-point.geojson", "testdata/bad/open-ring.geojson"} {
		b, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	proj := geo.NewENU(15.4, 47.1, 0)
	f.Fuzz(func(t *testing.T, b []byte) {
		s, err := ReadGeoJSON(bytes.NewReader(b), proj, Options{})
		if err != nil {
			return
		}
		for _, bl := range s.Blocks {
			if math.IsNaN(bl.HeightM) || bl.HeightM < bl.BaseM || len(bl.Footprint) < 4 {
				t.Fatalf("block %+v", bl)
			}
		}
		for _, tr := range s.Trees {
			if !(tr.CrownRadiusM > 0) || !(tr.HeightM > tr.CrownBaseM) {
				t.Fatalf("tree %+v", tr)
			}
		}
	})
}
