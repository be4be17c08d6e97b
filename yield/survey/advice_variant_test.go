package survey_test

import (
	"os"
	"strings"
	"testing"
)

// A shaded row on its own string is one of the structures the survey tries: on the example
// with a third inverter input, the eave row of the garage roof G (its most shaded modules,
// four of them, within the 4..14 modules a string may have) goes on the free input, and the
// layout is listed under the name that says so.
func TestVariantShadedRowOwnString(t *testing.T) {
	mapData, err := os.ReadFile("../../examples/sample-house/roof.geojson")
	if err != nil {
		t.Fatal(err)
	}
	cfg := exampleConfig()
	cfg.Inverter.Inputs = 3
	cfg.Layouts.Search, cfg.Layouts.Keep = true, 40
	res := runSurvey(t, cfg, map[string]string{cfg.Path(cfg.Map): string(mapData)})
	var names []string
	for _, l := range res.Layouts {
		names = append(names, l.Name)
		if strings.Contains(l.Name, "eave row of G on its own string") {
			for _, s := range l.Strings {
				if len(s) == 4 && strings.HasPrefix(s[0], "G.1.") {
					return
				}
			}
			t.Fatalf("%q: no string of G's four eave modules: %v", l.Name, l.Strings)
		}
	}
	t.Errorf("no layout with G's eave row on its own string among %q", names)
}
