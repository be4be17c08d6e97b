package roofgen

import (
	"bytes"
	"flag"
	"os"
	"path/filepath"
	"testing"

	"sunstring/geo"
)

var update = flag.Bool("update", false, "rewrite the large-roof fixture in testdata/large-roof")

// fixtureDir holds the reference roof as files, for measuring the built command.
const fixtureDir = "../../../testdata/large-roof"

// fill places the modules as the survey does for the site file Site writes.
func fill(t *testing.T, opt Options) []geo.Module {
	t.Helper()
	site, err := geo.Decode(bytes.NewReader(Map(opt)), geo.DecodeOptions{File: "roof.geojson"})
	if err != nil {
		t.Fatal(err)
	}
	mods, _, err := geo.Fill(site, geo.FillOptions{LengthM: moduleL, WidthM: moduleW, Grid: geo.CellGrid{Cols: 6, Rows: 20},
		SetbackM: setbackM, GapM: gapM, ObstacleClearanceM: 0.3})
	if err != nil {
		t.Fatal(err)
	}
	return mods
}

// TestModules checks that the roof holds about the number of modules asked for: within 8 %
// (the rooftop units fall where the seeded generator puts them; the width is set from an
// average share of modules they take).
func TestModules(t *testing.T) {
	for _, n := range []int{120, 250, 430, 700, 1000} {
		got := len(fill(t, Options{Modules: n}))
		if d := float64(got-n) / float64(n); d < -0.08 || d > 0.08 {
			t.Errorf("asked for about %d modules, %d fit (%+.1f %%)", n, got, 100*d)
		}
	}
}

// TestFixture keeps testdata/large-roof equal to what the generator writes (go test
// ./yield/internal/roofgen -update rewrites it).
func TestFixture(t *testing.T) {
	files := map[string][]byte{
		"roof.geojson":        Map(Options{}),
		"site.yaml":           Site(SiteOptions{}),
		"site-12-inputs.yaml": Site(SiteOptions{Inputs: 12}),
		// Two 75 kW inverters of six inputs: the roof needs more inputs than one takes.
		"site-2-inverters.yaml": Site(SiteOptions{Inputs: 6, Inverters: 2}),
	}
	for name, want := range files {
		path := filepath.Join(fixtureDir, name)
		if *update {
			if err := os.MkdirAll(fixtureDir, 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(path, want, 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		got, err := os.ReadFile(path)
		if err != nil {
			t.Fatalf("%v (run go test ./yield/internal/roofgen -update)", err)
		}
		if !bytes.Equal(got, want) {
			t.Errorf("%s differs from the generator's output (run go test ./yield/internal/roofgen -update)", path)
		}
	}
}
