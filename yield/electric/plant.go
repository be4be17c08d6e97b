package electric

import (
	"fmt"
	"math"
	"slices"
)

// Plant is several inverters side by side. Each has its own inputs, window, current limit and
// AC limit: one inverter clips at its own limit while another has room to spare, so a plant
// is not one large inverter.
type Plant []Inverter

// Identical returns a plant of count inverters of one model.
func Identical(inv Inverter, count int) Plant {
	p := make(Plant, max(count, 0))
	for i := range p {
		p[i] = inv
	}
	return p
}

// Inputs returns the number of inputs of all the plant's inverters together.
func (p Plant) Inputs() int {
	n := 0
	for _, inv := range p {
		n += inv.Inputs
	}
	return n
}

// Split hands a layout over the plant's inputs, numbered across the inverters in order (the
// first inverter's inputs first), to the inverters: one layout each, input i of inverter k
// being input Inputs(0..k−1)+i of l. Inputs beyond l's are left unused. A layout search can
// thus place strings on the plant's inputs as on one inverter's and evaluate each inverter
// on its own.
func (p Plant) Split(l Layout) ([]Layout, error) {
	if len(l.Inputs) > p.Inputs() {
		return nil, badf("layout.inputs", "%d inputs, the %d inverters have %d", len(l.Inputs), len(p), p.Inputs())
	}
	out := make([]Layout, len(p))
	at := 0
	for k, inv := range p {
		end := min(at+inv.Inputs, len(l.Inputs))
		if at < end {
			out[k].Inputs = slices.Clone(l.Inputs[at:end])
		}
		at = end
	}
	return out, nil
}

// EvaluatePlant returns the year's energy of a layout over the plant's inputs (see Split):
// each inverter is evaluated on its own strings and clips at its own AC limit, and the
// results are added step by step. Every inverter counts its night consumption, even one
// with no string.
func (y *Year) EvaluatePlant(l Layout, p Plant, opt EvalOptions) (YearResult, error) {
	return y.EvaluatePlantCached(l, p, opt, nil)
}

// EvaluatePlantCached is EvaluatePlant through a cache of the inputs' shares of the year (see
// EvaluateCached); the inverters share it, since an input's share does not depend on the AC
// stage. A plant of one inverter gives Evaluate's result to the bit. Modules with converters
// of their own (EvalOptions.ConvertersOn) feed the inverter with the fewest modules in strings
// per watt of AC power (the first of equal ones): where a designer would connect them.
func (y *Year) EvaluatePlantCached(l Layout, p Plant, opt EvalOptions, c *EvalCache) (YearResult, error) {
	if len(p) == 0 {
		return YearResult{}, badf("inverters", "a plant needs at least one inverter")
	}
	if len(p) == 1 {
		return y.EvaluateCached(l, p[0], opt, c)
	}
	// Each inverter checks its own inputs; a module wired to two inverters, or both wired and
	// on a converter of its own, is caught over the whole layout.
	if err := y.CheckLayout(l, Inverter{Inputs: p.Inputs()}); err != nil {
		return YearResult{}, err
	}
	if err := y.checkConverters(l, opt.ConvertersOn); err != nil {
		return YearResult{}, err
	}
	parts, err := p.Split(l)
	if err != nil {
		return YearResult{}, err
	}
	conv := p.lightest(parts)
	var sum YearResult
	for k, part := range parts {
		o := opt
		if k != conv {
			o.ConvertersOn = nil
		}
		r, err := y.EvaluateCached(part, p[k], o, c)
		if err != nil {
			return YearResult{}, fmt.Errorf("inverter %d: %w", k+1, err)
		}
		sum.add(r)
	}
	return sum, nil
}

// lightest returns the inverter whose strings hold the fewest modules per watt of AC power,
// the first of equal ones.
func (p Plant) lightest(parts []Layout) int {
	best, bestLoad := 0, math.Inf(1)
	for k, part := range parts {
		if load := float64(modules(part)) / p[k].ACPowerW; load < bestLoad {
			best, bestLoad = k, load
		}
	}
	return best
}

// modules counts a layout's modules.
func modules(l Layout) int {
	n := 0
	for _, in := range l.Inputs {
		for _, s := range in {
			n += len(s)
		}
	}
	return n
}

// Deal places a layout's inputs, in any order, on the plant's inverters so that each carries
// as nearly the same number of modules per watt of AC power as whole inputs allow: the
// inputs with the most modules first, each to the inverter least loaded so far that has an
// input free (the first of equal ones), the largest-first rule for balancing loads (Graham
// 1969, SIAM J. Appl. Math. 17(2):416–429; from memory). Balanced inverters clip least on a
// roof of one orientation. It returns the layout in the plant's order of inputs (see Split),
// one entry per input of the plant, empty where no string is wired. The result depends only
// on which strings share an input, not on the order of inputs, so that a layout search may
// treat the plant's inputs as interchangeable. A plant of one inverter, or a layout with more
// (non-empty) inputs than the plant, is returned as it is.
func (p Plant) Deal(l Layout) Layout {
	used := 0
	for _, in := range l.Inputs {
		if len(in) > 0 {
			used++
		}
	}
	if len(p) <= 1 || used > p.Inputs() {
		return l
	}
	type input struct {
		strs [][]int
		n    int
		key  []int // the input's modules sorted: disjoint inputs never tie
	}
	var ins []input
	for _, in := range l.Inputs {
		if len(in) == 0 {
			continue
		}
		x := input{strs: in}
		for _, s := range in {
			x.n += len(s)
			x.key = append(x.key, s...)
		}
		slices.Sort(x.key)
		ins = append(ins, x)
	}
	slices.SortFunc(ins, func(a, b input) int {
		if a.n != b.n {
			return b.n - a.n
		}
		return slices.Compare(a.key, b.key)
	})
	load := make([]int, len(p))
	on := make([][][][]int, len(p))
	for _, x := range ins {
		best := -1
		for k, inv := range p {
			if len(on[k]) == inv.Inputs {
				continue
			}
			// Fewest modules per watt: a·AC_b < b·AC_a without division.
			if best < 0 || float64(load[k])*p[best].ACPowerW < float64(load[best])*inv.ACPowerW {
				best = k
			}
		}
		load[best] += x.n
		on[best] = append(on[best], x.strs)
	}
	out := Layout{Inputs: make([][][]int, 0, p.Inputs())}
	for k, inv := range p {
		out.Inputs = append(out.Inputs, on[k]...)
		for range inv.Inputs - len(on[k]) {
			out.Inputs = append(out.Inputs, nil)
		}
	}
	return out
}

// Locate returns the inverter (0-based) and its input (0-based) of input i of the plant's
// order (see Split); i beyond the plant's inputs gives the last inverter.
func (p Plant) Locate(i int) (inverter, input int) {
	for k, inv := range p {
		if i < inv.Inputs || k == len(p)-1 {
			return k, i
		}
		i -= inv.Inputs
	}
	return 0, i
}

// add sums r into a, step energies step by step.
func (a *YearResult) add(r YearResult) {
	a.DCWh += r.DCWh
	a.ACWh += r.ACWh
	a.ClippedWh += r.ClippedWh
	a.GlobalDCWh += r.GlobalDCWh
	a.WindowLossWh += r.WindowLossWh
	a.CurrentLimitLossWh += r.CurrentLimitLossWh
	a.TrackerLossWh += r.TrackerLossWh
	a.NightWh += r.NightWh
	a.UnshadedDCWh += r.UnshadedDCWh
	a.UnshadedACWh += r.UnshadedACWh
	if a.StepACWh == nil {
		a.StepACWh = make([]float64, len(r.StepACWh))
	}
	for s, e := range r.StepACWh {
		a.StepACWh[s] += e
	}
	if a.StepDCWh == nil {
		a.StepDCWh = make([]float64, len(r.StepDCWh))
	}
	for s, e := range r.StepDCWh {
		a.StepDCWh[s] += e
	}
}
