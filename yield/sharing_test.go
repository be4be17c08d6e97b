package yield

import (
	"bytes"
	"context"
	"os"
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/geo"
	"sunstring/shading/sun"
	"sunstring/yield/electric"
	"sunstring/yield/internal/roofgen"
	"sunstring/yield/weather"
)

// sharingInput is a site's survey input on the invented module of the example and the large
// roof, with the synthetic year of the example's climate thinned to one day in everyDays (all
// seasons and sun positions, in a fraction of the time).
func sharingInput(t *testing.T, mapData []byte, lonDeg, latDeg float64, fill geo.FillOptions, everyDays int) Input {
	t.Helper()
	site, err := geo.Decode(bytes.NewReader(mapData), geo.DecodeOptions{File: "roof.geojson", OriginLonDeg: ptrTo(lonDeg), OriginLatDeg: ptrTo(latDeg)})
	if err != nil {
		t.Fatal(err)
	}
	mods, _, err := geo.Fill(site, fill)
	if err != nil {
		t.Fatal(err)
	}
	zone, _ := time.LoadLocation("Europe/Vienna")
	// The example's invented monthly climate (examples/sample-house/site.yaml).
	ghi := [12]float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29}
	temp := [12]float64{-1, 1, 5.2, 10.1, 14.8, 18.2, 20.1, 19.6, 15.2, 9.9, 4.3, 0.2}
	ws, err := weather.FromMonthly(weather.Site{LatDeg: latDeg, LonDeg: lonDeg, Zone: zone}, ghi, temp)
	if err != nil {
		t.Fatal(err)
	}
	thin := *ws
	thin.Records = nil
	for i, r := range ws.Records {
		if (i/24)%everyDays == 0 {
			thin.Records = append(thin.Records, r)
		}
	}
	ds := electric.Datasheet{PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1, TempCoeffVocPct: -0.27,
		TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34, CellsSeries: 120, HalfCut: true, BypassDiodes: 3}
	return Input{Site: site, Modules: mods, Weather: &thin, Observer: sun.Observer{LatDeg: latDeg, LonDeg: lonDeg}, Zone: zone,
		System: System{Module: ds, Inverter: testInverter, Albedo: 0.2, Losses: Losses{SoilingPct: 2}}}
}

// TestCurveSharingAccuracy holds the rounded curve sharing of NewYear to exact curves on the
// example house and on the large hall roof: each module's energy at its own maximum, the
// unshaded reference and a string layout's AC energy over the (thinned) year agree within
// 0.1 % (the bound stated at electric.IrradianceBits), and sharing leaves fewer curves.
func TestCurveSharingAccuracy(t *testing.T) {
	example, err := os.ReadFile("../examples/sample-house/roof.geojson")
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name     string
		in       Input
		strLen   int // modules a string
		perInput int // strings an input
		inverter electric.Inverter
	}{
		{"example house", sharingInput(t, example, 15.43, 47.05, geo.FillOptions{LengthM: 1.72, WidthM: 1.134,
			Grid: geo.CellGrid{Cols: 6, Rows: 20}, Orientation: geo.Best, SetbackM: 0.4, GapM: 0.02, ObstacleClearanceM: 0.3}, 2),
			// The example's inverter (examples/sample-house/site.yaml), one string an input.
			11, 1, electric.Inverter{ACPowerW: 6000, MaxDCVoltageV: 600, MPPTMinV: 90, MPPTMaxV: 560, Inputs: 2,
				MaxInputCurrentA: 16, Efficiency: []electric.EffPoint{{LoadFrac: 1, Eff: 0.97}}}},
		{"large hall roof", sharingInput(t, roofgen.Map(roofgen.Options{}), roofgen.LonDeg, roofgen.LatDeg, geo.FillOptions{LengthM: 1.72, WidthM: 1.134,
			Grid: geo.CellGrid{Cols: 6, Rows: 20}, SetbackM: 0.4, GapM: 0.02, ObstacleClearanceM: 0.3}, 12),
			// The large roof's inverter (yield/internal/roofgen), 10 inputs of two strings.
			21, 2, electric.Inverter{ACPowerW: 150000, MaxDCVoltageV: 1000, MPPTMinV: 200, MPPTMaxV: 850, Inputs: 10,
				MaxInputCurrentA: 30, Efficiency: []electric.EffPoint{{LoadFrac: 1, Eff: 0.97}}}},
	} {
		t.Run(c.name, func(t *testing.T) {
			shared, err := Prepare(context.Background(), c.in)
			if err != nil {
				t.Fatal(err)
			}
			exactIn := c.in
			exactIn.exactCurves = true
			exact, err := Prepare(context.Background(), exactIn)
			if err != nil {
				t.Fatal(err)
			}
			if shared.Year.Curves() >= exact.Year.Curves() {
				t.Errorf("sharing kept %d curves, exact %d", shared.Year.Curves(), exact.Year.Curves())
			}
			const tol = 1e-3 // the stated bound, 0.1 %
			for _, y := range []struct {
				name          string
				shared, exact *electric.Year
			}{{"shaded", shared.Year, exact.Year}, {"unshaded", shared.YearUnshaded, exact.YearUnshaded}} {
				a, b := y.shared.ModuleDCWh(), y.exact.ModuleDCWh()
				worst := 0.0
				for i := range a {
					worst = max(worst, abs(a[i]/b[i]-1))
				}
				t.Logf("%s year: worst module %.4f %%", y.name, 100*worst)
				for i := range a {
					if !scalar.EqualWithinRel(a[i], b[i], tol) {
						t.Errorf("%s year, module %d: %.1f Wh shared, %.1f Wh exact (%+.3f %%)", y.name, i, a[i], b[i], 100*(a[i]/b[i]-1))
					}
				}
			}
			// Strings of strLen modules in module order, perInput an input, as far as the
			// modules and inputs go.
			n := len(c.in.Modules)
			var l electric.Layout
			for k := 0; k+c.perInput*c.strLen <= n && len(l.Inputs) < c.inverter.Inputs; k += c.perInput * c.strLen {
				var in [][]int
				for s := range c.perInput {
					str := make([]int, c.strLen)
					for j := range str {
						str[j] = k + s*c.strLen + j
					}
					in = append(in, str)
				}
				l.Inputs = append(l.Inputs, in)
			}
			rs, err := shared.Year.Evaluate(l, c.inverter, electric.EvalOptions{})
			if err != nil {
				t.Fatal(err)
			}
			re, err := exact.Year.Evaluate(l, c.inverter, electric.EvalOptions{})
			if err != nil {
				t.Fatal(err)
			}
			if !scalar.EqualWithinRel(rs.ACWh, re.ACWh, tol) || re.ACWh <= 0 {
				t.Errorf("layout AC energy %.1f Wh shared, %.1f Wh exact (%+.4f %%)", rs.ACWh, re.ACWh, 100*(rs.ACWh/re.ACWh-1))
			}
			t.Logf("%d modules: %d curves shared, %d exact; layout AC %.1f and %.1f Wh, %+.6f %%", n, shared.Year.Curves(), exact.Year.Curves(), rs.ACWh, re.ACWh, 100*(rs.ACWh/re.ACWh-1))
		})
	}
}

func abs(x float64) float64 { return max(x, -x) }
