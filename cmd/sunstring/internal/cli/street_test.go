package cli

import (
	"strings"
	"testing"
)

// TestSmallStreetExample checks the second example: the house drawn as a footprint gives its two
// faces, the extract's copy of the house is recognised and left out, and every height the extract
// lacks is named for the surveyor to measure.
func TestSmallStreetExample(t *testing.T) {
	out, errs, code := run(t, "check", "../../../../examples/small-street/site.yaml")
	if code != 0 {
		t.Fatalf("exit %d:\n%s\n%s", code, out, errs)
	}
	for _, want := range []string{
		"house-S", "house-N", "garage",
		`street.osm: way/11 is the site's own building (it holds roof face "house-S"); left out`,
		"street.osm: way/15: no height or building:levels: assumed 2 storeys of 3 m",
		"street.osm: node/32: a tree without height: assumed 10 m",
	} {
		if !strings.Contains(out, want) {
			t.Errorf("check output lacks %q:\n%s", want, out)
		}
	}
	// way/16, the hall 200 m down the road without a height, is beyond surroundings_radius_m: no
	// assumption is listed for it.
	if strings.Contains(out, "way/16") {
		t.Errorf("the hall beyond the radius is named:\n%s", out)
	}
}
