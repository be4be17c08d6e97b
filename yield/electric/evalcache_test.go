package electric

import (
	"slices"
	"sync"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// The cache only saves time: a layout evaluated through a warm cache, in any order of
// inputs, strings and modules, gives the same result to the bit as a fresh evaluation; the
// cache hits the inputs it has seen.
func TestEvaluateCachedSameResult(t *testing.T) {
	_, y := testYear120(t, 80, 0.7, 3)
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
	_, y := testYear120(t, 40, 0.7, 4)
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
	_, y := testYear120(t, 60, 0.7, 5)
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

// sameAsFresh evaluates l through the cache c and afresh, and fails unless the two agree to
// the bit: the cache may only save time.
func sameAsFresh(t *testing.T, y *Year, l Layout, opt EvalOptions, c *EvalCache) {
	t.Helper()
	fresh, err := y.Evaluate(l, bigInverter, opt)
	if err != nil {
		t.Fatal(err)
	}
	cached, err := y.EvaluateCached(l, bigInverter, opt, c)
	if err != nil {
		t.Fatal(err)
	}
	if fresh.ACWh != cached.ACWh || fresh.DCWh != cached.DCWh || fresh.GlobalDCWh != cached.GlobalDCWh ||
		fresh.TrackerLossWh != cached.TrackerLossWh || !slices.Equal(fresh.StepACWh, cached.StepACWh) ||
		!slices.Equal(fresh.StepDCWh, cached.StepDCWh) {
		t.Errorf("cached %v Wh, fresh %v Wh: must agree to the bit", cached.ACWh, fresh.ACWh)
	}
}

// namedLayout is one of the layouts a test evaluates in turn through one cache.
type namedLayout struct {
	name string
	l    Layout
}

// sameAsFreshInTurn evaluates the layouts in order through the cache c, each against a fresh
// evaluation (sameAsFresh): what each reads from the cache depends on those before it.
func sameAsFreshInTurn(t *testing.T, y *Year, opt EvalOptions, c *EvalCache, ls []namedLayout) {
	t.Helper()
	for _, nl := range ls {
		t.Run(nl.name, func(t *testing.T) { sameAsFresh(t, y, nl.l, opt, c) })
	}
}

// A string one module away from a kept one (a module swapped, moved in or moved out) is read
// from it by adding and taking away single modules' curves: whole units of voltQuantum add
// exactly, so the result is the bit-for-bit result of adding the string up afresh, however
// the strings were reached.
func TestEvaluateCachedNearStrings(t *testing.T) {
	_, y := testYear120(t, 80, 0.7, 5)
	base := layout6x20()
	swap := cloneLayout(base)
	swap.Inputs[0][0][3], swap.Inputs[0][2][9] = swap.Inputs[0][2][9], swap.Inputs[0][0][3]
	swap2 := cloneLayout(base)
	swap2.Inputs[0][0][4], swap2.Inputs[0][2][8] = swap2.Inputs[0][2][8], swap2.Inputs[0][0][4]
	move := cloneLayout(swap)
	k := move.Inputs[0][1][0]
	move.Inputs[0][1] = move.Inputs[0][1][1:]
	move.Inputs[1][0] = append(move.Inputs[1][0], k)
	out := cloneLayout(move)
	out.Inputs[1][1] = out.Inputs[1][1][:19]
	var c EvalCache
	sameAsFreshInTurn(t, y, EvalOptions{}, &c, []namedLayout{
		{"base", base},
		{"two modules swapped between strings", swap},
		{"two other modules swapped", swap2},
		{"a module moved to the other input", move},
		{"a module left out", out},
		{"base again", base},
		{"first swap again", swap},
	})
	// The second swap reads both its strings from the base's, built once asked for twice.
	if built, near := c.StringStats(); built == 0 || near < 2 {
		t.Errorf("%d strings' years built, %d strings read from a parent: the cache read none from a near string", built, near)
	}
	// The swaps take the steps where the swapped modules share a curve (at least the 30 % of
	// steps without shade, for each of the two swaps) from the base's input.
	if c.reused < 2*80*3/10 {
		t.Errorf("%d input-steps read from a parent input, want at least %d", c.reused, 2*80*3/10)
	}
}

// A string several modules away from a built one (here three modules in and three out, and a
// string cut short by four) is read from it: its voltages plus the curves moved in less those
// moved out, at the steps where that reads fewer curves than adding the string up. Whole units
// of voltQuantum add exactly, so either way gives the bits of a fresh evaluation.
func TestEvaluateCachedFarStrings(t *testing.T) {
	_, y := testYear120(t, 80, 0.7, 6)
	base := layout6x20()
	// The same six strings grouped otherwise, twice: new inputs ask for each string again,
	// which builds its year (at the third time of asking).
	regrouped := Layout{Inputs: [][][]int{
		{base.Inputs[0][0], base.Inputs[0][1], base.Inputs[1][0]},
		{base.Inputs[0][2], base.Inputs[1][1], base.Inputs[1][2]},
	}}
	regrouped2 := Layout{Inputs: [][][]int{
		{base.Inputs[0][0], base.Inputs[1][1], base.Inputs[1][2]},
		{base.Inputs[0][2], base.Inputs[0][1], base.Inputs[1][0]},
	}}
	// Three modules of the first string traded for three of the fourth: each string six
	// modules from its built one, too far for the one-module recipes.
	traded := cloneLayout(base)
	for k := range 3 {
		a, b := &traded.Inputs[0][0][5+k], &traded.Inputs[1][0][10+k]
		*a, *b = *b, *a
	}
	// The last string cut to its first 16 modules, the four others left unused.
	short := cloneLayout(base)
	short.Inputs[1][2] = short.Inputs[1][2][:16]
	var c EvalCache
	sameAsFreshInTurn(t, y, EvalOptions{}, &c, []namedLayout{
		{"base", base},
		{"strings regrouped", regrouped},
		{"strings regrouped again", regrouped2},
		{"three modules traded", traded},
		{"a string cut short", short},
	})
	// The two traded strings and the short one.
	if c.strs.near != 3 {
		t.Errorf("%d strings read from a built string several modules away, want 3", c.strs.near)
	}
}

// KeepStrings builds a layout's strings at once, however often they were asked for: the layout
// then reads them, and a layout with modules taken out of its strings reads them less those
// modules, to the bit of a fresh evaluation.
func TestKeepStrings(t *testing.T) {
	_, y := testYear120(t, 80, 0.7, 7)
	base := layout6x20()
	var c EvalCache
	c.KeepStrings(y, base)
	if built, _ := c.StringStats(); built != 6 {
		t.Fatalf("%d strings' years built, want the layout's 6", built)
	}
	// Modules 3, 9 and 14 of the first string and 0 of the fifth on converters of their own.
	out := cloneLayout(base)
	out.Inputs[0][0] = slices.DeleteFunc(out.Inputs[0][0], func(k int) bool { return k == 3 || k == 9 || k == 14 })
	out.Inputs[1][1] = out.Inputs[1][1][1:]
	for _, tc := range []struct {
		name string
		l    Layout
		opt  EvalOptions
	}{
		{"the layout", base, EvalOptions{}},
		{"with a hill-climbing tracker", base, EvalOptions{Tracker: LocalClimb}},
		{"modules taken out", out, EvalOptions{ConvertersOn: []int{3, 9, 14, 80}}},
	} {
		t.Run(tc.name, func(t *testing.T) { sameAsFresh(t, y, tc.l, tc.opt, &c) })
	}
	// The first string is three modules from its kept year; the fifth is one module out of its
	// own, read by the one-module recipe.
	if c.strs.near != 1 {
		t.Errorf("%d strings read from a built string several modules away, want 1", c.strs.near)
	}
	if built, _ := c.StringStats(); built != 6 {
		t.Errorf("%d strings' years built, want still 6: the layout's are read, not built again", built)
	}
}

// Goroutines sharing a cache, with a budget small enough that strings are dropped while
// others read from them, give every layout the fresh result to the bit.
func TestEvalCacheConcurrent(t *testing.T) {
	_, y := testYear120(t, 60, 0.7, 9)
	base := layout6x20()
	var layouts []Layout
	for i := range 24 {
		l := cloneLayout(base)
		a, b := i%3, (i+1)%3
		l.Inputs[0][a][i%20], l.Inputs[1][b][(7*i)%20] = l.Inputs[1][b][(7*i)%20], l.Inputs[0][a][i%20]
		layouts = append(layouts, l)
	}
	want := make([]float64, len(layouts))
	for i, l := range layouts {
		r, err := y.Evaluate(l, bigInverter, EvalOptions{})
		if err != nil {
			t.Fatal(err)
		}
		want[i] = r.ACWh
	}
	// About three strings' years (60 steps × ~70 points × 4 bytes each).
	c := EvalCache{MaxStringBytes: 3 * 60 * 80 * 4}
	var wg sync.WaitGroup
	got := make([]float64, 2*len(layouts))
	for g := range 4 {
		wg.Go(func() {
			for i := g; i < len(got); i += 4 {
				r, err := y.EvaluateCached(layouts[i%len(layouts)], bigInverter, EvalOptions{}, &c)
				if err != nil {
					t.Error(err)
					return
				}
				got[i] = r.ACWh
			}
		})
	}
	wg.Wait()
	for i, g := range got {
		if g != want[i%len(layouts)] {
			t.Errorf("layout %d: cached %v Wh, fresh %v Wh", i%len(layouts), g, want[i%len(layouts)])
		}
	}
}

// An input screened on the thinned year (Year.Thin) gives its share at every k-th step of the
// whole year, where the thinned year's steps are the year's: the whole year's result is a
// fresh evaluation's to the bit, for inputs of two and of three strings. A climbing tracker,
// whose step starts from the step before, takes nothing from the thinned year.
func TestEvaluateCachedThinnedInputs(t *testing.T) {
	_, y := testYear120(t, 90, 0.6, 7)
	three := layout6x20()
	two := Layout{Inputs: [][][]int{{modRange(0, 20), modRange(20, 40)}, {modRange(40, 60), modRange(60, 80)}}}
	for _, tc := range []struct {
		name string
		l    Layout
		opt  EvalOptions
		want int64 // input-steps read from the thinned year
	}{
		{"three strings an input", three, EvalOptions{}, 2 * 23},
		{"two strings an input", two, EvalOptions{}, 2 * 23},
		{"climbing tracker", two, EvalOptions{Tracker: LocalClimb}, 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var c EvalCache
			th := y.Thin(4) // 23 steps: 0, 4, …, 88
			if _, err := th.EvaluateCached(tc.l, bigInverter, tc.opt, &c); err != nil {
				t.Fatal(err)
			}
			sameAsFresh(t, y, tc.l, tc.opt, &c)
			if c.thinned != tc.want {
				t.Errorf("%d input-steps read from the thinned year, want %d", c.thinned, tc.want)
			}
		})
	}
}

// A string whose voltage does not fit a kept year's int32 (here 60 modules, over 2048 V near
// open circuit) is not kept: asked for again, or as a neighbour's parent, it is added up
// afresh, and the results are a fresh evaluation's to the bit.
func TestEvaluateCachedLongStrings(t *testing.T) {
	_, y := testYear120(t, 40, 0.5, 9)
	long := Layout{Inputs: [][][]int{{modRange(0, 60)}, {modRange(60, 120)}}}
	swap := cloneLayout(long)
	swap.Inputs[0][0][5], swap.Inputs[1][0][7] = swap.Inputs[1][0][7], swap.Inputs[0][0][5]
	swap2 := cloneLayout(long)
	swap2.Inputs[0][0][9], swap2.Inputs[1][0][3] = swap2.Inputs[1][0][3], swap2.Inputs[0][0][9]
	swap3 := cloneLayout(long)
	swap3.Inputs[0][0][20], swap3.Inputs[1][0][30] = swap3.Inputs[1][0][30], swap3.Inputs[0][0][20]
	var c EvalCache
	sameAsFreshInTurn(t, y, EvalOptions{}, &c, []namedLayout{
		{"first", long},
		{"a swap", swap},
		{"another swap: the long strings asked for twice", swap2},
		{"a third swap, read from the long strings were they kept", swap3},
		{"the first again", long},
	})
	built := 0
	for _, sy := range c.strs.byKey {
		if sy.ready.Load() {
			built++
			if sy.v != nil {
				t.Errorf("a string of %d modules was kept in int32", len(sy.mods))
			}
		}
	}
	if built == 0 {
		t.Error("no string's year was tried: the test does not reach narrow")
	}
}
