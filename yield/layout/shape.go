package layout

import (
	"cmp"
	"fmt"
	"iter"
	"slices"

	"sunstring/yield/electric"
)

// InputShape is how one inverter input is used: Strings strings in parallel, each of Length
// modules in series. The zero value is an unused input.
type InputShape struct {
	Strings, Length int
}

// Modules returns the number of modules the input takes.
func (s InputShape) Modules() int { return s.Strings * s.Length }

// Shape is a layout's form before modules are assigned to it: one InputShape per used input,
// larger inputs first. Inverter inputs are taken to be identical (one current limit, one
// window for all), so the order of inputs carries no meaning and shapes are compared as sorted
// lists.
type Shape []InputShape

// Modules returns the number of modules the shape takes.
func (sh Shape) Modules() int {
	n := 0
	for _, in := range sh {
		n += in.Modules()
	}
	return n
}

// Strings returns the number of strings.
func (sh Shape) Strings() int {
	n := 0
	for _, in := range sh {
		n += in.Strings
	}
	return n
}

// String formats the shape as its inputs' strings, e.g. "8 | 6" or "2×10 | 9".
func (sh Shape) String() string {
	s := ""
	for i, in := range sh {
		if i > 0 {
			s += " | "
		}
		if in.Strings > 1 {
			s += fmt.Sprintf("%d×%d", in.Strings, in.Length)
		} else {
			s += fmt.Sprintf("%d", in.Length)
		}
	}
	return s
}

// MaxShapes is the most shapes Shapes returns. The search starts from the first shapes only
// (a third of its budget of full-year evaluations, a few starts a shape), so a longer list
// would only cost memory: with a dozen inputs the complete list runs to millions.
const MaxShapes = 256

// Shapes lists the first MaxShapes shapes that wire between minModules and n modules into at
// most inputs inputs within the bounds (MinSeries..MaxSeries modules per string, at most
// MaxParallel equal strings per input), most modules first, then fewest strings, then most
// even string lengths. The order is the search's preference among equal energies: every
// module used, then the least wiring. A shape with no string is never listed. ShapeSeq gives
// the same order without the cap.
func Shapes(n, minModules, inputs int, b Bounds) []Shape {
	var out []Shape
	for sh := range ShapeSeq(n, minModules, inputs, b) {
		out = append(out, sh)
		if len(out) == MaxShapes {
			break
		}
	}
	return out
}

// AnyShape reports whether some shape wires between minModules and n modules into at most
// inputs inputs within the bounds.
func AnyShape(n, minModules, inputs int, b Bounds) bool {
	for range ShapeSeq(n, minModules, inputs, b) {
		return true
	}
	return false
}

// ShapeSeq yields the shapes of Shapes one at a time, in the same order and without a cap.
// It builds them lazily, fewest-wiring first, and prunes every partial shape that cannot
// reach the module and string count it is building towards, so taking the first few costs
// about the same for 2 inputs as for 12. A yielded shape is the caller's to keep.
func ShapeSeq(n, minModules, inputs int, b Bounds) iter.Seq[Shape] {
	return func(yield func(Shape) bool) {
		if n < 1 || inputs < 1 || b.MinSeries < 1 || b.MaxSeries < b.MinSeries || b.MaxParallel < 1 {
			return
		}
		e := newShapeEnum(inputs, b)
		top := min(n, inputs*b.MaxParallel*b.MaxSeries)
		for m := top; m >= max(minModules, 1); m-- {
			// With m modules: at least ⌈m/MaxSeries⌉ strings, at most m/MinSeries, and at most
			// MaxParallel an input.
			for s := (m + b.MaxSeries - 1) / b.MaxSeries; s <= min(m/b.MinSeries, inputs*b.MaxParallel); s++ {
				for d := 0; d <= b.MaxSeries-b.MinSeries; d++ {
					if !e.run(m, s, d, yield) {
						return
					}
				}
			}
		}
	}
}

// shapeEnum lists the shapes of exactly m modules, s strings and spread d in the order of
// their inputs' options (a depth-first walk over non-increasing options), which is the order
// the complete list kept among equal (modules, strings, spread).
type shapeEnum struct {
	opts     []InputShape // larger inputs first, then longer strings
	inputs   int
	b        Bounds
	cur      Shape
	stopped  bool
	m, s, d  int
	yieldFun func(Shape) bool
}

func newShapeEnum(inputs int, b Bounds) *shapeEnum {
	var opts []InputShape
	for p := b.MaxParallel; p >= 1; p-- {
		for l := b.MaxSeries; l >= b.MinSeries; l-- {
			opts = append(opts, InputShape{p, l})
		}
	}
	slices.SortStableFunc(opts, func(a, c InputShape) int {
		return cmp.Or(cmp.Compare(c.Modules(), a.Modules()), cmp.Compare(c.Length, a.Length))
	})
	return &shapeEnum{opts: opts, inputs: inputs, b: b, cur: make(Shape, 0, inputs)}
}

// run yields the shapes of (m, s, d); it returns false when the caller stopped.
func (e *shapeEnum) run(m, s, d int, yield func(Shape) bool) bool {
	e.m, e.s, e.d, e.yieldFun, e.stopped = m, s, d, yield, false
	e.cur = e.cur[:0]
	e.walk(0, 0, 0, e.b.MaxSeries+1, 0)
	return !e.stopped
}

// walk extends e.cur with options from index from on; used modules and strings so far, and
// the shortest and longest string (lo > hi while empty).
func (e *shapeEnum) walk(from, used, strs, lo, hi int) {
	remM, remS := e.m-used, e.s-strs
	if remM == 0 && remS == 0 {
		if hi-lo == e.d && !e.yieldFun(slices.Clone(e.cur)) {
			e.stopped = true
		}
		return
	}
	slots := e.inputs - len(e.cur)
	if remM <= 0 || remS <= 0 || slots == 0 || remS > slots*e.b.MaxParallel {
		return
	}
	for i := from; i < len(e.opts) && !e.stopped; i++ {
		o := e.opts[i]
		// Options are in non-increasing module order: if the largest allowed cannot fill the
		// rest in the slots left, no later one can.
		if o.Modules()*slots < remM {
			return
		}
		if o.Modules() > remM || o.Strings > remS {
			continue
		}
		nlo, nhi := min(lo, o.Length), max(hi, o.Length)
		if nhi-nlo > e.d {
			continue
		}
		// The remaining strings must have lengths within d of every string so far, and the
		// remaining modules must fit them.
		rm, rs := remM-o.Modules(), remS-o.Strings
		wlo, whi := max(nhi-e.d, e.b.MinSeries), min(nlo+e.d, e.b.MaxSeries)
		if rm < rs*wlo || rm > rs*whi {
			continue
		}
		e.cur = append(e.cur, o)
		e.walk(i, used+o.Modules(), strs+o.Strings, nlo, nhi)
		e.cur = e.cur[:len(e.cur)-1]
	}
}

// spread is the difference between the longest and the shortest string.
func spread(sh Shape) int {
	lo, hi := sh[0].Length, sh[0].Length
	for _, in := range sh {
		lo, hi = min(lo, in.Length), max(hi, in.Length)
	}
	return hi - lo
}

// slotsOf returns the shape's strings as (input, length) in order.
func slotsOf(sh Shape) (inputs, lengths []int) {
	for i, in := range sh {
		for range in.Strings {
			inputs = append(inputs, i)
			lengths = append(lengths, in.Length)
		}
	}
	return inputs, lengths
}

// build turns strings (in slot order) into a layout of the shape.
func build(sh Shape, strs [][]int) electric.Layout {
	l := electric.Layout{Inputs: make([][][]int, len(sh))}
	k := 0
	for i, in := range sh {
		for range in.Strings {
			l.Inputs[i] = append(l.Inputs[i], strs[k])
			k++
		}
	}
	return l
}

// FaceOrder wires the modules in the given order (the caller's roof order) into strings that
// each stay on one roof face, when some shape of the bounds allows it: every face's modules
// must split exactly into strings of the shape. Among such shapes it takes the first in the
// Shapes order (every module used, fewest strings, most even). ok is false when no shape
// keeps every string on one face; then the caller falls back to Sequential. face[i] is module
// i's face (any integer label).
func FaceOrder(order, face []int, inputs int, b Bounds) (l electric.Layout, ok bool) {
	n := len(order)
	count := map[int]int{}
	var faces []int // in order of first appearance
	for _, m := range order {
		if count[face[m]] == 0 {
			faces = append(faces, face[m])
		}
		count[face[m]]++
	}
	for _, sh := range Shapes(n, n, inputs, b) {
		_, lengths := slotsOf(sh)
		if len(lengths) < len(faces) {
			continue // a face needs at least one string of its own
		}
		rem := make([]int, len(faces))
		for i, f := range faces {
			rem[i] = count[f]
		}
		assign := make([]int, len(lengths))
		if !packFaces(lengths, rem, assign, 0) {
			continue
		}
		// Fill each face's strings with its modules in roof order.
		byFace := make([][]int, len(faces))
		idx := map[int]int{}
		for i, f := range faces {
			idx[f] = i
		}
		for _, m := range order {
			byFace[idx[face[m]]] = append(byFace[idx[face[m]]], m)
		}
		strs := make([][]int, len(lengths))
		for s, L := range lengths {
			f := assign[s]
			strs[s] = append([]int(nil), byFace[f][:L]...)
			byFace[f] = byFace[f][L:]
		}
		return build(sh, strs), true
	}
	return l, false
}

// packFaces assigns strings s.. to faces so that each face's remaining count reaches zero
// exactly (a small exact-cover search: the strings of a shape number a handful).
func packFaces(lengths, rem, assign []int, s int) bool {
	if s == len(lengths) {
		for _, r := range rem {
			if r != 0 {
				return false
			}
		}
		return true
	}
	tried := map[int]bool{}
	for f, r := range rem {
		if r < lengths[s] || tried[r] {
			continue
		}
		tried[r] = true // faces with the same remainder are interchangeable here
		rem[f] -= lengths[s]
		assign[s] = f
		if packFaces(lengths, rem, assign, s+1) {
			return true
		}
		rem[f] += lengths[s]
	}
	return false
}
