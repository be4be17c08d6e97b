package electric

import (
	"slices"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// The cache only saves time: a layout evaluated through a warm cache, in any order of
// inputs, strings and modules, gives the same result to the bit as a fresh evaluation; the
// cache hits the inputs it has seen.
func TestEvaluateCachedSameResult(t *testing.T) {
	m, err := NewModule(testDatasheet)
	if err != nil {
		t.Fatal(err)
	}
	y := shadeYear(t, m, 120, 80, 0.7, 3)
	base := layout6x20()
	// One swap between input 0 and input 1; the rest as before.
	swapped := cloneLayout(base)
	swapped.Inputs[0][1][4], swapped.Inputs[1][2][7] = swapped.Inputs[1][2][7], swapped.Inputs[0][1][4]
	// The base layout with inputs, strings and modules reordered.
	shuffled := cloneLayout(base)
	slices.Reverse(shuffled.Inputs)
	for _, in := range shuffled.Inputs {
		slices.Reverse(in)
		for _, s := range in {
			slices.Reverse(s)
		}
	}
	for _, opt := range []struct {
		name string
		opt  EvalOptions
	}{
		{"global tracker", EvalOptions{}},
		{"hill-climbing tracker", EvalOptions{Tracker: LocalClimb}},
		{"module level", EvalOptions{ModuleLevel: true}},
	} {
		t.Run(opt.name, func(t *testing.T) {
			var c EvalCache
			for _, l := range []Layout{base, swapped, shuffled, base} {
				fresh, err := y.Evaluate(l, bigInverter, opt.opt)
				if err != nil {
					t.Fatal(err)
				}
				cached, err := y.EvaluateCached(l, bigInverter, opt.opt, &c)
				if err != nil {
					t.Fatal(err)
				}
				if fresh.ACWh != cached.ACWh || fresh.DCWh != cached.DCWh || fresh.GlobalDCWh != cached.GlobalDCWh ||
					fresh.TrackerLossWh != cached.TrackerLossWh || !slices.Equal(fresh.StepACWh, cached.StepACWh) {
					t.Errorf("cached %v, fresh %v", cached.ACWh, fresh.ACWh)
				}
			}
			// base: 2 inputs new; swapped: both inputs changed, 2 new; shuffled: both seen;
			// base again: both seen.
			if lookups, hits := c.Stats(); lookups != 8 || hits != 4 {
				t.Errorf("%d lookups, %d hits; want 8 and 4", lookups, hits)
			}
			r, err := y.Evaluate(shuffled, bigInverter, opt.opt)
			if err != nil {
				t.Fatal(err)
			}
			b, err := y.Evaluate(base, bigInverter, opt.opt)
			if err != nil {
				t.Fatal(err)
			}
			if r.ACWh != b.ACWh {
				t.Errorf("order of inputs, strings and modules changed the energy: %v against %v", r.ACWh, b.ACWh)
			}
		})
	}
}

// A cache smaller than one entry still gives right results (it keeps at most one entry).
func TestEvalCacheBounded(t *testing.T) {
	m, err := NewModule(testDatasheet)
	if err != nil {
		t.Fatal(err)
	}
	y := shadeYear(t, m, 120, 40, 0.7, 4)
	c := EvalCache{MaxBytes: 1}
	want, err := y.Evaluate(layout6x20(), bigInverter, EvalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for range 3 {
		got, err := y.EvaluateCached(layout6x20(), bigInverter, EvalOptions{}, &c)
		if err != nil {
			t.Fatal(err)
		}
		if got.ACWh != want.ACWh {
			t.Errorf("got %v, want %v", got.ACWh, want.ACWh)
		}
	}
	if len(c.m) > 1 {
		t.Errorf("%d entries kept under a 1-byte bound", len(c.m))
	}
}

// Converters on some modules: those modules give their own maximum power times the
// converters' efficiency, the others their strings' share. Taking string 6 off its input and
// putting converters on its modules must give the rest's strings plus the converters'
// modules at their own maxima (the sum of the two, at DC, before the inverter).
func TestConvertersOn(t *testing.T) {
	m, err := NewModule(testDatasheet)
	if err != nil {
		t.Fatal(err)
	}
	y := shadeYear(t, m, 120, 60, 0.7, 5)
	l := layout6x20()
	rest := cloneLayout(l)
	conv := rest.Inputs[1][2]
	rest.Inputs[1] = rest.Inputs[1][:2]
	strings, err := y.Evaluate(rest, bigInverter, EvalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	mixed, err := y.Evaluate(rest, bigInverter, EvalOptions{ConvertersOn: conv, ModuleLevelEff: 0.98})
	if err != nil {
		t.Fatal(err)
	}
	own := y.ModuleDCWh()
	want := strings.DCWh
	for _, k := range conv {
		want += 0.98 * own[k]
	}
	// float32 storage of the module maxima: 1e-6 relative.
	if !scalar.EqualWithinAbsOrRel(mixed.DCWh, want, 1e-6, 1e-6) {
		t.Errorf("strings plus converters %.1f Wh, want %.1f Wh", mixed.DCWh, want)
	}
	for _, c := range []struct {
		name string
		conv []int
	}{
		{"module in a string", []int{0}},
		{"out of range", []int{120}},
		{"listed twice", []int{conv[0], conv[0]}},
	} {
		t.Run(c.name, func(t *testing.T) {
			if _, err := y.Evaluate(rest, bigInverter, EvalOptions{ConvertersOn: c.conv}); err == nil {
				t.Errorf("converters on %v accepted", c.conv)
			}
		})
	}
}

func cloneLayout(l Layout) Layout {
	out := Layout{Inputs: make([][][]int, len(l.Inputs))}
	for i, in := range l.Inputs {
		for _, s := range in {
			out.Inputs[i] = append(out.Inputs[i], slices.Clone(s))
		}
	}
	return out
}
