package electric

import (
	"fmt"
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
	if len(p) == 0 {
		return YearResult{}, badf("inverters", "a plant needs at least one inverter")
	}
	parts, err := p.Split(l)
	if err != nil {
		return YearResult{}, err
	}
	var sum YearResult
	for k, part := range parts {
		r, err := y.Evaluate(part, p[k], opt)
		if err != nil {
			return YearResult{}, fmt.Errorf("inverter %d: %w", k+1, err)
		}
		sum.add(r)
	}
	return sum, nil
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
}
