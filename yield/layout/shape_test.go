package layout

import (
	"cmp"
	"fmt"
	"math/rand/v2"
	"slices"
	"testing"
)

// allShapes is the plain definition of Shapes: every multiset of input options within the
// bounds, sorted by modules (descending), strings, spread, and otherwise in the order of a
// depth-first walk over non-increasing options. It is exponential in the inputs; the tests
// hold the lazy enumeration to it on small cases.
func allShapes(n, minModules, inputs int, b Bounds) []Shape {
	minModules = max(minModules, 1)
	var opts []InputShape
	for p := b.MaxParallel; p >= 1; p-- {
		for l := b.MaxSeries; l >= b.MinSeries; l-- {
			opts = append(opts, InputShape{p, l})
		}
	}
	slices.SortStableFunc(opts, func(a, c InputShape) int {
		return cmp.Or(cmp.Compare(c.Modules(), a.Modules()), cmp.Compare(c.Length, a.Length))
	})
	var out []Shape
	cur := make(Shape, 0, inputs)
	var rec func(from, used int)
	rec = func(from, used int) {
		if used >= minModules && len(cur) > 0 {
			out = append(out, slices.Clone(cur))
		}
		if len(cur) == inputs {
			return
		}
		for i := from; i < len(opts); i++ {
			if used+opts[i].Modules() > n {
				continue
			}
			cur = append(cur, opts[i])
			rec(i, used+opts[i].Modules())
			cur = cur[:len(cur)-1]
		}
	}
	rec(0, 0)
	slices.SortStableFunc(out, func(a, c Shape) int {
		return cmp.Or(cmp.Compare(c.Modules(), a.Modules()), cmp.Compare(a.Strings(), c.Strings()), cmp.Compare(spread(a), spread(c)))
	})
	return out
}

// TestShapeSeqMatchesDefinition holds the lazy enumeration to the plain definition, shape by
// shape and in order, on seeded small bounds (a property over 300 cases).
func TestShapeSeqMatchesDefinition(t *testing.T) {
	r := rand.New(rand.NewPCG(16, 3))
	for k := range 300 {
		b := Bounds{MinSeries: 1 + r.IntN(6), MaxParallel: 1 + r.IntN(3)}
		b.MaxSeries = b.MinSeries + r.IntN(8)
		inputs := 1 + r.IntN(4)
		n := 1 + r.IntN(inputs*b.MaxParallel*b.MaxSeries+5)
		minMods := n - r.IntN(n/3+1)
		want := allShapes(n, minMods, inputs, b)
		var got []Shape
		for sh := range ShapeSeq(n, minMods, inputs, b) {
			got = append(got, sh)
		}
		if len(got) != len(want) {
			t.Fatalf("case %d (n %d, min %d, %d inputs, %+v): %d shapes, want %d", k, n, minMods, inputs, b, len(got), len(want))
		}
		for i := range want {
			if !slices.Equal(got[i], want[i]) {
				t.Fatalf("case %d (n %d, min %d, %d inputs, %+v): shape %d is %v, want %v", k, n, minMods, inputs, b, i, got[i], want[i])
			}
		}
		if AnyShape(n, minMods, inputs, b) != (len(want) > 0) {
			t.Fatalf("case %d: AnyShape %v with %d shapes", k, !(len(want) > 0), len(want))
		}
		capped := Shapes(n, minMods, inputs, b)
		if len(capped) != min(len(want), MaxShapes) {
			t.Fatalf("case %d: Shapes gave %d, want %d", k, len(capped), min(len(want), MaxShapes))
		}
	}
}

// TestShapesManyInputs: with a dozen inputs the list still starts with the best shapes (every
// module used, fewest strings, most even) and stops at the cap. Strings of 8 to 23, two an
// input (hand calculation): 437 = 19 × 23, so nineteen strings of 23, nine inputs doubled;
// 430 needs 19 strings too (⌈430/23⌉), as even as possible: 12 × 23 + 7 × 22, spread 1.
func TestShapesManyInputs(t *testing.T) {
	b := Bounds{MinSeries: 8, MaxSeries: 23, MaxParallel: 2}
	for _, c := range []struct {
		name          string
		n, inputs     int
		strings, sprd int
	}{
		{"437 modules, 10 inputs", 437, 10, 19, 0},
		{"437 modules, 12 inputs", 437, 12, 19, 0},
		{"430 modules, 12 inputs", 430, 12, 19, 1},
	} {
		t.Run(c.name, func(t *testing.T) {
			shapes := Shapes(c.n, c.n-c.n/4, c.inputs, b)
			if len(shapes) != MaxShapes {
				t.Fatalf("%d shapes, want the cap %d", len(shapes), MaxShapes)
			}
			sh := shapes[0]
			if sh.Modules() != c.n || sh.Strings() != c.strings || spread(sh) != c.sprd {
				t.Errorf("first shape %v: %d modules, %d strings, spread %d; want %d, %d, %d",
					sh, sh.Modules(), sh.Strings(), spread(sh), c.n, c.strings, c.sprd)
			}
		})
	}
}

// BenchmarkShapes lists the capped shapes of the large roof (437 modules, strings of 8 to 23,
// two an input, a quarter of the modules may be left out) for 2 to 12 inputs.
func BenchmarkShapes(b *testing.B) {
	bd := Bounds{MinSeries: 8, MaxSeries: 23, MaxParallel: 2}
	for _, inputs := range []int{2, 6, 10, 12} {
		b.Run(fmt.Sprintf("inputs=%d", inputs), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				Shapes(437, 437-437/4, inputs, bd)
			}
		})
	}
}
