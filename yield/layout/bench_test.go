package layout

import (
	"context"
	"math"
	"testing"

	"sunstring/yield/electric"
)

// benchYear is a seeded 120-module year (10 columns × 12 rows, 4400 sun-up steps, the size of
// an hourly year at mid latitudes) with real module electrics: moving shadows dim patches of
// neighbouring modules, cells in the patch at 15 % of the sun, as in the electric package's
// benchmark. Invented data.
func benchYear(b *testing.B) (*electric.Year, roof, electric.Inverter) {
	const n, cols, steps = 120, 10, 4400
	r := randomRoof(n, cols, steps, 40, 120)
	mod, err := electric.NewModule(electric.Datasheet{PowerW: 400, VocV: 37.1, IscA: 13.7, VmpV: 31.0, ImpA: 12.9,
		TempCoeffVocPct: -0.26, TempCoeffIscPct: 0.05, TempCoeffPmaxPct: -0.32, CellsSeries: 120, BypassDiodes: 3, HalfCut: true})
	if err != nil {
		b.Fatal(err)
	}
	y, err := electric.NewYear(mod, n, steps, func(s int, d *electric.StepInput) {
		g := 50 + 950*math.Abs(math.Sin(float64(s)*0.27))
		for m := range n {
			for c := range d.CellIrr[m] {
				d.CellIrr[m][c] = g * r.lit[m][s]
			}
			d.TempC[m], d.UnshadedIrr[m] = 10+0.03*g, g
		}
	})
	if err != nil {
		b.Fatal(err)
	}
	inv := electric.Inverter{ACPowerW: 40000, MaxDCVoltageV: 1000, MPPTMinV: 200, MPPTMaxV: 900, Inputs: 3,
		MaxInputCurrentA: 40, Efficiency: []electric.EffPoint{{LoadFrac: 1, Eff: 0.97}}}
	return y, r, inv
}

// BenchmarkSearch120 runs the search on the 120-module year with a budget of 100 full-year
// evaluations a level (the inputs' shares of the year cached as the survey does); evals/s is
// the layouts evaluated a second, both cores used.
func BenchmarkSearch120(b *testing.B) {
	y, r, inv := benchYear(b)
	p := Problem{Features: r.features(), Positions: r.pos, Bounds: Bounds{MinSeries: 8, MaxSeries: 22, MaxParallel: 3}, Inputs: 3}
	evals := 0
	b.ReportAllocs()
	for b.Loop() {
		c := &electric.EvalCache{}
		eval := func(l electric.Layout) (float64, error) {
			res, err := y.EvaluateCached(l, inv, electric.EvalOptions{}, c)
			return res.ACWh, err
		}
		res, err := Search(context.Background(), p, eval, Options{MaxEvals: 100})
		if err != nil {
			b.Fatal(err)
		}
		evals += res.Evaluated
	}
	b.ReportMetric(float64(evals)/b.Elapsed().Seconds(), "evals/s")
	b.ReportMetric(float64(evals)/float64(b.N), "layouts/op")
}

// BenchmarkSearch120Screened is BenchmarkSearch120 with the survey's screening: layouts
// screened on every fourth step (electric.Year.Thin) before the most promising are evaluated
// on the whole year, a budget of 100 whole-year evaluations a level (four screens count as
// one). evals/s counts whole-year evaluations, screens/s the screened layouts, and
// layout-years/s both in whole years (a screen a quarter).
func BenchmarkSearch120Screened(b *testing.B) {
	y, r, inv := benchYear(b)
	thin := y.Thin(4)
	p := Problem{Features: r.features(), Positions: r.pos, Bounds: Bounds{MinSeries: 8, MaxSeries: 22, MaxParallel: 3}, Inputs: 3}
	evals, screens := 0, 0
	b.ReportAllocs()
	for b.Loop() {
		c, ct := &electric.EvalCache{}, &electric.EvalCache{}
		eval := func(l electric.Layout) (float64, error) {
			res, err := y.EvaluateCached(l, inv, electric.EvalOptions{}, c)
			return res.ACWh, err
		}
		screen := func(l electric.Layout) (float64, error) {
			res, err := thin.EvaluateCached(l, inv, electric.EvalOptions{}, ct)
			return res.ACWh, err
		}
		res, err := Search(context.Background(), p, eval, Options{MaxEvals: 100, Screen: screen, ScreenCost: 4})
		if err != nil {
			b.Fatal(err)
		}
		evals += res.Evaluated
		screens += res.Screened
	}
	sec := b.Elapsed().Seconds()
	b.ReportMetric(float64(evals)/sec, "evals/s")
	b.ReportMetric(float64(screens)/sec, "screens/s")
	b.ReportMetric((float64(evals)+float64(screens)/4)/sec, "layout-years/s")
}

// BenchmarkEvaluate120 is one full-year evaluation of a 120-module layout (3 inputs × 2
// strings of 20), on one core.
func BenchmarkEvaluate120(b *testing.B) {
	y, _, inv := benchYear(b)
	var l electric.Layout
	for a := range 3 {
		var in [][]int
		for s := range 2 {
			str := make([]int, 20)
			for k := range str {
				str[k] = (a*2+s)*20 + k
			}
			in = append(in, str)
		}
		l.Inputs = append(l.Inputs, in)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := y.Evaluate(l, inv, electric.EvalOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}
