package survey_test

import (
	"context"
	"fmt"
	"math"

	"sunstring/yield/survey"
)

// exampleMap is one south-facing roof face of about 11 × 5.6 m in plan at 47° N, drawn as a
// web map exports it (GeoJSON, longitude first).
const exampleMap = `{"type":"FeatureCollection","features":[{"type":"Feature",
"geometry":{"type":"Polygon","coordinates":[[[15.43,47.05],[15.43015,47.05],[15.43015,47.05005],[15.43,47.05005],[15.43,47.05]]]},
"properties":{"kind":"roof","id":"S","pitch_deg":30,"aspect_deg":180,"eave_height_m":5}}]}`

// Example surveys a roof from a site configuration built in Go, with the map held in memory.
func Example() {
	cfg := survey.Defaults()
	cfg.Name, cfg.Map, cfg.Timezone = "example", "roof.geojson", "Europe/Vienna"
	cfg.Climate.MonthlyGHI = []float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29} // invented, kWh/m²
	cfg.Climate.MonthlyT = []float64{-1, 1, 5, 10, 15, 18, 20, 20, 15, 10, 4, 0}             // invented, °C
	cfg.Module = survey.Module{PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1,
		TempCoeffVocPct: -0.27, TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34,
		CellsSeries: 120, HalfCut: true, BypassDiodes: 3, LengthM: 1.72, WidthM: 1.134, MaxSystemVoltage: 1000}
	cfg.Inverter = survey.Inverter{Count: 1, ACPowerW: 6000, MaxDCVoltageV: 600, MPPTMinV: 90, MPPTMaxV: 560,
		Inputs: 2, MaxInputCurrentA: 16, EfficiencyPct: 97.0}
	cfg.Layouts.Search = false // the roof order only, to keep the example quick
	if errs := cfg.Validate(); len(errs) > 0 {
		fmt.Println(errs)
		return
	}
	read := func(path, what string) ([]byte, error) {
		if path == "roof.geojson" {
			return []byte(exampleMap), nil
		}
		return nil, fmt.Errorf("%s: no such %s", path, what)
	}
	p, err := survey.Load(cfg, read)
	if err != nil {
		fmt.Println(err)
		return
	}
	res, err := p.Run(context.Background(), survey.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	s := res.Summary
	fmt.Printf("%d modules, %.2f kWp\n", s.Modules, s.DCkWp)
	// Rounded to 100 kWh: the example shows the shape of the result, not a reference value.
	fmt.Printf("about %.0f kWh a year\n", math.Round(s.AnnualACkWh/100)*100)
	files, err := res.Render(survey.RenderOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	_, ok := files["proposal.pdf"]
	fmt.Println("proposal rendered:", ok)
	// Output:
	// 27 modules, 11.07 kWp
	// about 11800 kWh a year
	// proposal rendered: true
}
