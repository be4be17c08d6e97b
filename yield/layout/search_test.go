package layout

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"sync"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/yield/electric"
)

// roof is a synthetic roof: per module and step the share of sun reaching it (0..1), and
// module centres on a grid of 1.2 m × 1.8 m pitch.
type roof struct {
	lit [][]float64
	pos []Point
}

// randomRoof places n modules in rows of cols and throws seeded shadows: each shadow covers
// a patch of neighbouring modules during a run of steps, as a chimney or a tree would.
func randomRoof(n, cols, steps, shadows int, seed uint64) roof {
	rng := rand.New(rand.NewPCG(seed, 7))
	r := roof{lit: make([][]float64, n), pos: make([]Point, n)}
	for m := range n {
		r.lit[m] = make([]float64, steps)
		for t := range r.lit[m] {
			r.lit[m][t] = 1
		}
		r.pos[m] = Point{X: 1.2 * float64(m%cols), Y: 1.8 * float64(m/cols)}
	}
	for range shadows {
		c0, w := rng.IntN(cols), 1+rng.IntN(3)
		t0, d := rng.IntN(steps), 1+rng.IntN(steps/3)
		depth := 0.2 + 0.7*rng.Float64()
		for m := range n {
			if c := m % cols; c < c0 || c >= c0+w {
				continue
			}
			for t := t0; t < min(t0+d, steps); t++ {
				r.lit[m][t] = math.Min(r.lit[m][t], 1-depth)
			}
		}
	}
	return r
}

// features is the shaded share per step, the Problem's convention (larger: more shade).
func (r roof) features() [][]float64 {
	f := make([][]float64, len(r.lit))
	for m, l := range r.lit {
		f[m] = make([]float64, len(l))
		for t, x := range l {
			f[m][t] = 1 - x
		}
	}
	return f
}

// eval is a small electrical stand-in with bypass diodes: a string's current settles where
// its power is largest, modules lit below that current are bypassed and give nothing, so a
// string of lit shares g gives max over I of I·#{g ≥ I}; strings in parallel add. A module's
// full output is 1 W. It rewards grouping alike-shaded modules for the same reason a real
// string does, and is cheap enough to enumerate every layout of a small roof.
func (r roof) eval(l electric.Layout) (float64, error) {
	steps := len(r.lit[0])
	total := 0.0
	g := make([]float64, 0, 32)
	for t := range steps {
		for _, in := range l.Inputs {
			for _, str := range in {
				g = g[:0]
				for _, m := range str {
					g = append(g, r.lit[m][t])
				}
				slices.Sort(g)
				best := 0.0
				for i, x := range g {
					best = math.Max(best, x*float64(len(g)-i))
				}
				total += best
			}
		}
	}
	return total, nil
}

// thin is the roof on every k-th step, each standing for k steps: the stand-in's screen, as
// electric.Year.Thin is the model's.
func (r roof) thin(k int) roof {
	t := roof{lit: make([][]float64, len(r.lit)), pos: r.pos}
	for m, l := range r.lit {
		for s := 0; s < len(l); s += k {
			t.lit[m] = append(t.lit[m], l[s])
		}
	}
	return t
}

// screen is the thinned roof's evaluator scaled back to the whole roof's steps.
func (r roof) screen(k int) Evaluator {
	t := r.thin(k)
	return func(l electric.Layout) (float64, error) {
		e, err := t.eval(l)
		return e * float64(k), err
	}
}

// exhaustive evaluates every distinct layout of every shape, the reference for the search.
func exhaustive(t *testing.T, n, inputs int, b Bounds, leaveOut bool, eval Evaluator) (best float64, count int) {
	t.Helper()
	// The search's rule: with leave-out, at least the inputs' capacity (or every module)
	// less a quarter of the roof.
	minMods := n
	if capacity := inputs * b.MaxParallel * b.MaxSeries; leaveOut || capacity < n {
		minMods = min(n, capacity) - n/4
	}
	best = math.Inf(-1)
	seen := map[string]bool{}
	for _, sh := range Shapes(n, minMods, inputs, b) {
		_, lengths := slotsOf(sh)
		strs := make([][]int, len(lengths))
		used := make([]bool, n)
		var rec func(slot int)
		rec = func(slot int) {
			if slot == len(lengths) {
				st := state{shape: slices.Clone(sh), strs: cloneStrs(strs)}
				st.canon()
				if seen[st.key] {
					return
				}
				seen[st.key] = true
				e, err := eval(st.layout)
				if err != nil {
					t.Fatal(err)
				}
				best = math.Max(best, e)
				count++
				return
			}
			// All subsets of the unused modules of this slot's size, in increasing order.
			var pick func(from int, cur []int)
			pick = func(from int, cur []int) {
				if len(cur) == lengths[slot] {
					strs[slot] = slices.Clone(cur)
					for _, m := range cur {
						used[m] = true
					}
					rec(slot + 1)
					for _, m := range cur {
						used[m] = false
					}
					return
				}
				for m := from; m < n; m++ {
					if !used[m] {
						pick(m+1, append(cur, m))
					}
				}
			}
			pick(0, nil)
		}
		rec(0)
	}
	return best, count
}

func cloneStrs(s [][]int) [][]int {
	out := make([][]int, len(s))
	for i := range s {
		out[i] = slices.Clone(s[i])
	}
	return out
}

// checked wraps an evaluator and records every layout that breaks the bounds.
type checked struct {
	mu    sync.Mutex
	n     int
	in    int
	b     Bounds
	bad   []string
	calls int
	eval  Evaluator
}

func (c *checked) Evaluate(l electric.Layout) (float64, error) {
	var probs []string
	if len(l.Inputs) > c.in {
		probs = append(probs, fmt.Sprintf("%d inputs", len(l.Inputs)))
	}
	used := make([]bool, c.n)
	for _, in := range l.Inputs {
		if len(in) < 1 || len(in) > c.b.MaxParallel {
			probs = append(probs, fmt.Sprintf("%d strings in parallel", len(in)))
		}
		for _, s := range in {
			if len(s) < c.b.MinSeries || len(s) > c.b.MaxSeries {
				probs = append(probs, fmt.Sprintf("string of %d", len(s)))
			}
			if len(s) != len(in[0]) {
				probs = append(probs, "unequal parallel strings")
			}
			for _, m := range s {
				if used[m] {
					probs = append(probs, fmt.Sprintf("module %d twice", m))
				}
				used[m] = true
			}
		}
	}
	c.mu.Lock()
	c.calls++
	c.mu.Unlock()
	if len(probs) > 0 {
		c.mu.Lock()
		c.bad = append(c.bad, fmt.Sprint(l.Inputs, probs))
		c.mu.Unlock()
	}
	return c.eval(l)
}

// On small roofs the search must find the optimum that enumerating every layout finds; the
// test's own enumeration is the reference. Each case runs twice: with a budget that covers
// every layout (the search then enumerates them itself and says so, and counts as many
// layouts as the reference), and with a budget just short of that, so that the local search
// must find the optimum on its own. The cases vary the shade, the bounds and leave-out.
func TestSearchMatchesExhaustive(t *testing.T) {
	for _, c := range []struct {
		name             string
		n, cols, shadows int
		inputs           int
		b                Bounds
		leaveOut         bool
		seed             uint64
	}{
		{"8 modules, 2 single-string inputs", 8, 4, 3, 2, Bounds{MinSeries: 3, MaxSeries: 6, MaxParallel: 1}, false, 1},
		{"9 modules, parallel strings allowed", 9, 3, 4, 2, Bounds{MinSeries: 3, MaxSeries: 5, MaxParallel: 2}, false, 2},
		{"10 modules, heavy shade", 10, 5, 6, 2, Bounds{MinSeries: 3, MaxSeries: 7, MaxParallel: 2}, false, 3},
		{"10 modules, three inputs", 10, 5, 4, 3, Bounds{MinSeries: 3, MaxSeries: 6, MaxParallel: 1}, false, 4},
		{"9 modules, leave-out allowed", 9, 3, 5, 2, Bounds{MinSeries: 3, MaxSeries: 4, MaxParallel: 1}, true, 5},
		{"11 modules, one input", 11, 4, 5, 1, Bounds{MinSeries: 3, MaxSeries: 6, MaxParallel: 3}, true, 6},
	} {
		r := randomRoof(c.n, c.cols, 48, c.shadows, c.seed)
		want, count := exhaustive(t, c.n, c.inputs, c.b, c.leaveOut, r.eval)
		p := Problem{Features: r.features(), Positions: r.pos, Bounds: c.b, Inputs: c.inputs}
		for _, mode := range []struct {
			name     string
			maxEvals int
			enum     bool
		}{
			{"enumerated", count, true},
			{"local search", count - 1, false},
		} {
			t.Run(c.name+", "+mode.name, func(t *testing.T) {
				chk := &checked{n: c.n, in: c.inputs, b: c.b, eval: r.eval}
				got, err := Search(context.Background(), p, chk.Evaluate, Options{LeaveOut: c.leaveOut, MaxEvals: mode.maxEvals})
				if err != nil {
					t.Fatal(err)
				}
				best := got.Candidates[0]
				// The same evaluator on the same layout: equal to rounding.
				if !scalar.EqualWithinAbsOrRel(best.EnergyWh, want, 1e-9, 1e-9) {
					t.Errorf("search best %.4f Wh, exhaustive best %.4f Wh over %d layouts (start %q, shape %s)",
						best.EnergyWh, want, count, best.Start, best.Shape)
				}
				if got.Exhaustive != mode.enum {
					t.Errorf("Exhaustive = %v, want %v (%d layouts, budget %d)", got.Exhaustive, mode.enum, count, mode.maxEvals)
				}
				if mode.enum && got.Evaluated != count {
					t.Errorf("enumeration evaluated %d layouts, the reference counts %d", got.Evaluated, count)
				}
				t.Logf("search: %d evaluations; enumeration: %d layouts", got.Evaluated, count)
				if len(chk.bad) > 0 {
					t.Errorf("layouts outside the bounds were evaluated: %v", chk.bad[:min(3, len(chk.bad))])
				}
			})
		}
	}
}

// countLayouts agrees with the test's enumeration of distinct layouts.
func TestCountLayouts(t *testing.T) {
	for _, c := range []struct {
		name     string
		n        int
		inputs   int
		b        Bounds
		leaveOut bool
	}{
		{"8 modules, 2 inputs", 8, 2, Bounds{MinSeries: 3, MaxSeries: 6, MaxParallel: 1}, false},
		{"9 modules, parallel strings", 9, 2, Bounds{MinSeries: 3, MaxSeries: 5, MaxParallel: 2}, false},
		{"9 modules, leave-out", 9, 2, Bounds{MinSeries: 3, MaxSeries: 4, MaxParallel: 1}, true},
		{"8 modules, 3 equal inputs", 8, 3, Bounds{MinSeries: 2, MaxSeries: 4, MaxParallel: 2}, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			eval := func(electric.Layout) (float64, error) { return 1, nil }
			_, want := exhaustive(t, c.n, c.inputs, c.b, c.leaveOut, eval)
			p := Problem{Inputs: c.inputs, Bounds: c.b}
			got := countLayouts(shapesFor(p, c.n, c.leaveOut), c.n)
			// An exact count, computed through log-gamma: equal to 1e-9.
			if !scalar.EqualWithinAbsOrRel(got, float64(want), 1e-9, 1e-9) {
				t.Errorf("countLayouts %.3f, enumeration %d", got, want)
			}
		})
	}
}

// More freedom never gives a worse best: leave-out allowed against not, three inputs against
// two, on seeded roofs too large to enumerate; and the best is never worse than a start the
// caller gives (here a poor one: the modules in reverse index order).
func TestSearchMonotone(t *testing.T) {
	for seed := range uint64(4) {
		r := randomRoof(24, 6, 48, 8, 100+seed)
		b := Bounds{MinSeries: 4, MaxSeries: 9, MaxParallel: 2}
		var rev []int
		for m := 23; m >= 0; m-- {
			rev = append(rev, m)
		}
		given := electric.Layout{Inputs: [][][]int{{rev[:8], rev[8:16]}, {rev[16:]}}}
		run := func(inputs int, leaveOut bool, screen Evaluator) float64 {
			p := Problem{Features: r.features(), Positions: r.pos, Bounds: b, Inputs: inputs, Starts: []electric.Layout{given}}
			res, err := Search(context.Background(), p, r.eval, Options{LeaveOut: leaveOut, MaxEvals: 150, Screen: screen})
			if err != nil {
				t.Fatal(err)
			}
			if res.Exhaustive {
				t.Fatalf("seed %d: %d inputs enumerated; the case must need the local search", seed, inputs)
			}
			return res.Candidates[0].EnergyWh
		}
		two, twoOut, three := run(2, false, nil), run(2, true, nil), run(3, false, nil)
		// The same with the layouts screened on every fourth step first: the screen only
		// chooses what is evaluated, so the properties hold as well.
		sc := r.screen(4)
		twoS, twoOutS, threeS := run(2, false, sc), run(2, true, sc), run(3, false, sc)
		g, _ := r.eval(given)
		for _, c := range []struct {
			name         string
			wide, narrow float64
		}{
			{"leave-out against not", twoOut, two},
			{"three inputs against two", three, two},
			{"search against the given start", two, g},
			{"screened: leave-out against not", twoOutS, twoS},
			{"screened: three inputs against two", threeS, twoS},
			{"screened: search against the given start", twoS, g},
		} {
			// Equal layouts give equal energies to the bit; a margin of rounding only.
			if c.wide < c.narrow*(1-1e-12) {
				t.Errorf("seed %d, %s: %.4f < %.4f", seed, c.name, c.wide, c.narrow)
			}
		}
	}
}

// A roof with one shaded end: the layout that keeps the shaded modules in one string must
// rank above the one that spreads them over both strings (common practice), in the stand-in
// and in the real electrics (bypass diodes, a global tracker, the inverter's window), and
// the search must keep the shaded modules in one string.
func TestShadedEndTogether(t *testing.T) {
	// Ten modules in a row; the first three get 60 % of the sun in the first ten of thirty
	// steps (a tree at the east end; the whole module dims, so bypass diodes cannot help).
	const n, steps, dim = 10, 30, 0.6
	r := roof{lit: make([][]float64, n), pos: make([]Point, n)}
	for m := range n {
		r.lit[m] = make([]float64, steps)
		for s := range steps {
			r.lit[m][s] = 1
			if m < 3 && s < 10 {
				r.lit[m][s] = dim
			}
		}
		r.pos[m] = Point{X: 1.2 * float64(m)}
	}
	mod, err := electric.NewModule(electric.Datasheet{PowerW: 400, VocV: 37.1, IscA: 13.7, VmpV: 31.0, ImpA: 12.9,
		TempCoeffVocPct: -0.26, TempCoeffIscPct: 0.05, TempCoeffPmaxPct: -0.32, CellsSeries: 120, BypassDiodes: 3, HalfCut: true})
	if err != nil {
		t.Fatal(err)
	}
	y, err := electric.NewYear(mod, n, steps, func(s int, d *electric.StepInput) {
		for m := range n {
			for c := range d.CellIrr[m] {
				d.CellIrr[m][c] = 800 * r.lit[m][s]
			}
			d.TempC[m], d.UnshadedIrr[m] = 25, 800
		}
	})
	if err != nil {
		t.Fatal(err)
	}
	inv := electric.Inverter{ACPowerW: 10000, MaxDCVoltageV: 600, MPPTMinV: 90, MPPTMaxV: 560, Inputs: 2,
		MaxInputCurrentA: 16, Efficiency: []electric.EffPoint{{LoadFrac: 1, Eff: 0.97}}}
	real := func(l electric.Layout) (float64, error) {
		res, err := y.Evaluate(l, inv, electric.EvalOptions{NightHours: -1})
		return res.ACWh, err
	}
	together := electric.Layout{Inputs: [][][]int{{{0, 1, 2, 3, 4}}, {{5, 6, 7, 8, 9}}}}
	spread := electric.Layout{Inputs: [][][]int{{{0, 2, 4, 6, 8}}, {{1, 3, 5, 7, 9}}}}
	for _, c := range []struct {
		name string
		eval Evaluator
		// Stand-in hand sums (roof.eval, 1 W a module): together 10·(max(0.6·5, 1·2) + 5) +
		// 20·10 = 280; spread 10·(max(0.6·5, 3) + max(0.6·5, 4)) + 200 = 270. Real
		// electrics: at least 1 % apart (from the stand-in's 3.6 %, less what the diodes
		// and the curve's knee take back).
		minGainPct float64
	}{
		{"stand-in", r.eval, 3.5},
		{"real electrics", real, 1},
	} {
		t.Run(c.name, func(t *testing.T) {
			et, err := c.eval(together)
			if err != nil {
				t.Fatal(err)
			}
			es, err := c.eval(spread)
			if err != nil {
				t.Fatal(err)
			}
			if gain := 100 * (et/es - 1); gain < c.minGainPct {
				t.Errorf("together %.2f Wh, spread %.2f Wh: gain %.2f %%, want at least %.1f %%", et, es, gain, c.minGainPct)
			}
			b := Bounds{MinSeries: 4, MaxSeries: 8, MaxParallel: 1}
			got, err := Search(context.Background(), Problem{Features: r.features(), Positions: r.pos, Bounds: b, Inputs: 2},
				c.eval, Options{MaxEvals: 120})
			if err != nil {
				t.Fatal(err)
			}
			// The search's best is at least keeping them together (rounding aside).
			if got.Candidates[0].EnergyWh < et*(1-1e-9) {
				t.Errorf("search best %.3f Wh below together %.3f Wh", got.Candidates[0].EnergyWh, et)
			}
			var home []int
			for a, in := range got.Candidates[0].Layout.Inputs {
				for b, s := range in {
					for _, m := range s {
						if m < 3 {
							home = append(home, a*10+b)
						}
					}
				}
			}
			if home[0] != home[1] || home[1] != home[2] {
				t.Errorf("shaded modules 0, 1, 2 in strings %v of %v", home, got.Candidates[0].Layout.Inputs)
			}
		})
	}
}

// A caller's start that is already the optimum (found by exhaustive enumeration) survives a
// budget too small for the search to find it on its own; a start outside the bounds is
// skipped without an error.
func TestGivenStart(t *testing.T) {
	const n, inputs = 10, 2
	b := Bounds{MinSeries: 3, MaxSeries: 7, MaxParallel: 2}
	r := randomRoof(n, 5, 48, 6, 3)
	want, _ := exhaustive(t, n, inputs, b, false, r.eval)
	// The optimum's layout, from a search with a generous budget.
	long, err := Search(context.Background(), Problem{Features: r.features(), Bounds: b, Inputs: inputs}, r.eval, Options{MaxEvals: 5000})
	if err != nil {
		t.Fatal(err)
	}
	bestE, bestL := long.Candidates[0].EnergyWh, long.Candidates[0].Layout
	if !long.Exhaustive || !scalar.EqualWithinAbsOrRel(bestE, want, 1e-9, 1e-9) {
		t.Fatalf("the long search (exhaustive %v) did not reach the optimum: %.3f against %.3f", long.Exhaustive, bestE, want)
	}
	bad := electric.Layout{Inputs: [][][]int{{{0, 1}}}} // two modules: below MinSeries
	got, err := Search(context.Background(), Problem{Features: r.features(), Bounds: b, Inputs: inputs, Starts: []electric.Layout{bad, bestL}},
		r.eval, Options{MaxEvals: 3})
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbsOrRel(got.Candidates[0].EnergyWh, want, 1e-9, 1e-9) || got.Candidates[0].Start != StartGiven {
		t.Errorf("best %.4f Wh from %q, want the given optimum %.4f Wh", got.Candidates[0].EnergyWh, got.Candidates[0].Start, want)
	}
}

// Screening trades a little of the search's reach for time: on seeded roofs too large to
// enumerate, the screened search evaluates far fewer layouts in full and its best lies
// within the survey's equivalence margin (0.5 % of the year's energy) of the unscreened
// search's best.
func TestSearchScreened(t *testing.T) {
	for seed := range uint64(4) {
		t.Run(fmt.Sprintf("seed %d", seed), func(t *testing.T) {
			r := randomRoof(40, 8, 96, 12, 300+seed)
			p := Problem{Features: r.features(), Positions: r.pos, Bounds: Bounds{MinSeries: 5, MaxSeries: 12, MaxParallel: 2}, Inputs: 2}
			plain, err := Search(context.Background(), p, r.eval, Options{MaxEvals: 300})
			if err != nil {
				t.Fatal(err)
			}
			screened, err := Search(context.Background(), p, r.eval, Options{MaxEvals: 300, Screen: r.screen(4)})
			if err != nil {
				t.Fatal(err)
			}
			a, b := plain.Candidates[0].EnergyWh, screened.Candidates[0].EnergyWh
			if b < a*(1-0.005) {
				t.Errorf("screened best %.2f, unscreened %.2f: %.2f %% behind, more than the 0.5 %% margin", b, a, 100*(1-b/a))
			}
			if screened.Evaluated >= plain.Evaluated {
				t.Errorf("screened search evaluated %d layouts in full, unscreened %d: screening must save evaluations", screened.Evaluated, plain.Evaluated)
			}
			if screened.Screened == 0 {
				t.Error("no layout screened")
			}
			t.Logf("unscreened %.2f (%d evaluated); screened %.2f (%d evaluated, %d screened)", a, plain.Evaluated, b, screened.Evaluated, screened.Screened)
		})
	}
}

// Moves put in order a chunk at a time come out as a full sort would put them, whatever the
// chunks, ties of gain included (the other fields break them).
func TestOrderMovesAsSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 9))
	tests := []struct {
		name  string
		n     int
		first int
		gains int // distinct gains: few make many ties
	}{
		{"fewer than a chunk", 100, 256, 1000},
		{"chunks", 5000, 256, 1000000},
		{"many ties", 5000, 64, 3},
		{"chunk of one", 50, 1, 10},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			ms := make([]move, tc.n)
			for i := range ms {
				ms[i] = move{gain: float64(rng.IntN(tc.gains)), kind: moveKind(rng.IntN(5)), a: rng.IntN(400), b: rng.IntN(400), i: rng.IntN(20), j: rng.IntN(20)}
			}
			want := slices.Clone(ms)
			slices.SortStableFunc(want, compareMoves)
			got := slices.Clone(ms)
			for ordered := 0; ordered < len(got); {
				k := max(tc.first, ordered)
				orderMoves(got, ordered, k)
				ordered = min(ordered+k, len(got))
			}
			for i := range want {
				if compareMoves(got[i], want[i]) != 0 {
					t.Fatalf("move %d: %+v, a full sort puts %+v there", i, got[i], want[i])
				}
			}
		})
	}
}
