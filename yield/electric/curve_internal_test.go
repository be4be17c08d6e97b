package electric

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// randomPolyline returns n points with current rising and voltage falling, some voltage
// steps zero (flat parts, as a bypassed tail has) when flat is set.
func randomPolyline(rng *rand.Rand, n int, vTop float64, flat bool) ([]float64, []float64) {
	is, vs := make([]float64, n), make([]float64, n)
	i, v := -0.5*rng.Float64(), vTop
	for k := range n {
		is[k], vs[k] = i, v
		i += 0.01 + rng.Float64()
		if !flat || rng.IntN(4) != 0 {
			v -= 10 * rng.Float64()
		}
	}
	return is, vs
}

// The two- and three-input walks of parallel give the general walk's polyline to the bit, ties and flat
// segments included; and each of its points carries both inputs' currents at its voltage
// (an independent reading with voltageOn's inverse: the current at which each input has that
// voltage, found by bisection).
func TestParallelTwoInputsAsGeneral(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	tests := []struct {
		name   string
		na, nb int
		vb     float64 // top voltage of b (a starts at 500 V)
		flat   bool
		ties   bool // b's voltages copied from a where they can be
	}{
		{"equal lengths", 64, 64, 490, false, false},
		{"b above a", 40, 70, 800, false, false},
		{"b mostly below a", 60, 30, 300, false, false},
		{"flat segments", 64, 64, 500, true, false},
		{"equal voltages", 50, 50, 500, false, true},
		{"one point", 1, 20, 450, false, false}, // the general walk only
		{"two points", 2, 20, 502, false, false},
		{"both one point", 1, 1, 500, false, false}, // the general walk only
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			checked := 0
			for trial := range 50 {
				ia, va := randomPolyline(rng, tc.na, 500, tc.flat)
				ib, vb := randomPolyline(rng, tc.nb, tc.vb, tc.flat)
				if tc.ties {
					for k := range min(len(va), len(vb)) {
						if k%3 == 0 {
							vb[k] = va[k]
						}
					}
					slices.SortFunc(vb, func(x, y float64) int { return -cmpF(x, y) })
				}
				var m2, mn merger
				gi, gv := m2.parallel([][]float64{ia, ib}, [][]float64{va, vb})
				wi, wv := mn.parallelN([][]float64{ia, ib}, [][]float64{va, vb})
				if !slices.Equal(gi, wi) || !slices.Equal(gv, wv) {
					t.Fatalf("trial %d: two-input walk differs from the general one", trial)
				}
				ic, vc := randomPolyline(rng, tc.nb, tc.vb-5, tc.flat)
				if tc.ties {
					copy(vc, vb[:len(vb)/2])
					slices.SortFunc(vc, func(x, y float64) int { return -cmpF(x, y) })
				}
				gi3, gv3 := m2.parallel([][]float64{ia, ib, ic}, [][]float64{va, vb, vc})
				gi3, gv3 = slices.Clone(gi3), slices.Clone(gv3)
				wi3, wv3 := mn.parallelN([][]float64{ia, ib, ic}, [][]float64{va, vb, vc})
				if !slices.Equal(gi3, wi3) || !slices.Equal(gv3, wv3) {
					t.Fatalf("trial %d: three-input walk differs from the general one", trial)
				}
				if tc.na < 2 || tc.nb < 2 {
					continue
				}
				// Independent reading where both inputs are inside their polylines.
				for k, v := range gv {
					if v > va[0] || v > vb[0] || v < va[len(va)-1] || v < vb[len(vb)-1] {
						continue
					}
					checked++
					want := currentAtVoltage(ia, va, v) + currentAtVoltage(ib, vb, v)
					// Tolerance: bisection to 1e-12 of the current range, rounding of a few ulps.
					if math.Abs(gi[k]-want) > 1e-9*(1+math.Abs(want)) && !flatAt(va, v) && !flatAt(vb, v) {
						t.Fatalf("trial %d, point %d at %.6g V: %.12g A, inputs' currents add to %.12g A", trial, k, v, gi[k], want)
					}
				}
			}
			if tc.na >= 2 && tc.nb >= 2 && checked < 50 {
				t.Errorf("only %d points read independently", checked)
			}
		})
	}
}

func cmpF(x, y float64) int {
	switch {
	case x < y:
		return -1
	case x > y:
		return 1
	}
	return 0
}

// flatAt reports whether the polyline has a flat part at voltage v, where the current at
// that voltage is not one value.
func flatAt(vs []float64, v float64) bool {
	for k := 1; k < len(vs); k++ {
		if vs[k] == vs[k-1] && vs[k] == v {
			return true
		}
	}
	return false
}

// currentAtVoltage finds by bisection the current where the polyline's voltage is v (the
// polyline's voltage falls with current; voltageOn reads it).
func currentAtVoltage(is, vs []float64, v float64) float64 {
	lo, hi := is[0], is[len(is)-1]
	for range 200 {
		mid := (lo + hi) / 2
		if x, _ := voltageOn(is, vs, mid, 0); x > v {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// BenchmarkParallel puts two strings' curves of 72 points in parallel, as an input of two
// strings does at every step: the two-input walk against the general one.
func BenchmarkParallel(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	ia, va := randomPolyline(rng, 72, 800, false)
	ib, vb := randomPolyline(rng, 72, 780, false)
	var m merger
	b.Run("walk=two", func(b *testing.B) {
		for b.Loop() {
			m.parallel2(ia, va, ib, vb)
		}
	})
	is, vs := [][]float64{ia, ib}, [][]float64{va, vb}
	b.Run("walk=general", func(b *testing.B) {
		for b.Loop() {
			m.parallelN(is, vs)
		}
	})
	ic, vc := randomPolyline(rng, 72, 790, false)
	is, vs = append(is, ic), append(vs, vc)
	b.Run("walk=three", func(b *testing.B) {
		for b.Loop() {
			m.parallel3(is, vs)
		}
	})
	b.Run("walk=general/inputs=3", func(b *testing.B) {
		for b.Loop() {
			m.parallelN(is, vs)
		}
	})
}

// curveYear is a year of one step and n modules whose n curves of np points are random
// voltages from lo to lo + 2²⁶ units of voltQuantum (64 V), module k's curve not yet set.
func curveYear(rng *rand.Rand, n, np int, lo int32) *Year {
	y := &Year{n: n, steps: 1, modCurve: make([]int32, n)}
	v := make([]int32, n*np)
	for j := range v {
		v[j] = lo + int32(rng.IntN(1<<26))
	}
	y.adoptCurves(v, np)
	return y
}

// BenchmarkAddString adds a string of 22 modules with curves of their own at one step of 80
// points, as a layout's first evaluation does at every step.
func BenchmarkAddString(b *testing.B) {
	const n, np = 22, 80
	y := curveYear(rand.New(rand.NewPCG(4, 4)), n, np, 0)
	for k := range n {
		y.modCurve[k] = int32(k)
	}
	str := make([]int, n)
	for k := range str {
		str[k] = k
	}
	sum := make([]int64, np)
	var pr []curveCount
	for b.Loop() {
		clear(sum)
		pr = y.addString(sum, 0, str, pr)
	}
}

// Strings put in parallel give the same polyline to the bit in every order, ties of voltage
// included, so that an input's result does not depend on how its strings are listed (the
// evaluation cache reads a neighbour's steps from a parent whose strings sort otherwise).
func TestParallelAnyOrder(t *testing.T) {
	rng := rand.New(rand.NewPCG(8, 1))
	tests := []struct {
		name string
		n    int // inputs
		ties bool
	}{
		{"two", 2, false},
		{"two with ties", 2, true},
		{"three", 3, false},
		{"three with ties", 3, true},
		{"four with ties", 4, true},
		{"five", 5, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			for trial := range 40 {
				is, vs := make([][]float64, tc.n), make([][]float64, tc.n)
				for s := range tc.n {
					is[s], vs[s] = randomPolyline(rng, 30+rng.IntN(40), 500-20*rng.Float64(), trial%2 == 0)
					if tc.ties && s > 0 {
						for k := 0; k < min(len(vs[s]), len(vs[0])); k += 3 {
							vs[s][k] = vs[0][k]
						}
						slices.SortFunc(vs[s], func(x, y float64) int { return -cmpF(x, y) })
					}
				}
				var m merger
				wi, wv := m.parallel(is, vs)
				wi, wv = slices.Clone(wi), slices.Clone(wv)
				perm := rng.Perm(tc.n)
				pi, pv := make([][]float64, tc.n), make([][]float64, tc.n)
				for j, s := range perm {
					pi[j], pv[j] = is[s], vs[s]
				}
				gi, gv := m.parallel(pi, pv)
				if !slices.Equal(gi, wi) || !slices.Equal(gv, wv) {
					t.Fatalf("trial %d: order %v gives another polyline", trial, perm)
				}
				// Voltages fall strictly where no input has a flat part: points of several
				// inputs at one voltage are one breakpoint.
				for k := 1; k < len(wv) && trial%2 == 1; k++ {
					if !(wv[k] < wv[k-1]) {
						t.Fatalf("trial %d: voltage %g after %g", trial, wv[k], wv[k-1])
					}
				}
			}
		})
	}
}

// polyMaxFree is polyMax without bounds to the bit, on polylines with reverse current at
// the start and negative voltage at the end (bypassed strings), flat parts included.
func TestPolyMaxFreeAsBounded(t *testing.T) {
	rng := rand.New(rand.NewPCG(6, 6))
	for trial := range 2000 {
		n := 1 + rng.IntN(150)
		is, vs := randomPolyline(rng, n, 10+500*rng.Float64(), trial%3 == 0)
		gp, gv, gi := polyMaxFree(is, vs)
		wp, wv, wi := polyMax(is, vs, 0, math.Inf(1), math.Inf(1))
		if gp != wp || gv != wv || gi != wi {
			t.Fatalf("trial %d (%d points): (%v W, %v V, %v A), bounded (%v W, %v V, %v A)", trial, n, gp, gv, gi, wp, wv, wi)
		}
	}
}

// parallelMaxFree gives the maximum of the whole walk of two or three strings to the bit
// (power, voltage and current), walking only part of it: on strings of a shaded year, whose
// inputs are what the evaluation hands it, and on random polylines on one grid with flat
// parts, equal voltages in several strings, reverse current at the start and bypassed tails.
func TestParallelMaxFreeAsWhole(t *testing.T) {
	check := func(t *testing.T, what string, gi []float64, vs [][]float64) (pruned, walked, whole int) {
		t.Helper()
		var mp, mw merger
		p, v, i, ok := mp.parallelMaxFree(gi, vs)
		is := make([][]float64, len(vs))
		for s := range is {
			is[s] = gi
		}
		oi, ov := mw.parallel(is, vs)
		wp, wv, wi := polyMaxFree(oi, ov)
		if !ok {
			return 0, 0, len(oi)
		}
		if p != wp || v != wv || i != wi {
			t.Fatalf("%s: (%v W, %v V, %v A), the whole walk (%v W, %v V, %v A)", what, p, v, i, wp, wv, wi)
		}
		return 1, len(mp.oi), len(oi)
	}
	for _, strs := range []int{2, 3} {
		t.Run(fmt.Sprintf("shaded year/strings=%d", strs), func(t *testing.T) {
			_, y := testYear120(t, 600, 0.6, 21)
			rng := rand.New(rand.NewPCG(8, 9))
			var sc evalScratch
			var pruned, walked, whole, lit int
			for s := range y.steps {
				sc.gi = y.grid(s)
				for range 4 {
					mods := rng.Perm(y.n)
					var in [][]int
					for b := range strs {
						in = append(in, mods[20*b:20*b+20])
					}
					ns, same := y.stringSums(&sc, s, in, nil)
					if ns != strs || same {
						continue
					}
					if p, _, _ := polyMaxFree(sc.gi, sc.sums[0]); p > 0 {
						lit++
					}
					pr, w, wh := check(t, fmt.Sprintf("step %d", s), sc.gi, sc.sums[:ns])
					pruned, walked, whole = pruned+pr, walked+w*pr, whole+wh*pr
				}
			}
			// The point of it: nearly every input with power is answered from part of its walk.
			if pruned < lit*9/10 || walked*2 > whole {
				t.Errorf("%d of %d inputs with power pruned, walking %d of %d points", pruned, lit, walked, whole)
			}
			t.Logf("%d of %d inputs with power pruned, walking %d of %d points", pruned, lit, walked, whole)
		})
		t.Run(fmt.Sprintf("random polylines/strings=%d", strs), func(t *testing.T) {
			rng := rand.New(rand.NewPCG(4, uint64(strs)))
			pruned := 0
			const trials = 3000
			for trial := range trials {
				n := 2 + rng.IntN(120)
				gi := make([]float64, n)
				x := -0.6 * rng.Float64()
				for k := range gi {
					gi[k] = x
					x += 0.01 + 0.3*rng.Float64()
				}
				string := func(top float64) []float64 {
					vs := make([]float64, n)
					v := top
					for k := range vs {
						vs[k] = v
						if trial%4 != 0 || rng.IntN(3) != 0 { // flat parts in a quarter of the trials
							v -= 15 * rng.Float64() * float64(k+1) / float64(n)
						}
						v = math.Max(v, -2) // a bypassed tail
					}
					return vs
				}
				var vs [][]float64
				for range strs {
					vs = append(vs, string(400+300*rng.Float64()))
				}
				if trial%5 == 0 { // equal voltages in several strings
					for _, v := range vs[1:] {
						for k := range v {
							if rng.IntN(2) == 0 {
								v[k] = vs[0][k]
							}
						}
						slices.SortFunc(v, func(x, y float64) int { return -cmpF(x, y) })
					}
				}
				pr, _, _ := check(t, fmt.Sprintf("trial %d", trial), gi, vs)
				pruned += pr
			}
			if pruned < trials/2 {
				t.Errorf("only %d of %d trials pruned", pruned, trials)
			}
		})
	}
	t.Run("not monotone", func(t *testing.T) {
		gi := []float64{0, 1, 2, 3}
		va, vb := []float64{40, 39, 39.5, 30}, []float64{41, 38, 35, 30}
		if _, _, _, ok := (&merger{}).parallelMaxFree(gi, [][]float64{va, vb}); ok {
			t.Error("a string whose voltage rises with current was pruned")
		}
	})
}

// BenchmarkParallelMax finds the maximum of two and of three strings of 20 modules in parallel,
// on the steps of a shaded year: the whole walk and polyMaxFree against parallelMaxFree.
func BenchmarkParallelMax(b *testing.B) {
	_, y := testYear120(b, 200, 0.6, 21)
	for _, strs := range []int{2, 3} {
		var sc evalScratch
		var inputs [][][]float64
		var grids [][]float64
		var in [][]int
		for k := range strs {
			in = append(in, modRange(20*k, 20*k+20))
		}
		for s := range y.steps {
			sc.gi = y.grid(s)
			if ns, same := y.stringSums(&sc, s, in, nil); ns == strs && !same {
				var vs [][]float64
				for _, v := range sc.sums[:ns] {
					vs = append(vs, slices.Clone(v))
				}
				inputs, grids = append(inputs, vs), append(grids, sc.gi)
			}
		}
		var m merger
		b.Run(fmt.Sprintf("strings=%d/walk=whole", strs), func(b *testing.B) {
			is := make([][]float64, strs)
			for b.Loop() {
				for j, vs := range inputs {
					for s := range is {
						is[s] = grids[j]
					}
					polyMaxFree(m.parallel(is, vs))
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(inputs)), "ns/input")
		})
		b.Run(fmt.Sprintf("strings=%d/walk=pruned", strs), func(b *testing.B) {
			for b.Loop() {
				for j, vs := range inputs {
					m.parallelMaxFree(grids[j], vs)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N*len(inputs)), "ns/input")
		})
	}
}

// addString adds a string's curves up, modules sharing a curve as count × curve and four
// curves a pass, to the same integers as adding the modules' curves one by one: strings of
// 1 to 25 modules (every remainder of the passes of four), of modules each with a curve of
// its own and of modules sharing curves.
func TestAddStringAsModuleSum(t *testing.T) {
	const n, np = 30, 40
	rng := rand.New(rand.NewPCG(12, 13))
	y := curveYear(rng, n, np, -1<<25) // module voltages of either sign, to ±32 V
	for _, tc := range []struct {
		name   string
		curves int // distinct curves among the n modules
	}{
		{"a curve a module", n},
		{"modules sharing curves", 4},
	} {
		t.Run(tc.name, func(t *testing.T) {
			for k := range n {
				y.modCurve[k] = int32(k % tc.curves)
			}
			var pr []curveCount
			for size := 1; size <= 25; size++ {
				str := rng.Perm(n)[:size]
				got := make([]int64, np)
				pr = y.addString(got, 0, str, pr)
				want := make([]int64, np)
				for _, k := range str {
					for p, x := range y.curve(y.modCurve[k], np) {
						want[p] += int64(x)
					}
				}
				if !slices.Equal(got, want) {
					t.Fatalf("string of %d modules: sums differ from the modules' curves added one by one", size)
				}
			}
		})
	}
}
