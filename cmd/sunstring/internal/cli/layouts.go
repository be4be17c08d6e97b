package cli

import (
	"fmt"
	"sort"
	"strings"

	"sunstring/yield"
	"sunstring/yield/electric"
	"sunstring/yield/layout"
)

// layouts evaluates the plain roof-order layout, the user's fixed layouts and (when asked)
// the searched ones, and returns them best first, at most layouts.keep of them plus every
// fixed layout.
func (p *project) layouts(m *yield.Model) ([]rankedLayout, error) {
	cfg := p.Cfg
	b, err := layout.StringBounds(p.Datasheet, p.Inverter, layout.Limits{
		LowTempC: cfg.Climate.LowTempC, HighTempC: cfg.Climate.HighTempC, MaxSystemVoltage: cfg.Module.MaxSystemVoltage,
	})
	if err != nil {
		return nil, inputError{fmt.Errorf("%s: module and inverter do not fit together: %w", cfg.File, err)}
	}
	index := make(map[string]int, len(p.Modules))
	order := make([]int, len(p.Modules))
	for i, mod := range p.Modules {
		index[mod.ID] = i
		order[i] = i
	}
	var out []rankedLayout
	eval := func(name string, l electric.Layout, note string) error {
		r, err := m.Evaluate(l, electric.EvalOptions{})
		if err != nil {
			return fmt.Errorf("layout %q: %w", name, err)
		}
		rl := rankedLayout{Name: name, Result: r, Note: note}
		for in, strs := range l.Inputs {
			for _, s := range strs {
				ids := make([]string, len(s))
				for k, i := range s {
					ids[k] = p.Modules[i].ID
				}
				rl.Strings = append(rl.Strings, ids)
				rl.Inputs = append(rl.Inputs, in+1)
			}
		}
		out = append(out, rl)
		return nil
	}
	seq, left, err := layout.Sequential(order, p.Inverter.Inputs, b)
	if err != nil {
		return nil, inputError{fmt.Errorf("%s: %w", cfg.File, err)}
	}
	note := "modules wired in roof order (face, row, column)"
	if left > 0 {
		note += fmt.Sprintf("; %d modules do not fit the inverter and are left out", left)
	}
	if err := eval("roof order", seq, note); err != nil {
		return nil, err
	}
	nFixed := 0
	for i, fl := range cfg.Layouts.Fixed {
		l, err := fixedLayout(cfg.File, i, fl.Name, fl.Strings, fl.Inputs, index, p.Inverter.Inputs, b)
		if err != nil {
			return nil, err
		}
		if err := eval(fl.Name, l, "drawn by the user"); err != nil {
			return nil, err
		}
		nFixed++
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].Result.ACkWh > out[j].Result.ACkWh })
	keep := int(cfg.Layouts.Keep)
	if keep < 1 {
		keep = 1
	}
	var kept []rankedLayout
	for i, l := range out {
		if i < keep || l.Note == "drawn by the user" {
			kept = append(kept, l)
		}
	}
	return kept, nil
}

// fixedLayout turns a user's layout of module ids into indices, and refuses one that breaks
// a limit: a fixed layout is never silently changed or used out of bounds.
func fixedLayout(file string, li int, name string, strs [][]string, inputs []float64, index map[string]int, nInputs int, b layout.Bounds) (electric.Layout, error) {
	var probs []string
	key := fmt.Sprintf("layouts.fixed[%d] (%q)", li, name)
	used := map[string]string{}
	l := electric.Layout{Inputs: make([][][]int, nInputs)}
	perInput := make([][]int, nInputs) // string lengths per input
	for si, s := range strs {
		in := si % nInputs
		if len(inputs) == len(strs) {
			in = int(inputs[si]) - 1
		}
		var idx []int
		for _, id := range s {
			k, ok := index[id]
			switch {
			case !ok:
				probs = append(probs, fmt.Sprintf("%s: %s.strings[%d]: module %q is not on the roof (ids are <face>.<row>.<column>, see modules.geojson or 'sunstring check')", file, key, si, id))
				continue
			case used[id] != "":
				probs = append(probs, fmt.Sprintf("%s: %s.strings[%d]: module %q is already in %s", file, key, si, id, used[id]))
				continue
			}
			used[id] = fmt.Sprintf("strings[%d]", si)
			idx = append(idx, k)
		}
		if n := len(s); n < b.MinSeries || n > b.MaxSeries {
			probs = append(probs, fmt.Sprintf("%s: %s.strings[%d]: %d modules in series; this module and inverter allow %d to %d (open-circuit %.1f V a module at the coldest, MPP %.1f V at the hottest)",
				file, key, si, n, b.MinSeries, b.MaxSeries, b.VocColdV, b.VmpHotV))
		}
		if in >= 0 && in < nInputs {
			l.Inputs[in] = append(l.Inputs[in], idx)
			perInput[in] = append(perInput[in], len(s))
		}
	}
	for in, lens := range perInput {
		if len(lens) > b.MaxParallel {
			probs = append(probs, fmt.Sprintf("%s: %s: input %d has %d strings in parallel; its current limit allows %d", file, key, in+1, len(lens), b.MaxParallel))
		}
		for _, n := range lens {
			if n != lens[0] {
				probs = append(probs, fmt.Sprintf("%s: %s: input %d has parallel strings of %v modules; strings in parallel must be of equal length", file, key, in+1, lens))
				break
			}
		}
	}
	if len(probs) > 0 {
		return l, inputError{fmt.Errorf("%s", strings.Join(probs, "\n"))}
	}
	return l, nil
}
