package survey_test

import (
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/yield/survey"
)

// surveyMaps runs the example's site on each map (held in memory) and returns the summaries'
// module counts and annual AC energies.
func surveyMaps(t *testing.T, maps map[string]string, extra map[string]string) map[string][2]float64 {
	t.Helper()
	out := map[string][2]float64{}
	for name, m := range maps {
		cfg := survey.Defaults()
		cfg.Name, cfg.Map, cfg.Timezone = name, "roof.geojson", "Europe/Vienna"
		cfg.Climate.MonthlyGHI = []float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29} // invented, kWh/m²
		cfg.Climate.MonthlyT = []float64{-1, 1, 5, 10, 15, 18, 20, 20, 15, 10, 4, 0}             // invented, °C
		cfg.Module = survey.Module{PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1,
			TempCoeffVocPct: -0.27, TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34,
			CellsSeries: 120, HalfCut: true, BypassDiodes: 3, LengthM: 1.72, WidthM: 1.134, MaxSystemVoltage: 1000}
		cfg.Inverter = survey.Inverter{Count: 1, ACPowerW: 8000, MaxDCVoltageV: 600, MPPTMinV: 90, MPPTMaxV: 560,
			Inputs: 2, MaxInputCurrentA: 16, EfficiencyPct: 97.0}
		cfg.Layouts.Search = false
		if errs := cfg.Validate(); len(errs) > 0 {
			t.Fatal(errs)
		}
		files := map[string]string{"roof.geojson": m}
		for k, v := range extra {
			files[k] = v
		}
		res := runSurvey(t, cfg, files)
		out[name] = [2]float64{float64(res.Summary.Modules), res.Summary.AnnualACkWh}
	}
	return out
}

// A gabled house about 11.4 × 11.1 m with its ridge east-west, drawn once as a footprint and once
// as two faces with the walls as a block.
const (
	gableFootprint = `{"type":"FeatureCollection","features":[{"type":"Feature",
"geometry":{"type":"Polygon","coordinates":[[[15.43,47.05],[15.43015,47.05],[15.43015,47.0501],[15.43,47.0501],[15.43,47.05]]]},
"properties":{"kind":"building","id":"H","roof_shape":"gabled","pitch_deg":35,"eave_height_m":5,"ridge_azimuth_deg":90}}]}`
	gableDrawn = `{"type":"FeatureCollection","features":[{"type":"Feature",
"geometry":{"type":"Polygon","coordinates":[[[15.43,47.05],[15.43015,47.05],[15.43015,47.05005],[15.43,47.05005],[15.43,47.05]]]},
"properties":{"kind":"roof","id":"H-S","pitch_deg":35,"aspect_deg":180,"eave_height_m":5}},
{"type":"Feature",
"geometry":{"type":"Polygon","coordinates":[[[15.43,47.05005],[15.43015,47.05005],[15.43015,47.0501],[15.43,47.0501],[15.43,47.05005]]]},
"properties":{"kind":"roof","id":"H-N","pitch_deg":35,"aspect_deg":0,"eave_height_m":5}},
{"type":"Feature",
"geometry":{"type":"Polygon","coordinates":[[[15.43,47.05],[15.43015,47.05],[15.43015,47.0501],[15.43,47.0501],[15.43,47.05]]]},
"properties":{"kind":"block","id":"H","height_m":5}}]}`
)

// TestBuildingSurveyAsDrawn: the survey of a gabled footprint matches the survey of the same
// roof drawn as two faces to within 0.5 % of the annual energy (the two differ only in the
// projection's rounding of the ridge line, micrometres), with the same number of modules.
func TestBuildingSurveyAsDrawn(t *testing.T) {
	got := surveyMaps(t, map[string]string{"footprint": gableFootprint, "drawn": gableDrawn}, nil)
	f, d := got["footprint"], got["drawn"]
	t.Logf("footprint: %g modules, %.2f kWh; drawn: %g modules, %.2f kWh", f[0], f[1], d[0], d[1])
	if f[0] != d[0] || f[0] == 0 {
		t.Errorf("%g modules from the footprint, %g drawn", f[0], d[0])
	}
	if !scalar.EqualWithinRel(f[1], d[1], 0.005) {
		t.Errorf("annual AC %.1f kWh from the footprint, %.1f kWh drawn: more than 0.5 %% apart", f[1], d[1])
	}
}
