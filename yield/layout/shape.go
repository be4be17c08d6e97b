package layout

import (
	"cmp"
	"fmt"
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

// Shapes lists every shape that wires between minModules and n modules into at most inputs
// inputs within the bounds (MinSeries..MaxSeries modules per string, at most MaxParallel equal
// strings per input), most modules first, then fewest strings, then most even string lengths.
// The order is the search's preference among equal energies: every module used, then the
// least wiring. A shape with no string is never listed.
func Shapes(n, minModules, inputs int, b Bounds) []Shape {
	if n < 1 || inputs < 1 || b.MinSeries < 1 || b.MaxSeries < b.MinSeries || b.MaxParallel < 1 {
		return nil
	}
	minModules = max(minModules, 1)
	var opts []InputShape // per input, ordered so that generated lists come out sorted
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
	// Inputs are generated in non-increasing option order, so each multiset of inputs appears
	// once.
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
		return cmp.Or(
			cmp.Compare(c.Modules(), a.Modules()),
			cmp.Compare(a.Strings(), c.Strings()),
			cmp.Compare(spread(a), spread(c)),
		)
	})
	return out
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
