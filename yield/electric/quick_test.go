package electric

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// testDatasheet is an invented 400 W half-cut module (the design page's
// example values); no real product.
var testDatasheet = Datasheet{PowerW: 400, VocV: 37.1, IscA: 13.7, VmpV: 31.0, ImpA: 12.9,
	TempCoeffVocPct: -0.26, TempCoeffIscPct: 0.05, TempCoeffPmaxPct: -0.32,
	CellsSeries: 120, BypassDiodes: 3, HalfCut: true}

func uniformIrr(n int, s float64) []float64 {
	x := make([]float64, n)
	for k := range x {
		x[k] = s
	}
	return x
}

func TestYearSmoke(t *testing.T) {
	m, err := NewModule(testDatasheet)
	if err != nil {
		t.Fatal(err)
	}
	y, err := NewYear(m, 4, 3, func(s int, d *StepInput) {
		for k := range d.CellIrr {
			for c := range d.CellIrr[k] {
				d.CellIrr[k][c] = 1000
			}
			d.TempC[k] = 25
			d.UnshadedIrr[k] = 1000
		}
	})
	if err != nil {
		t.Fatal(err)
	}
	inv := Inverter{ACPowerW: 6000, MaxDCVoltageV: 600, MPPTMinV: 60, MPPTMaxV: 500, Inputs: 2, MaxInputCurrentA: 30, Efficiency: []EffPoint{{1, 1}}}
	r, err := y.Evaluate(Layout{Inputs: [][][]int{{{0, 1}, {2, 3}}}}, inv, EvalOptions{NightHours: -1})
	if err != nil {
		t.Fatal(err)
	}
	want := 3 * 4 * m.Curve(uniformIrr(120, 1000), 25).mp()
	if !scalar.EqualWithinAbsOrRel(r.DCWh, want, 1e-6, 1e-5) || !scalar.EqualWithinAbsOrRel(r.UnshadedDCWh, want, 1e-6, 1e-5) {
		t.Errorf("DC %g, unshaded %g, want %g", r.DCWh, r.UnshadedDCWh, want)
	}
	t.Log(r, y.Curves())
}

func (c Curve) mp() float64 { p, _, _ := c.MaxPower(0, math.Inf(1)); return p }
