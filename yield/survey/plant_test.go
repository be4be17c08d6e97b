package survey_test

import (
	"context"
	"reflect"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/yield/survey"
)

// runFixed surveys the example with inverters × the example's inverter, an AC power of acW
// each, and the given fixed layouts (no search), and returns each fixed layout's annual AC
// energy and energy held at the AC limit, by name.
func runFixed(t *testing.T, inverters, inputs int, acW float64, fixed []survey.FixedLayout) (acKWh, clippedKWh map[string]float64, res *survey.Result) {
	t.Helper()
	p := exampleProject(t)
	p.Cfg.Inverter.Count, p.Cfg.Inverter.Inputs, p.Cfg.Inverter.ACPowerW = float64(inverters), float64(inputs), acW
	p.Cfg.Layouts.Fixed = fixed
	if errs := p.Cfg.Validate(); len(errs) > 0 {
		t.Fatal(errs)
	}
	p.Inverter.Inputs, p.Inverter.ACPowerW = inputs, acW
	res, err := p.Run(context.Background(), survey.Options{})
	if err != nil {
		t.Fatal(err)
	}
	acKWh, clippedKWh = map[string]float64{}, map[string]float64{}
	for _, l := range res.Layouts {
		acKWh[l.Name] = l.Result.ACkWh
		clippedKWh[l.Name] = l.Result.Year.ClippedWh / 1000
	}
	return acKWh, clippedKWh, res
}

// TestPlantAsSeparateSurveys: two inverters, each with its own strings, give the energy of
// two one-inverter surveys of those strings added up: each inverter converts, clips and
// counts its night use on its own. The AC limit (3 kW each) makes the first clip. The figures are the same per-inverter sums added in another order (equal to
// 1e-9 relative). One inverter with both AC limits and all four inputs pools the headroom
// and clips less: the plant must give less than it.
func TestPlantAsSeparateSurveys(t *testing.T) {
	// The example's face has rows of nine: the west six of rows 1 and 2 on one inverter (4.9
	// kWp), row 3 on the other (3.7 kWp).
	south := [][]string{{"S.1.1", "S.1.2", "S.1.3", "S.1.4", "S.1.5", "S.1.6"}, {"S.2.1", "S.2.2", "S.2.3", "S.2.4", "S.2.5", "S.2.6"}}
	other := [][]string{{"S.3.1", "S.3.2", "S.3.3", "S.3.4", "S.3.5", "S.3.6", "S.3.7", "S.3.8", "S.3.9"}}
	const acW = 3000
	plant, plantClip, _ := runFixed(t, 2, 2, acW, []survey.FixedLayout{{Name: "plant",
		Strings: append(append([][]string{}, south...), other...), Inverters: []float64{1, 1, 2}, Inputs: []float64{1, 2, 1}}})
	s, sClip, _ := runFixed(t, 1, 2, acW, []survey.FixedLayout{{Name: "south", Strings: south, Inputs: []float64{1, 2}}})
	g, gClip, _ := runFixed(t, 1, 2, acW, []survey.FixedLayout{{Name: "other", Strings: other, Inputs: []float64{1}}})
	pooled, pooledClip, _ := runFixed(t, 1, 4, 2*acW, []survey.FixedLayout{{Name: "pooled",
		Strings: append(append([][]string{}, south...), other...), Inputs: []float64{1, 2, 3}}})
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"annual AC", plant["plant"], s["south"] + g["other"]},
		{"held at the AC limit", plantClip["plant"], sClip["south"] + gClip["other"]},
	} {
		if !scalar.EqualWithinAbsOrRel(c.got, c.want, 1e-9, 1e-9) {
			t.Errorf("%s: two inverters %.4f kWh, two surveys %.4f kWh", c.name, c.got, c.want)
		}
	}
	if !(sClip["south"] > 0) {
		t.Errorf("clipped %.1f kWh: the first inverter must clip for the case to test per-inverter clipping", sClip["south"])
	}
	t.Logf("two inverters %.1f kWh (%.1f + %.1f clipped), pooled %.1f kWh (%.1f clipped)", plant["plant"], sClip["south"], gClip["other"], pooled["pooled"], pooledClip["pooled"])
	if !(plant["plant"] < pooled["pooled"] && plantClip["plant"] > pooledClip["pooled"]) {
		t.Errorf("two inverters %.1f kWh (%.1f clipped), one pooled %.1f kWh (%.1f clipped): separate limits must clip more",
			plant["plant"], plantClip["plant"], pooled["pooled"], pooledClip["pooled"])
	}
}

// TestPlantReportNamesInverters: with two inverters the report says which inverter each
// string is on: summary.json's layouts and module results, modules.geojson and hourly.csv's
// string columns (<inverter>.<input>.<string>).
func TestPlantReportNamesInverters(t *testing.T) {
	strs := [][]string{{"S.1.1", "S.1.2", "S.1.3", "S.1.4", "S.1.5", "S.1.6"}, {"S.3.1", "S.3.2", "S.3.3", "S.3.4", "S.3.5", "S.3.6"}}
	_, _, res := runFixed(t, 2, 2, 6000, []survey.FixedLayout{{Name: "mine", Strings: strs, Inverters: []float64{2, 1}, Inputs: []float64{2, 1}}})
	for _, l := range res.Summary.Layouts {
		if l.Name != "mine" {
			continue
		}
		if !reflect.DeepEqual(l.Inverters, []int{1, 2}) || !reflect.DeepEqual(l.Inputs, []int{1, 2}) {
			t.Errorf("layout %q: inverters %v, inputs %v; want [1 2] and [1 2] (S.3 on inverter 1 input 1, S.1 on inverter 2 input 2)", l.Name, l.Inverters, l.Inputs)
		}
	}
	files, err := res.Render(survey.RenderOptions{Hourly: true})
	if err != nil {
		t.Fatal(err)
	}
	best := res.Summary.Layouts[0]
	seen := map[int]bool{}
	for _, k := range best.Inverters {
		seen[k] = true
	}
	if !seen[1] || !seen[2] {
		t.Errorf("best layout %q: strings on inverters %v, want both", best.Name, best.Inverters)
	}
	for _, c := range []struct {
		file, want string
	}{
		{"modules.geojson", `"inverter":2`},
		{"modules.geojson", `"inverter":1`},
		{"hourly.csv", "poa_string_1.1.1_w_m2"},
		{"hourly.csv", "poa_string_2.1.1_w_m2"},
	} {
		if !strings.Contains(string(files[c.file]), c.want) {
			t.Errorf("%s lacks %s", c.file, c.want)
		}
	}
}
