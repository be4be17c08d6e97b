package electric

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
)

// evenSteps is a step function for n modules, lit as the case says, and whether it marks the
// modules lit evenly (StepInput.Even) instead of setting all their cells. Marked modules get
// NaN in every cell but the first: those cells must not be read.
type evenSteps func(s, k int, rng *rand.Rand) (cells func(c int) float64, even bool)

func stepsFor(n int, lit evenSteps, mark bool) func(s int, d *StepInput) {
	return func(s int, d *StepInput) {
		rng := rand.New(rand.NewPCG(11, uint64(s)))
		for k := range n {
			cells, even := lit(s, k, rng)
			ci := d.CellIrr[k]
			if even && mark {
				ci[0] = cells(0)
				for c := 1; c < len(ci); c++ {
					ci[c] = math.NaN()
				}
				d.Even[k] = true
			} else {
				for c := range ci {
					ci[c] = cells(c)
				}
			}
			d.TempC[k] = 15 + 0.03*cells(0)
			d.UnshadedIrr[k] = cells(0)
			d.Hours = 0.5 + float64(s%2)
		}
	}
}

// TestEvenSameYear: modules marked as lit evenly give the year their cells all set to the
// first would give, module by module and step by step: the same curve (grid and voltages),
// maximum power, unshaded power and energies, rounded or exact, filled in order or on all
// cores.
func TestEvenSameYear(t *testing.T) {
	m, err := NewModule(testDatasheet)
	if err != nil {
		t.Fatal(err)
	}
	const n, steps = 24, 40
	uniform := func(g float64) func(int) float64 { return func(int) float64 { return g } }
	for _, tc := range []struct {
		name string
		lit  evenSteps
	}{
		{"all even, one sky", func(s, k int, _ *rand.Rand) (func(int) float64, bool) {
			return uniform(100 + 20*float64(s)), true
		}},
		{"all even, values apart", func(s, k int, rng *rand.Rand) (func(int) float64, bool) {
			return uniform(50 + 900*rng.Float64()), true
		}},
		{"dark and lit", func(s, k int, _ *rand.Rand) (func(int) float64, bool) {
			if k%3 == 0 {
				return uniform(0), true
			}
			return uniform(700), true
		}},
		{"shade on some", func(s, k int, _ *rand.Rand) (func(int) float64, bool) {
			g := 200 + 30*float64(s)
			if (k+s)%4 == 0 {
				// A shaded module whose first cell is as bright as its evenly lit neighbours.
				return func(c int) float64 {
					if c >= 30 && c < 50 {
						return 0.2 * g
					}
					return g
				}, false
			}
			return uniform(g), true
		}},
		{"at the limits", func(s, k int, _ *rand.Rand) (func(int) float64, bool) {
			if k%2 == 0 {
				return uniform(MaxIrradiance), true
			}
			return uniform(1e-3), true
		}},
	} {
		for _, opt := range []YearOptions{{}, {Exact: true}, {ConcurrentSteps: true}} {
			t.Run(fmt.Sprintf("%s/exact=%t,concurrent=%t", tc.name, opt.Exact, opt.ConcurrentSteps), func(t *testing.T) {
				want, err := NewYearWith(m, n, steps, stepsFor(n, tc.lit, false), opt)
				if err != nil {
					t.Fatal(err)
				}
				got, err := NewYearWith(m, n, steps, stepsFor(n, tc.lit, true), opt)
				if err != nil {
					t.Fatal(err)
				}
				if d := yearDiff(got, want); d != "" {
					t.Error(d)
				}
			})
		}
	}
}

// yearDiff describes the first difference between two years' curves and energies, module by
// module and step by step ("" if none).
func yearDiff(a, b *Year) string {
	if a.n != b.n || a.steps != b.steps {
		return fmt.Sprintf("%d modules × %d steps, want %d × %d", a.n, a.steps, b.n, b.steps)
	}
	for s := range a.steps {
		ga, gb := a.grid(s), b.grid(s)
		if !slices.Equal(ga, gb) {
			return fmt.Sprintf("step %d: grid %v, want %v", s, ga, gb)
		}
		if a.hours[s] != b.hours[s] {
			return fmt.Sprintf("step %d: %v h, want %v h", s, a.hours[s], b.hours[s])
		}
		for k := range a.n {
			ca, cb := a.modCurve[s*a.n+k], b.modCurve[s*b.n+k]
			if va, vb := a.curve(ca, len(ga)), b.curve(cb, len(gb)); !slices.Equal(va, vb) {
				return fmt.Sprintf("step %d, module %d: voltages %v, want %v", s, k, va, vb)
			}
			if a.curveMPP[ca] != b.curveMPP[cb] {
				return fmt.Sprintf("step %d, module %d: %v W, want %v W", s, k, a.curveMPP[ca], b.curveMPP[cb])
			}
			if ua, ub := a.unshadedW[s*a.n+k], b.unshadedW[s*b.n+k]; ua != ub {
				return fmt.Sprintf("step %d, module %d: unshaded %v W, want %v W", s, k, ua, ub)
			}
		}
	}
	if !slices.Equal(a.moduleDCWh, b.moduleDCWh) || !slices.Equal(a.moduleUnWh, b.moduleUnWh) {
		return "module energies differ"
	}
	return ""
}

// TestEvenBadInput: a bad value of a module marked as lit evenly is refused with its step,
// module and field; its other cells are not read, whatever they hold; a step function that
// drops the marks is refused.
func TestEvenBadInput(t *testing.T) {
	m := bypassCase()
	for _, tc := range []struct {
		name        string
		set         func(d *StepInput)
		where, what string // "" what: accepted
	}{
		{"NaN", func(d *StepInput) { d.CellIrr[1][0] = math.NaN() }, "step 2, module 1: ", "cell_irradiance[0]"},
		{"negative", func(d *StepInput) { d.CellIrr[2][0] = -1 }, "step 2, module 2: ", "cell_irradiance[0]"},
		{"too bright", func(d *StepInput) { d.CellIrr[0][0] = MaxIrradiance * 1.01 }, "step 2, module 0: ", "cell_irradiance[0]"},
		{"too hot", func(d *StepInput) { d.TempC[1] = MaxCellTempC + 1 }, "step 2, module 1: ", "cell_temp_c"},
		{"short cells", func(d *StepInput) { d.CellIrr[2] = d.CellIrr[2][:1] }, "step 2, module 2: ", "cell_irradiance"},
		{"marks dropped", func(d *StepInput) { d.Even = nil }, "step 2: ", "per-module slices"},
		{"other cells bad", func(d *StepInput) { d.CellIrr[1][7] = -5 }, "", ""},
	} {
		for _, concurrent := range []bool{false, true} {
			t.Run(fmt.Sprintf("%s/concurrent=%t", tc.name, concurrent), func(t *testing.T) {
				// 40 steps: the bad one, and a bad one after it, in the second batch.
				_, err := NewYearWith(m, 3, 40, func(s int, d *StepInput) {
					for k := range d.CellIrr {
						d.CellIrr[k][0], d.Even[k], d.TempC[k] = 800, true, 30
					}
					if s == 2 || s == 20 {
						tc.set(d)
					}
				}, YearOptions{ConcurrentSteps: concurrent})
				switch {
				case tc.what == "":
					if err != nil {
						t.Errorf("got %v, want the other cells unread", err)
					}
				case err == nil || !errors.Is(err, ErrOutOfModel) || !strings.Contains(err.Error(), tc.where) ||
					!strings.Contains(err.Error(), tc.what):
					t.Errorf("got %v, want an ErrOutOfModel naming %q%q", err, tc.where, tc.what)
				}
			})
		}
	}
}

// TestQuantCurveMixed: a curve whose voltages leave int32 part way gives each voltage its
// quantV, before the first held one, at it and after it.
func TestQuantCurveMixed(t *testing.T) {
	for _, tc := range []struct {
		name string
		v    []float64
	}{
		{"all inside", []float64{0, 41.25, -0.3, 12.5}},
		{"held in the middle", []float64{41.25, 1e4, 3.5, -2}},
		{"held first", []float64{-1e4, 0.5, 7}},
		{"held last", []float64{1, 2, 3, 5e3}},
		{"NaN then inside", []float64{0.25, math.NaN(), 33.125, math.Inf(1), -1}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := make([]int32, len(tc.v))
			quantCurve(got, tc.v)
			for k, v := range tc.v {
				if want := quantV(v); got[k] != want {
					t.Errorf("voltage %d (%g): %d, quantV gives %d", k, v, got[k], want)
				}
			}
		})
	}
}
