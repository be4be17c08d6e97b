package survey_test

import (
	"strings"
	"testing"

	"sunstring/yield/survey"
)

// TestFixedLayoutSameAsRoofOrder: a user's layout that wires exactly the roof order keeps its
// own name and says which listed layout it repeats, so two names for one wiring never read as
// two choices.
func TestFixedLayoutSameAsRoofOrder(t *testing.T) {
	run := func(cfg *survey.Config) *survey.Result {
		t.Helper()
		cfg.Layouts.Search = false
		cfg.Climate.MonthlyGHI = []float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29} // invented
		cfg.Climate.MonthlyT = []float64{-1, 1, 5, 10, 15, 18, 20, 20, 15, 10, 4, 0}             // invented
		if errs := cfg.Validate(); len(errs) > 0 {
			t.Fatal(errs)
		}
		return runSurvey(t, cfg, map[string]string{cfg.Path(cfg.Map): exampleMap})
	}
	first := run(validConfig(t))
	ro := first.Layouts[0]
	if ro.Name != "roof order" {
		t.Fatalf("first layout %q, want the roof order", ro.Name)
	}
	cfg := validConfig(t)
	fl := survey.FixedLayout{Name: "as quoted", Strings: ro.Strings}
	for _, in := range ro.Inputs {
		fl.Inputs = append(fl.Inputs, float64(in))
	}
	cfg.Layouts.Fixed = []survey.FixedLayout{fl}
	res := run(cfg)
	var got *survey.RankedLayout
	for i := range res.Layouts {
		if res.Layouts[i].Name == "as quoted" {
			got = &res.Layouts[i]
		}
	}
	if got == nil {
		t.Fatalf("the user's layout is not listed: %v", res.Layouts)
	}
	if !strings.Contains(got.Note, `the same strings as "roof order"`) {
		t.Errorf("note %q does not say it repeats the roof order", got.Note)
	}
	// The same wiring gives the same energy: the two are one layout evaluated twice.
	if got.Result.ACkWh != res.Layouts[0].Result.ACkWh && res.Layouts[0].Name == "roof order" {
		t.Errorf("the same strings gave %v and %v kWh", got.Result.ACkWh, res.Layouts[0].Result.ACkWh)
	}
}
