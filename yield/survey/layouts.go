package survey

import (
	"context"
	"fmt"
	"slices"
	"sort"
	"strings"
	"sunstring/yield"
	"sunstring/yield/electric"
	"sunstring/yield/layout"
)

// layouts evaluates the roof-order layout, the user's fixed layouts and (when layouts.search
// is on) the searched ones and layouts of other structure built from the best (strings on
// their faces, the shaded modules together or spread, strings on other inputs) on the same
// footing, and returns them best first by annual AC energy less the weighed extra cable: at
// most layouts.keep of them plus every fixed layout. Searched layouts and variants are named
// from their structure (describe); of those with the same description only the best is
// kept, so the ranking shows layouts that differ in structure rather than copies that differ
// by a module. It also sets the advice: which of the layouts equivalent to the best to wire,
// and why.
func (p *Project) layouts(ctx context.Context, m *yield.Model) ([]RankedLayout, error) {
	cfg := p.Cfg
	if err := p.prepareLayouts(); err != nil {
		return nil, err
	}
	b := p.bounds
	n := len(p.Modules)
	order := make([]int, n)
	pos := make([]layout.Point, n)
	reach := 0.0
	for i, mod := range p.Modules {
		order[i] = i
		c := mod.Center()
		pos[i] = layout.Point{X: c.E, Y: c.N, Z: c.U}
		// Neighbours' leads reach about one module length (common practice); 5 % slack so
		// that modules side by side or one above the other need no extra cable.
		reach = max(reach, 1.05*max(mod.LengthM, mod.WidthM))
	}
	weightWh := cfg.Layouts.CableWeight * 1000
	var out []RankedLayout
	seen := map[string]bool{}
	firstName := map[string]string{} // a layout's key → the name it was first listed under
	names := map[string]bool{}
	// The listed layouts share many strings (a variant changes a few of the best's), so their
	// evaluations go through one cache.
	cache := p.evalCache()
	plant := p.Plant()
	// eval ranks a layout. The user's fixed layouts say which inverter each string is on;
	// every other layout's inputs are dealt to the inverters as the search's evaluator deals
	// them (electric.Plant.Deal), so that the energy is the one the search ranked.
	eval := func(name string, l electric.Layout, note string) error {
		if !strings.HasPrefix(note, userNote) {
			l = plant.Deal(l)
		}
		// A user's layout may repeat the roof order or another user's layout: it is still
		// listed under its own name, and says so, so that two names for one wiring do not read
		// as two choices.
		if first, ok := firstName[layoutKey(l)]; ok {
			note += fmt.Sprintf("; the same strings as %q", first)
		} else {
			firstName[layoutKey(l)] = name
		}
		r, err := m.EvaluateCached(l, electric.EvalOptions{}, cache)
		if err != nil {
			return fmt.Errorf("layout %q: %w", name, err)
		}
		rl := RankedLayout{Name: name, Result: r, Note: note, CableM: layout.ExtraCableM(l, pos, reach)}
		for in, strs := range l.Inputs {
			inv, at := plant.Locate(in)
			for _, s := range strs {
				s = layout.Chain(s, pos)
				ids := make([]string, len(s))
				for k, i := range s {
					ids[k] = p.Modules[i].ID
				}
				rl.Strings = append(rl.Strings, ids)
				rl.Inverters = append(rl.Inverters, inv+1)
				rl.Inputs = append(rl.Inputs, at+1)
			}
		}
		seen[layoutKey(l)] = true
		names[name] = true
		out = append(out, rl)
		return nil
	}
	seq, note, err := p.roofOrder()
	if err != nil {
		return nil, err
	}
	if err := eval(roofOrderName, seq, note); err != nil {
		return nil, err
	}
	for i, fl := range cfg.Layouts.Fixed {
		if err := eval(fl.Name, p.fixed[i], userNote); err != nil {
			return nil, err
		}
	}
	shaded := shadedSet(m)
	// named evaluates a searched layout or a variant under its structural name, unless the
	// layout or a better one of the same structure is listed already.
	named := func(l electric.Layout, note string) error {
		if seen[layoutKey(l)] {
			return nil
		}
		name := p.describe(l, shaded)
		if names[name] {
			return nil // the same structure, already listed with more energy (or the user's name)
		}
		return eval(name, l, note)
	}
	keep := max(int(cfg.Layouts.Keep), 1)
	var res layout.Result
	if cfg.Layouts.Search {
		prog := func(done, total int) {}
		if m.In.Progress != nil {
			prog = func(done, total int) { m.In.Progress("layout search", done, total) }
		}
		faces := make([]int, n)
		faceNo := map[string]int{}
		for i, mod := range p.Modules {
			if _, ok := faceNo[mod.Face]; !ok {
				faceNo[mod.Face] = len(faceNo)
			}
			faces[i] = faceNo[mod.Face]
		}
		res, err = layout.Search(ctx, layout.Problem{
			Features: layout.ShadeFeatures(m), Positions: pos, ReachM: reach, Bounds: b, Faces: faces,
			Inputs: p.inputs(), Order: order, Starts: append([]electric.Layout{seq}, p.fixed...),
		}, layout.ModelEvaluatorCached(m, electric.EvalOptions{}, cache), layout.Options{
			CableWeightWh: weightWh, Keep: 40, Progress: prog, LeaveOut: cfg.Layouts.LeaveOut,
			Screen: layout.ModelScreen(m, electric.EvalOptions{}, screenStride, cache), ScreenCost: screenStride, MaxEvals: searchBudget,
		})
		if err != nil {
			return nil, fmt.Errorf("layout search: %w", err)
		}
		cands := res.Candidates
		if len(cands) > 0 && layoutKey(cands[0].Layout) == layoutKey(seq) {
			out[0].Note += "; the layout search found none better"
		}
		how := fmt.Sprintf("found by the layout search (%d layouts evaluated over the whole year", res.Evaluated)
		if res.Screened > 0 {
			how = fmt.Sprintf("found by the layout search (%d layouts screened on a quarter of the year, the %d most promising evaluated over the whole year",
				res.Screened, res.Evaluated)
		}
		if res.Exhaustive {
			how += ", every layout the inverter allows"
		}
		how += ")"
		// The other candidates, the variants and the alternatives change a few of the best
		// layout's strings: they read its strings' years instead of adding their own up.
		if len(cands) > 0 {
			m.KeepStrings(cands[0].Layout, cache)
		}
		listed := len(out)
		for _, c := range cands {
			// The search's values rank the candidates; names are given best first, so the
			// best of each structure keeps the name. Only the best keep structures can make
			// the ranking.
			if len(out)-listed >= keep {
				break
			}
			if err := named(c.Layout, how); err != nil {
				return nil, err
			}
		}
		base := seq
		if len(cands) > 0 {
			base = cands[0].Layout
		}
		for _, l := range p.variants(base, order, shaded) {
			if err := named(l, "built from the best layout by changing its structure"); err != nil {
				return nil, err
			}
		}
	}
	score := func(l RankedLayout) float64 { return l.Result.ACkWh - cfg.Layouts.CableWeight*l.CableM }
	sort.SliceStable(out, func(i, j int) bool { return score(out[i]) > score(out[j]) })
	var kept []RankedLayout
	for i, l := range out {
		if i < keep || strings.HasPrefix(l.Note, userNote) {
			kept = append(kept, l)
		}
	}
	p.advice = p.advise(m, kept, shaded, res)
	return kept, nil
}

// screenStride thins the year the layout search screens layouts on: every fourth sun-up step,
// a quarter of the cost. The screen decides only which layouts are evaluated on the whole year;
// on the example and the hall roof its estimate of the difference between two layouts is
// within a few tenths of a percent of the year's energy of the whole year's (see the layout
// package's screening test).
const screenStride = 4

// searchBudget is the search's budget at each level of freedom, in whole-year evaluations
// (four screens count as one): 800 layouts screened and the most promising evaluated, more
// layouts looked at than 400 whole-year evaluations used to see, at half their cost.
const searchBudget = 200

// roofOrderName names the plain layout in the ranking; userNote marks the user's layouts,
// which are always reported.
const (
	roofOrderName = "roof order"
	userNote      = "drawn by the user"
)

// layoutKey identifies a layout whatever the order of modules, strings and inputs.
func layoutKey(l electric.Layout) string {
	var ins []string
	for _, in := range l.Inputs {
		var strs []string
		for _, s := range in {
			s = slices.Clone(s)
			slices.Sort(s)
			strs = append(strs, fmt.Sprint(s))
		}
		slices.Sort(strs)
		ins = append(ins, strings.Join(strs, "/"))
	}
	slices.Sort(ins)
	return strings.Join(ins, "|")
}

// roofOrder is the plain layout: modules wired in roof order (face, row, column), strings that
// stay on one face when the bounds allow it, else straight through the roof order. note says
// which, and how many modules the inverter cannot take.
func (p *Project) roofOrder() (electric.Layout, string, error) {
	if err := p.prepareLayouts(); err != nil {
		return electric.Layout{}, "", err
	}
	n := len(p.Modules)
	order := make([]int, n)
	face := make([]int, n)
	faceNo := map[string]int{}
	for i, mod := range p.Modules {
		order[i] = i
		if _, ok := faceNo[mod.Face]; !ok {
			faceNo[mod.Face] = len(faceNo)
		}
		face[i] = faceNo[mod.Face]
	}
	seq, onFaces := layout.FaceOrder(order, face, p.inputs(), p.bounds)
	if onFaces {
		return seq, "modules wired in roof order (face, row, column), each string on one roof face", nil
	}
	seq, left, err := layout.Sequential(order, p.inputs(), p.bounds)
	if err != nil {
		return seq, "", badInput{fmt.Errorf("%s: %w", p.Cfg.File, err)}
	}
	note := "modules wired in roof order (face, row, column)"
	if len(faceNo) > 1 {
		note += "; no string length lets every string stay on one face"
	}
	if left > 0 {
		note += fmt.Sprintf("; %d modules do not fit the inverter and are left out", left)
	}
	return seq, note, nil
}

// prepareLayouts finds the string bounds of the module and inverter and checks the user's fixed
// layouts against them, before any long computation: a fixed layout that breaks a limit is an
// input error, never silently used.
func (p *Project) prepareLayouts() error {
	if p.fixed != nil || p.boundsOK {
		return nil
	}
	cfg := p.Cfg
	b, err := layout.StringBounds(p.Datasheet, p.Inverter, layout.Limits{
		LowTempC: cfg.Climate.LowTempC, HighTempC: cfg.Climate.HighTempC, MaxSystemVoltage: cfg.Module.MaxSystemVoltage,
		Mounting: p.Mounting(),
	})
	if err != nil {
		return badInput{fmt.Errorf("%s: module and inverter do not fit together: %w", cfg.File, err)}
	}
	// Some layout must take the modules (all of them, unless modules may be left out or the
	// inverter cannot take them all), or the long run would end in nothing to report.
	n := len(p.Modules)
	capacity := p.inputs() * b.MaxParallel * b.MaxSeries
	minMods := n
	if cfg.Layouts.LeaveOut || capacity < n {
		minMods = min(n, capacity) - n/4
	}
	if n > 0 && len(layout.Shapes(n, minMods, p.inputs(), b)) == 0 {
		return badInput{fmt.Errorf("%s: no string layout takes the %d modules: strings of %d to %d modules (from inverter.max_dc_voltage_v, inverter.mppt_min_v and inverter.mppt_max_v at climate.low_temp_c and climate.high_temp_c), at most %d in parallel (inverter.max_input_current_a), %s (inverter.count, inverter.inputs); change the inverter or their number, or allow layouts.leave_out",
			cfg.File, n, b.MinSeries, b.MaxSeries, b.MaxParallel, p.inputsText())}
	}
	index := make(map[string]int, len(p.Modules))
	for i, mod := range p.Modules {
		index[mod.ID] = i
	}
	var fixed []electric.Layout
	var probs []string
	for i, fl := range cfg.Layouts.Fixed {
		l, err := fixedLayout(cfg.File, i, fl, index, p.Inverters(), p.Inverter.Inputs, b)
		if err != nil {
			probs = append(probs, err.Error())
			continue
		}
		fixed = append(fixed, l)
	}
	if len(probs) > 0 {
		return badInput{fmt.Errorf("%s", strings.Join(probs, "\n"))}
	}
	p.bounds, p.fixed, p.boundsOK = b, fixed, true
	return nil
}

// fixedLayout turns a user's layout of module ids into indices, its inputs the plant's in
// order (inverter by inverter, electric.Plant.Split), and refuses one that breaks a limit: a
// fixed layout is never silently changed or used out of bounds. Strings without inputs are
// spread over the inverters in turn, then over each inverter's inputs.
func fixedLayout(file string, li int, fl FixedLayout, index map[string]int, inverters, perInv int, b layout.Bounds) (electric.Layout, error) {
	var probs []string
	name, strs, inputs := fl.Name, fl.Strings, fl.Inputs
	key := fmt.Sprintf("layouts.fixed[%d] (%q)", li, name)
	used := map[string]string{}
	nInputs := inverters * perInv
	l := electric.Layout{Inputs: make([][][]int, nInputs)}
	perInput := make([][]int, nInputs) // string lengths per input
	for si, s := range strs {
		inv, in := si%inverters, (si/inverters)%perInv
		if len(fl.Inverters) == len(strs) {
			inv = int(fl.Inverters[si]) - 1
		}
		if len(inputs) == len(strs) {
			in = int(inputs[si]) - 1
		}
		in += inv * perInv
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
		where := fmt.Sprintf("input %d", in%perInv+1)
		if inverters > 1 {
			where = fmt.Sprintf("inverter %d, %s", in/perInv+1, where)
		}
		if len(lens) > b.MaxParallel {
			probs = append(probs, fmt.Sprintf("%s: %s: %s has %d strings in parallel; its current limit allows %d", file, key, where, len(lens), b.MaxParallel))
		}
		for _, n := range lens {
			if n != lens[0] {
				probs = append(probs, fmt.Sprintf("%s: %s: %s has parallel strings of %v modules; strings in parallel must be of equal length", file, key, where, lens))
				break
			}
		}
	}
	if len(probs) > 0 {
		return l, badInput{fmt.Errorf("%s", strings.Join(probs, "\n"))}
	}
	return l, nil
}
