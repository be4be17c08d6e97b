package geo

import (
	"slices"
	"testing"
)

// TestKindTable holds every kind to the contract the decoder and the exporter rely on.
func TestKindTable(t *testing.T) {
	seen := map[string]bool{}
	for _, k := range kinds {
		if seen[k.name] {
			t.Errorf("kind %q listed twice", k.name)
		}
		seen[k.name] = true
		if k.geometry != "Polygon" && k.geometry != "Point" {
			t.Errorf("kind %q: geometry %q is neither Polygon nor Point", k.name, k.geometry)
		}
		if !slices.Contains(k.props, "id") {
			t.Errorf("kind %q does not list id among its properties", k.name)
		}
		if k.build == nil || k.export == nil {
			t.Errorf("kind %q lacks build or export", k.name)
		}
	}
	if got, want := kindList(), "roof, building, block, tree, avoid or panel"; got != want {
		t.Errorf("kindList() = %q, want %q (the messages' wording)", got, want)
	}
}

// TestObstacles checks that the fixture's blocks and trees come out as obstacles in kind order,
// each with exactly one shape.
func TestObstacles(t *testing.T) {
	s, err := decodeFile(t, "testdata/site.geojson", DecodeOptions{OriginLonDeg: ptr(15.4), OriginLatDeg: ptr(47.1)})
	if err != nil {
		t.Fatal(err)
	}
	obs := s.Obstacles()
	var want []string
	for _, b := range s.Blocks {
		want = append(want, "block "+b.ID)
	}
	for _, tr := range s.Trees {
		want = append(want, "tree "+tr.ID)
	}
	var got []string
	for _, o := range obs {
		got = append(got, o.Kind+" "+o.ID)
		if (o.Prism == nil) == (o.Crown == nil) {
			t.Errorf("%s %q: want exactly one of Prism and Crown", o.Kind, o.ID)
		}
	}
	if !slices.Equal(got, want) {
		t.Errorf("obstacles %v, want %v", got, want)
	}
	if (*Site)(nil).Obstacles() != nil {
		t.Error("a nil site has obstacles")
	}
}
