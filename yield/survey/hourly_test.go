package survey_test

import (
	"bytes"
	"context"
	"encoding/csv"
	"fmt"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/yield/survey"
)

// exampleProject is the package Example's roof and system.
func exampleProject(t *testing.T) *survey.Project {
	t.Helper()
	cfg := survey.Defaults()
	cfg.Name, cfg.Map, cfg.Timezone = "example", "roof.geojson", "Europe/Vienna"
	cfg.Climate.MonthlyGHI = []float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29}
	cfg.Climate.MonthlyT = []float64{-1, 1, 5, 10, 15, 18, 20, 20, 15, 10, 4, 0}
	cfg.Module = survey.Module{PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1,
		TempCoeffVocPct: -0.27, TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34,
		CellsSeries: 120, HalfCut: true, BypassDiodes: 3, LengthM: 1.72, WidthM: 1.134, MaxSystemVoltage: 1000, Mounting: "rails"}
	cfg.Inverter = survey.Inverter{Count: 1, ACPowerW: 6000, MaxDCVoltageV: 600, MPPTMinV: 90, MPPTMaxV: 560,
		Inputs: 2, MaxInputCurrentA: 16, EfficiencyPct: 97.0}
	cfg.Layouts.Search = false
	if errs := cfg.Validate(); len(errs) > 0 {
		t.Fatal(errs)
	}
	p, err := survey.Load(cfg, func(path, what string) ([]byte, error) {
		if path == "roof.geojson" {
			return []byte(exampleMap), nil
		}
		return nil, fmt.Errorf("%s: no such %s", path, what)
	})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// TestHourlyCSV: hourly.csv carries every quantity an outside calculation needs to be
// compared hour by hour, with units in the header, and it closes on the year: the hourly AC
// and DC powers add up to the layout's annual energies (rounding of 0.05 W a row), DC is never
// below AC, shaded string light never above the face's unshaded light, cells never colder than
// the air in sunlight, and the sun columns are empty at night.
func TestHourlyCSV(t *testing.T) {
	res, err := exampleProject(t).Run(context.Background(), survey.Options{})
	if err != nil {
		t.Fatal(err)
	}
	files, err := res.Render(survey.RenderOptions{Hourly: true})
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(bytes.NewReader(files["hourly.csv"])).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	want := "time_utc_end ghi_w_m2 dni_w_m2 dhi_w_m2 air_temp_c sun_elevation_deg sun_azimuth_deg poa_w_m2 beam_lit_pct poa_unshaded_S_w_m2 poa_string_1.1_w_m2 poa_string_2.1_w_m2 cell_temp_c dc_w ac_w"
	if got := strings.Join(recs[0], " "); got != want {
		t.Fatalf("header\n%s\nwant\n%s", got, want)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	num := func(r []string, name string) (float64, bool) {
		s := r[col[name]]
		if s == "" {
			return 0, false
		}
		x, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatalf("%s: %q: %v", name, s, err)
		}
		return x, true
	}
	var acWh, dcWh float64
	for _, r := range recs[1:] {
		ac, _ := num(r, "ac_w")
		dc, _ := num(r, "dc_w")
		acWh, dcWh = acWh+ac, dcWh+dc
		elev, up := num(r, "sun_elevation_deg")
		if !up {
			if ac != 0 || r[col["cell_temp_c"]] != "" {
				t.Fatalf("%s: night row with power or cell temperature: %v", r[0], r)
			}
			continue
		}
		if elev < -1 || elev > 90 {
			t.Fatalf("%s: sun elevation %g", r[0], elev)
		}
		if dc < ac {
			t.Fatalf("%s: DC %g W below AC %g W", r[0], dc, ac)
		}
		face, _ := num(r, "poa_unshaded_S_w_m2")
		for _, s := range []string{"poa_string_1.1_w_m2", "poa_string_2.1_w_m2"} {
			if v, _ := num(r, s); v > face+0.1 {
				t.Fatalf("%s: %s %g above the face's unshaded %g", r[0], s, v, face)
			}
		}
		air, _ := num(r, "air_temp_c")
		if tc, ok := num(r, "cell_temp_c"); !ok || tc < air-0.1 {
			t.Fatalf("%s: cell %g °C below air %g °C", r[0], tc, air)
		}
	}
	yr := res.Layouts[0].Result.Year
	rows := float64(len(recs) - 1)
	if !scalar.EqualWithinAbs(acWh, yr.ACWh, 0.05*rows) || !scalar.EqualWithinAbs(dcWh, yr.DCWh, 0.05*rows) {
		t.Errorf("hourly sums AC %.1f DC %.1f Wh, year %.1f %.1f Wh", acWh, dcWh, yr.ACWh, yr.DCWh)
	}
}
