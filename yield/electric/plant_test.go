package electric

import (
	"reflect"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// TestPlantClipsPerInverter: two inverters of one model, one loaded with four strings and the
// other with two, clip separately. Each inverter's share equals its own evaluation (to
// rounding), the plant's energy is their sum, and it is below that of one inverter with both
// AC limits together, which would let the light one's headroom absorb the heavy one's
// clipping.
func TestPlantClipsPerInverter(t *testing.T) {
	_, y := testYear120(t, 40, 0.3, 5)
	inv := bigInverter
	inv.Inputs = 2
	// 60 modules a string at most: strings of 20 as in layout6x20, 3 on the first inverter's two
	// inputs (2 + 1) and 1 on the second's first input.
	l := layout6x20()
	flat := Layout{Inputs: [][][]int{l.Inputs[0][:2], l.Inputs[0][2:], l.Inputs[1][:1]}}
	// AC limit: the heavy inverter (60 modules) clips at middays, the light one (20) never.
	inv.ACPowerW = 12000
	plant := Identical(inv, 2)
	got, err := y.EvaluatePlant(flat, plant, EvalOptions{NightHours: -1})
	if err != nil {
		t.Fatal(err)
	}
	a, err := y.Evaluate(Layout{Inputs: flat.Inputs[:2]}, inv, EvalOptions{NightHours: -1})
	if err != nil {
		t.Fatal(err)
	}
	b, err := y.Evaluate(Layout{Inputs: flat.Inputs[2:]}, inv, EvalOptions{NightHours: -1})
	if err != nil {
		t.Fatal(err)
	}
	// Sums of the same numbers in another order: equal to rounding (1e-12 relative).
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"AC", got.ACWh, a.ACWh + b.ACWh},
		{"DC", got.DCWh, a.DCWh + b.DCWh},
		{"clipped", got.ClippedWh, a.ClippedWh + b.ClippedWh},
	} {
		if !scalar.EqualWithinRel(c.got, c.want, 1e-12) {
			t.Errorf("%s: %.3f Wh, want %.3f", c.name, c.got, c.want)
		}
	}
	if a.ClippedWh <= 0 || b.ClippedWh != 0 {
		t.Fatalf("clipped %.1f and %.1f Wh: the heavy inverter must clip and the light one not", a.ClippedWh, b.ClippedWh)
	}
	one := inv
	one.ACPowerW, one.Inputs = 2*inv.ACPowerW, 4
	pooled, err := y.Evaluate(flat, one, EvalOptions{NightHours: -1})
	if err != nil {
		t.Fatal(err)
	}
	if !(got.ACWh < pooled.ACWh) {
		t.Errorf("plant %.1f Wh, one pooled inverter %.1f Wh: separate limits must give less", got.ACWh, pooled.ACWh)
	}
	if _, err := y.EvaluatePlant(Layout{Inputs: append(flat.Inputs, flat.Inputs[:2]...)}, plant, EvalOptions{}); err == nil {
		t.Error("five inputs accepted on two inverters of two")
	}
}

// TestPlantNight: every inverter counts its night consumption, also one with no string.
func TestPlantNight(t *testing.T) {
	_, y := testYear120(t, 10, 0, 7)
	inv := bigInverter
	inv.NightW = 3
	got, err := y.EvaluatePlant(Layout{Inputs: layout6x20().Inputs[:1]}, Identical(inv, 3), EvalOptions{NightHours: 100})
	if err != nil {
		t.Fatal(err)
	}
	// Hand calculation: three inverters × 3 W × 100 h of night, plus the two without strings
	// on standby through the ten lit steps of 1 h (2 × 3 W × 10 h): 960 Wh.
	if !scalar.EqualWithinAbs(got.NightWh, 960, 1e-9) {
		t.Errorf("night consumption %.3f Wh, want 960", got.NightWh)
	}
}

// TestPlantClippingByHand: one step in full sun, three equal strings, two inverters of a flat
// 96 % whose AC limit is 1.2 times one string's DC power P. Two strings on the first inverter
// and one on the second: the first clips at 1.2·P, the second delivers 0.96·P, 2.16·P in all.
// One inverter with both limits together (2.4·P) would clip nothing of 3 × 0.96·P = 2.88·P
// beyond 2.4·P: 2.4·P. Hand calculation from the inverter model (flat efficiency, then the
// AC limit; common practice), to rounding.
func TestPlantClippingByHand(t *testing.T) {
	m, err := NewModule(testDatasheet)
	if err != nil {
		t.Fatal(err)
	}
	y, err := NewYear(m, 60, 1, func(s int, d *StepInput) {
		for k := range d.CellIrr {
			for c := range d.CellIrr[k] {
				d.CellIrr[k][c] = 1000
			}
			d.TempC[k], d.UnshadedIrr[k] = 25, 1000
		}
	})
	if err != nil {
		t.Fatal(err)
	}
	str := func(b int) [][]int {
		s := make([]int, 20)
		for k := range s {
			s[k] = 20*b + k
		}
		return [][]int{s}
	}
	opt := EvalOptions{NightHours: -1}
	inv := bigInverter
	inv.Inputs, inv.Efficiency = 2, []EffPoint{{1, 0.96}}
	one, err := y.Evaluate(Layout{Inputs: [][][]int{str(0)}}, inv, opt)
	if err != nil {
		t.Fatal(err)
	}
	p := one.DCWh // one string's DC power over the one-hour step: W
	inv.ACPowerW = 1.2 * p
	plant := Identical(inv, 2)
	// Plant order: inverter 1's two inputs, then inverter 2's.
	l := Layout{Inputs: [][][]int{str(0), str(1), str(2), nil}}
	got, err := y.EvaluatePlant(l, plant, opt)
	if err != nil {
		t.Fatal(err)
	}
	pooledInv := inv
	pooledInv.ACPowerW, pooledInv.Inputs = 2*inv.ACPowerW, 4
	pooled, err := y.Evaluate(l, pooledInv, opt)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"per inverter: AC", got.ACWh, 1.2*p + 0.96*p},
		{"per inverter: clipped", got.ClippedWh, 2*0.96*p - 1.2*p},
		{"on the sum: AC", pooled.ACWh, 2.4 * p},
		{"on the sum: clipped", pooled.ClippedWh, 3*0.96*p - 2.4*p},
	} {
		// The same curves summed: equal to rounding.
		if !scalar.EqualWithinAbsOrRel(c.got, c.want, 1e-9, 1e-9) {
			t.Errorf("%s: %.3f Wh, want %.3f", c.name, c.got, c.want)
		}
	}
}

// TestPlantDeal: Deal spreads a layout's inputs over the inverters, the largest first to the
// least loaded inverter with an input free, whatever the order they come in, and leaves a
// plant of one inverter's layout as it is.
func TestPlantDeal(t *testing.T) {
	inv := bigInverter
	inv.Inputs = 2
	seq := func(from, n int) []int {
		s := make([]int, n)
		for k := range s {
			s[k] = from + k
		}
		return s
	}
	a, b, c, d := [][]int{seq(0, 20)}, [][]int{seq(20, 18)}, [][]int{seq(38, 12), seq(50, 12)}, [][]int{seq(62, 10)}
	small := inv
	small.ACPowerW = inv.ACPowerW / 2
	for _, tc := range []struct {
		name  string
		plant Plant
		in    Layout
		want  Layout
	}{
		{"two inverters, inputs in any order", Identical(inv, 2), Layout{Inputs: [][][]int{d, b, a, c}},
			// 24 → first; 20 → second; 18 → second (20 < 24); 10 → first (24 < 38).
			Layout{Inputs: [][][]int{c, d, a, b}}},
		{"the same, reversed", Identical(inv, 2), Layout{Inputs: [][][]int{c, a, b, d}},
			Layout{Inputs: [][][]int{c, d, a, b}}},
		{"fewer inputs than the plant: empty inputs", Identical(inv, 3), Layout{Inputs: [][][]int{a, b}},
			Layout{Inputs: [][][]int{a, nil, b, nil, nil, nil}}},
		{"a smaller inverter takes fewer modules", Plant{inv, small}, Layout{Inputs: [][][]int{a, b, c}},
			// 24 → first; 20 → second (0 per W); 18 → first: 24/AC < 20/(AC/2).
			Layout{Inputs: [][][]int{c, b, a, nil}}},
		{"one inverter: as given", Identical(inv, 1), Layout{Inputs: [][][]int{d, a}},
			Layout{Inputs: [][][]int{d, a}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := tc.plant.Deal(tc.in)
			if !reflect.DeepEqual(got, tc.want) {
				t.Errorf("Deal = %v\nwant   %v", got.Inputs, tc.want.Inputs)
			}
		})
	}
}

// TestPlantConverters: modules with converters of their own feed one inverter only (the one
// with the fewest modules in strings), so the plant counts them once: the plant's DC energy
// is its strings' plus the converters' modules at their own maximum.
func TestPlantConverters(t *testing.T) {
	_, y := testYear120(t, 30, 0.3, 9)
	l := layout6x20()
	opt := EvalOptions{NightHours: -1, ConvertersOn: []int{100, 101}, ModuleLevelEff: 1}
	l.Inputs[1][2] = l.Inputs[1][2][2:] // modules 100 and 101 leave their string
	plant := Identical(bigInverter, 2)
	flat := Layout{Inputs: [][][]int{l.Inputs[0], nil, l.Inputs[1], nil}}
	got, err := y.EvaluatePlant(flat, plant, opt)
	if err != nil {
		t.Fatal(err)
	}
	strs, err := y.EvaluatePlant(flat, plant, EvalOptions{NightHours: -1})
	if err != nil {
		t.Fatal(err)
	}
	own := y.ModuleDCWh()
	// The same curves added in another order: equal to rounding.
	if want := strs.DCWh + own[100] + own[101]; !scalar.EqualWithinAbsOrRel(got.DCWh, want, 1e-6, 1e-9) {
		t.Errorf("DC with converters %.3f Wh, want %.3f", got.DCWh, want)
	}
	if _, err := y.EvaluatePlant(Layout{Inputs: [][][]int{l.Inputs[0], nil, {l.Inputs[0][0]}, nil}}, plant, EvalOptions{}); err == nil {
		t.Error("a string wired to two inverters accepted")
	}
	opt.ConvertersOn = []int{0}
	if _, err := y.EvaluatePlant(flat, plant, opt); err == nil {
		t.Error("a module on a converter and in a string of another inverter accepted")
	}
}
