package electric_test

import (
	"fmt"
	"math"

	"sunstring/yield/electric"
)

// A module's maximum power point from its datasheet: at standard test conditions the fitted
// single-diode model returns the datasheet's own Pmax, Vmp and Imp (the fit passes through
// them); one fully shaded cell costs one of the three substrings behind its bypass diode.
// The datasheet is invented.
func ExampleNewModule() {
	ds := electric.Datasheet{
		PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1,
		TempCoeffVocPct: -0.27, TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34,
		CellsSeries: 120, HalfCut: true, BypassDiodes: 3,
	}
	m, err := electric.NewModule(ds)
	if err != nil {
		fmt.Println(err)
		return
	}
	p, v, i := m.Params().MaxPower()
	fmt.Printf("STC: %.0f W at %.1f V, %.1f A\n", p, v, i)

	cells := make([]float64, m.Cells())
	for k := range cells {
		cells[k] = 1000 // W/m² on every cell, at 25 °C
	}

	cols, _ := m.Grid()
	cells[0], cells[cols*10] = 0, 0 // the same cell position in both halves, fully shaded
	p, _, _ = m.Curve(cells, 25).MaxPower(0, math.Inf(1))
	fmt.Printf("one cell shaded: %.0f W\n", p)
	// Output:
	// STC: 410 W at 31.3 V, 13.1 A
	// one cell shaded: 267 W
}
