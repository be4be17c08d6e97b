package electric

import (
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// TestPlantClipsPerInverter: two inverters of one model, one loaded with four strings and the
// other with two, clip separately. Each inverter's share equals its own evaluation (to
// rounding), the plant's energy is their sum, and it is below that of one inverter with both
// AC limits together, which would let the light one's headroom absorb the heavy one's
// clipping.
func TestPlantClipsPerInverter(t *testing.T) {
	m, err := NewModule(testDatasheet)
	if err != nil {
		t.Fatal(err)
	}
	y := shadeYear(t, m, 120, 40, 0.3, 5)
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
	m, err := NewModule(testDatasheet)
	if err != nil {
		t.Fatal(err)
	}
	y := shadeYear(t, m, 120, 10, 0, 7)
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
