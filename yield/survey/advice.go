package survey

import (
	"cmp"
	"fmt"
	"slices"
	"strings"
	"time"

	"sunstring/yield"
	"sunstring/yield/electric"
	"sunstring/yield/layout"
	"sunstring/yield/report"
)

// EquivalenceMarginPct is how close (percent of the best layout's annual energy) a layout
// must come to the best to count as equivalent. The electrical model reads a string's
// maximum power from a polyline of its I-V curve within 0.1 % of the exact single-diode
// value, evenly lit or with a partly shaded cell (points around the bypass diodes' knees), and
// strings of unequal length in parallel read up to 0.4 % low (electric.Curve):
// two layouts closer than about half a percent are not told apart reliably by the model,
// whatever the yield's absolute uncertainty. Among equivalent layouts the advice chooses by
// wiring convenience.
const EquivalenceMarginPct = 0.5

// shadedSet returns the modules that drive the shade loss, most shaded first: down to half
// the worst module's loss and above 3 % of its irradiation (below that, shade is a nuisance
// rather than a driver), at most 8.
func shadedSet(m *yield.Model) []int {
	idx := make([]int, len(m.Stats))
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int { return cmp.Compare(m.Stats[b].ShadeLossPct, m.Stats[a].ShadeLossPct) })
	var out []int
	for _, i := range idx {
		l := m.Stats[i].ShadeLossPct
		if len(out) == 8 || l < 3 || l < m.Stats[idx[0]].ShadeLossPct/2 {
			break
		}
		out = append(out, i)
	}
	return out
}

// variants builds layouts that differ from base in structure, each a plain idea a surveyor
// would try: strings kept on their roof faces, the shaded modules together on one string,
// the shaded modules spread over the parallel strings of one input, and the strings moved to
// other inputs. Layouts outside the bounds are not returned.
func (p *Project) variants(base electric.Layout, order []int, shaded []int) []electric.Layout {
	var out []electric.Layout
	add := func(l electric.Layout) {
		if p.fits(l) {
			out = append(out, l)
		}
	}
	n := len(p.Modules)
	face := make([]int, n)
	faceNo := map[string]int{}
	for i, mod := range p.Modules {
		if _, ok := faceNo[mod.Face]; !ok {
			faceNo[mod.Face] = len(faceNo)
		}
		face[i] = faceNo[mod.Face]
	}
	if l, ok := layout.FaceOrder(order, face, p.inputs(), p.bounds); ok {
		add(l)
	}
	// Fill base's string slots in a given order of modules.
	fill := func(first []int) electric.Layout {
		used := map[int]bool{}
		seq := slices.Clone(first)
		for _, k := range first {
			used[k] = true
		}
		conn := map[int]bool{}
		for _, in := range base.Inputs {
			for _, s := range in {
				for _, k := range s {
					conn[k] = true
				}
			}
		}
		for _, k := range order {
			if !used[k] && conn[k] {
				seq = append(seq, k)
			}
		}
		l := electric.Layout{Inputs: make([][][]int, len(base.Inputs))}
		for a, in := range base.Inputs {
			for _, s := range in {
				l.Inputs[a] = append(l.Inputs[a], slices.Clone(seq[:len(s)]))
				seq = seq[len(s):]
			}
		}
		return l
	}
	if len(shaded) >= 2 {
		// Together: the shaded modules first, so they fill one string (the first slot).
		conn := connected(base)
		var sh []int
		for _, k := range shaded {
			if conn[k] {
				sh = append(sh, k)
			}
		}
		add(fill(sh))
		// Spread: over the parallel strings of the input that has most.
		for a, in := range base.Inputs {
			if len(in) < 2 {
				continue
			}
			l := fill(nil)
			var others []int
			for _, s := range l.Inputs[a] {
				others = append(others, s...)
			}
			var rest []int
			for _, k := range others {
				if !slices.Contains(sh, k) {
					rest = append(rest, k)
				}
			}
			// Deal the shaded ones round robin, then the rest, over the input's strings.
			deal := append(slices.Clone(sh), rest...)
			if len(deal) != len(others) {
				break // some shaded modules are on other inputs: skip
			}
			ns := len(l.Inputs[a])
			L := len(l.Inputs[a][0])
			strs := make([][]int, ns)
			for i, k := range deal {
				strs[i%ns] = append(strs[i%ns], k)
			}
			ok := true
			for _, s := range strs {
				ok = ok && len(s) == L
			}
			if ok {
				l.Inputs[a] = strs
				add(l)
			}
			break
		}
	}
	// A shaded row on its own string (the eave row in a neighbour's winter shadow, say): the
	// row takes a string slot of its length, the other modules fill the rest in roof order.
	// The first two such rows, in roof order.
	if len(shaded) >= 1 {
		conn := connected(base)
		isShaded := map[int]bool{}
		for _, k := range shaded {
			isShaded[k] = true
		}
		type rowKey struct {
			face string
			row  int
		}
		var keys []rowKey
		rows := map[rowKey][]int{}
		for _, k := range order {
			if !conn[k] {
				continue
			}
			rk := rowKey{p.Modules[k].Face, p.Modules[k].Row}
			if _, ok := rows[rk]; !ok {
				keys = append(keys, rk)
			}
			rows[rk] = append(rows[rk], k)
		}
		tried := 0
		for _, rk := range keys {
			row := rows[rk]
			if tried == 2 || !slices.ContainsFunc(row, func(k int) bool { return isShaded[k] }) {
				continue
			}
			l, ok := ownString(base, order, row, conn)
			if !ok && p.inputs() >= 2 {
				// No slot of the row's length: the row on an input of its own, the other
				// modules over the other inputs.
				var rest []int
				for _, k := range order {
					if conn[k] && !slices.Contains(row, k) {
						rest = append(rest, k)
					}
				}
				if r, left, err := layout.Sequential(rest, p.inputs()-1, p.bounds); err == nil && left == 0 {
					l, ok = electric.Layout{Inputs: append(r.Inputs, [][]int{slices.Clone(row)})}, true
				}
			}
			if ok && p.fits(l) {
				add(l)
				tried++
			}
		}
	}
	// Strings moved to other inputs: an input's parallel strings split onto free inputs, or
	// two single strings of equal length joined on one input.
	free := p.inputs() - countInputs(base)
	for a, in := range base.Inputs {
		if len(in) >= 2 && free > 0 {
			l := cloneLayout(base)
			l.Inputs[a] = l.Inputs[a][:len(in)-1]
			l.Inputs = append(l.Inputs, [][]int{slices.Clone(in[len(in)-1])})
			add(l)
			break
		}
	}
	for a := range base.Inputs {
		for b := a + 1; b < len(base.Inputs); b++ {
			x, y := base.Inputs[a], base.Inputs[b]
			if len(x) == 1 && len(y) == 1 && len(x[0]) == len(y[0]) {
				l := cloneLayout(base)
				l.Inputs[a] = append(l.Inputs[a], l.Inputs[b][0])
				l.Inputs = slices.Delete(l.Inputs, b, b+1)
				add(l)
				return out
			}
		}
	}
	return out
}

// fits reports whether a layout keeps the string bounds.
func (p *Project) fits(l electric.Layout) bool {
	b := p.bounds
	if countInputs(l) > p.inputs() {
		return false
	}
	for _, in := range l.Inputs {
		if len(in) == 0 {
			continue // an inverter's input left free (electric.Plant.Deal)
		}
		if len(in) > b.MaxParallel {
			return false
		}
		for _, s := range in {
			if len(s) != len(in[0]) || len(s) < b.MinSeries || len(s) > b.MaxSeries {
				return false
			}
		}
	}
	return true
}

func connected(l electric.Layout) map[int]bool {
	c := map[int]bool{}
	for _, in := range l.Inputs {
		for _, s := range in {
			for _, k := range s {
				c[k] = true
			}
		}
	}
	return c
}

func cloneLayout(l electric.Layout) electric.Layout {
	out := electric.Layout{Inputs: make([][][]int, len(l.Inputs))}
	for i, in := range l.Inputs {
		for _, s := range in {
			out.Inputs[i] = append(out.Inputs[i], slices.Clone(s))
		}
	}
	return out
}

// describe names a layout in plain words from its structure: its strings' lengths, whether
// they keep to their roof faces, a row on its own string, where the shaded modules are, how
// the strings share inputs, and which modules it leaves out. Layouts with the same
// description differ only by a module or two here and there.
func (p *Project) describe(l electric.Layout, shaded []int) string {
	var parts []string
	var lens []int
	var strs [][]int
	inputsShared := false
	for _, in := range l.Inputs {
		if len(in) > 1 {
			inputsShared = true
		}
		for _, s := range in {
			lens = append(lens, len(s))
			strs = append(strs, s)
		}
	}
	parts = append(parts, lengthWords(lens))
	// Faces.
	facesOf := map[string]int{}
	pure := true
	for _, s := range strs {
		f := p.Modules[s[0]].Face
		for _, k := range s {
			if p.Modules[k].Face != f {
				pure = false
			}
		}
		facesOf[f]++
	}
	allFaces := map[string]bool{}
	for _, mod := range p.Modules {
		allFaces[mod.Face] = true
	}
	if pure && len(allFaces) > 1 {
		one := len(facesOf) == len(allFaces)
		for _, c := range facesOf {
			one = one && c == 1
		}
		if one {
			parts = append(parts, "one string per roof face")
		} else {
			parts = append(parts, "each string on one roof face")
		}
	}
	// A whole row of a face on its own string, when that row is shaded.
	isShaded := map[int]bool{}
	for _, k := range shaded {
		isShaded[k] = true
	}
	for _, s := range strs {
		f, r := p.Modules[s[0]].Face, p.Modules[s[0]].Row
		same, hasShade := true, false
		for _, k := range s {
			same = same && p.Modules[k].Face == f && p.Modules[k].Row == r
			hasShade = hasShade || isShaded[k]
		}
		rowSize, top := 0, 0
		for _, mod := range p.Modules {
			if mod.Face == f {
				top = max(top, mod.Row)
				if mod.Row == r {
					rowSize++
				}
			}
		}
		if same && hasShade && rowSize == len(s) {
			word := fmt.Sprintf("row %d", r)
			switch r {
			case 1:
				word = "eave row"
			case top:
				word = "ridge row"
			}
			parts = append(parts, fmt.Sprintf("%s of %s on its own string", word, f))
			break
		}
	}
	// The shaded modules.
	conn := connected(l)
	if len(shaded) >= 2 {
		home := map[[2]int]bool{}
		inputs := map[int]bool{}
		for a, in := range l.Inputs {
			for b, s := range in {
				for _, k := range s {
					if isShaded[k] {
						home[[2]int{a, b}] = true
						inputs[a] = true
					}
				}
			}
		}
		switch {
		case len(home) == 1:
			parts = append(parts, "shaded modules together")
		case len(home) > 1 && len(inputs) == 1:
			parts = append(parts, "shaded modules spread over one input's strings")
		case len(home) > 1:
			parts = append(parts, fmt.Sprintf("shaded modules on %d strings", len(home)))
		}
	}
	if inputsShared {
		parts = append(parts, "strings in parallel")
	}
	var left []string
	for k, mod := range p.Modules {
		if !conn[k] {
			left = append(left, mod.ID)
		}
	}
	switch {
	case len(left) == 0:
	case len(left) <= 3:
		parts = append(parts, joinWords(left)+" left out")
	default:
		parts = append(parts, fmt.Sprintf("%d modules left out", len(left)))
	}
	return strings.Join(parts, ", ")
}

// lengthWords says a layout's string lengths in words, longest first: "one string of 12",
// "strings of 14, 13 and 8", "19 strings of 23", "4 strings of 23 and 2 of 22".
func lengthWords(lens []int) string {
	type group struct{ length, count int }
	var gs []group
	for _, l := range slices.Sorted(slices.Values(lens)) {
		if len(gs) > 0 && gs[len(gs)-1].length == l {
			gs[len(gs)-1].count++
		} else {
			gs = append(gs, group{l, 1})
		}
	}
	slices.Reverse(gs)
	single := true
	for _, g := range gs {
		single = single && g.count == 1
	}
	switch {
	case len(gs) == 1 && gs[0].count == 1:
		return fmt.Sprintf("one string of %d", gs[0].length)
	case single:
		w := make([]string, len(gs))
		for i, g := range gs {
			w[i] = fmt.Sprint(g.length)
		}
		return "strings of " + joinWords(w)
	}
	w := make([]string, len(gs))
	for i, g := range gs {
		w[i] = fmt.Sprintf("%d of %d", g.count, g.length)
		if i == 0 {
			w[i] = fmt.Sprintf("%d %s of %d", g.count, map[bool]string{true: "string", false: "strings"}[g.count == 1], g.length)
		}
	}
	return joinWords(w)
}

// joinWords joins "a", "a and b", "a, b and c".
func joinWords(w []string) string {
	switch len(w) {
	case 0:
		return ""
	case 1:
		return w[0]
	}
	return strings.Join(w[:len(w)-1], ", ") + " and " + w[len(w)-1]
}

// faceCrossings counts the hops between two roof faces along the strings in wiring order.
func (p *Project) faceCrossings(rl RankedLayout) int {
	idx := map[string]int{}
	for i, mod := range p.Modules {
		idx[mod.ID] = i
	}
	c := 0
	for _, s := range rl.Strings {
		for i := 1; i < len(s); i++ {
			if p.Modules[idx[s[i]]].Face != p.Modules[idx[s[i-1]]].Face {
				c++
			}
		}
	}
	return c
}

// advise marks the layouts equivalent to the best (ls best first), chooses among them the
// one with the fewest face crossings, then the least extra cable, then the most energy, and
// says why in plain words.
func (p *Project) advise(m *yield.Model, ls []RankedLayout, shaded []int, res layout.Result) *report.LayoutAdvice {
	if len(ls) == 0 {
		return nil
	}
	best := ls[0].Result.ACkWh
	adv := &report.LayoutAdvice{LayoutsEvaluated: res.Evaluated, LayoutsScreened: res.Screened, SearchExhaustive: res.Exhaustive}
	chosen := -1
	for i := range ls {
		ls[i].Crossings = p.faceCrossings(ls[i])
		ls[i].Equivalent = ls[i].Result.ACkWh >= best*(1-EquivalenceMarginPct/100)
		if !ls[i].Equivalent {
			continue
		}
		adv.Equivalent = append(adv.Equivalent, ls[i].Name)
		if chosen < 0 || cmp.Or(cmp.Compare(ls[i].Crossings, ls[chosen].Crossings), cmp.Compare(ls[i].CableM, ls[chosen].CableM)) < 0 {
			chosen = i
		}
	}
	ch := ls[chosen]
	adv.Chosen = ch.Name
	adv.Reason = p.reason(m, ls, chosen, shaded)
	return adv
}

// reason is the plain sentence for the chosen layout: which modules the shade reaches and
// when, and what keeping them together (or apart) saves a year against the layout that
// treats them the other way.
func (p *Project) reason(m *yield.Model, ls []RankedLayout, chosen int, shaded []int) string {
	ch := ls[chosen]
	var b strings.Builder
	var eq []string
	for i, l := range ls {
		if l.Equivalent && i != chosen {
			eq = append(eq, fmt.Sprintf("%q", l.Name))
		}
	}
	if len(shaded) == 0 {
		fmt.Fprintf(&b, "No module loses more than 3 %% of its sun to shade, so the layouts differ mainly in string voltage and inverter loading.")
	} else {
		ids := make([]string, len(shaded))
		for i, k := range shaded {
			ids[i] = p.Modules[k].ID
		}
		fmt.Fprintf(&b, "The shade reaches %s most, %s.", joinWords(ids), when(m, shaded))
		// Compare with the best-placed layout that holds the shaded modules the other way.
		together := func(l RankedLayout) bool {
			home := map[int]bool{}
			want := map[string]bool{}
			for _, id := range ids {
				want[id] = true
			}
			for i, s := range l.Strings {
				for _, id := range s {
					if want[id] {
						home[i] = true
					}
				}
			}
			return len(home) <= 1
		}
		t := together(ch)
		other := -1
		for i, l := range ls {
			if i != chosen && together(l) != t {
				other = i
				break
			}
		}
		if other >= 0 {
			d := ch.Result.ACkWh - ls[other].Result.ACkWh
			how := "keeps them together on one string"
			if !t {
				how = "spreads them over several strings"
			}
			if d >= 0 {
				fmt.Fprintf(&b, " %q %s, which gives %s kWh a year more than %q.", ch.Name, how, report.Thousands(d, 0), ls[other].Name)
			} else {
				fmt.Fprintf(&b, " %q %s; %q gives %s kWh a year more but is harder to wire.", ch.Name, how, ls[other].Name, report.Thousands(-d, 0))
			}
		}
	}
	if len(eq) > 0 {
		fmt.Fprintf(&b, " %q and %s are within %.1f %% of the best, closer than the model tells layouts apart; %q is the easiest to wire (%d face crossings, %.1f m of extra cable).",
			ch.Name, joinWords(eq), EquivalenceMarginPct, ch.Name, ch.Crossings, ch.CableM)
	} else {
		fmt.Fprintf(&b, " No other layout comes within %.1f %% of it.", EquivalenceMarginPct)
	}
	b.WriteString(cableNote(ls, chosen))
	return b.String()
}

// cableNote says, when the chosen layout needs much more string cable than the plain roof
// order (more than 20 m and half as much again), what the extra energy costs in cable, so
// that a surveyor weighs it: grouping alike-shaded modules across a large roof can gain a
// percent or two for hundreds of metres of cable, which the energy alone does not show.
func cableNote(ls []RankedLayout, chosen int) string {
	ch := ls[chosen]
	for _, l := range ls {
		if l.Name != roofOrderName {
			continue
		}
		extra := ch.CableM - l.CableM
		if extra <= 20 || ch.CableM <= 1.5*l.CableM {
			return ""
		}
		return fmt.Sprintf(" It needs about %s m more string cable than %q for %s kWh a year more; where the cable and its laying cost more than that energy is worth, wire %q or weigh the cable in the ranking (layouts.cable_weight_kwh_per_m).",
			report.Thousands(extra, 0), roofOrderName, report.Thousands(ch.Result.ACkWh-l.Result.ACkWh, 0), roofOrderName)
	}
	return ""
}

// when says in which months and at which time of day the shade falls on the modules, from
// the modules' shade by month and hour (layout.ShadeFeatures).
func when(m *yield.Model, mods []int) string {
	f := layout.ShadeFeatures(m)
	var month [12]float64
	var hour [24]float64
	for _, k := range mods {
		for bin, x := range f[k] {
			month[bin/24] += x
			hour[bin%24] += x
		}
	}
	peak := slices.Max(month[:])
	if peak <= 0 {
		return "rarely"
	}
	// Runs of months with at least half the peak month's shade, as "January to March".
	var ms []string
	all := true
	for i := 0; i < 12; {
		if month[i] < peak/2 {
			all = false
			i++
			continue
		}
		j := i
		for j+1 < 12 && month[j+1] >= peak/2 {
			j++
		}
		if j == i {
			ms = append(ms, time.Month(i+1).String())
		} else {
			ms = append(ms, fmt.Sprintf("%s to %s", time.Month(i+1), time.Month(j+1)))
		}
		i = j + 1
	}
	var morning, midday, afternoon float64
	for h, x := range hour {
		switch {
		case h < 11:
			morning += x
		case h < 14:
			midday += x
		default:
			afternoon += x
		}
	}
	day := "in the morning"
	switch {
	case midday >= morning && midday >= afternoon:
		day = "around midday"
	case afternoon >= morning:
		day = "in the afternoon"
	}
	if all {
		return day + " all year round"
	}
	return fmt.Sprintf("%s, %s", day, joinWords(ms))
}

// ownString returns base with mods on a string slot of their own (the first slot of their
// length) and the other connected modules filling the other slots in roof order; false when
// base has no slot of that length.
func ownString(base electric.Layout, order, mods []int, conn map[int]bool) (electric.Layout, bool) {
	sa, sb := -1, -1
	for a, in := range base.Inputs {
		for b, str := range in {
			if sa < 0 && len(str) == len(mods) {
				sa, sb = a, b
			}
		}
	}
	if sa < 0 {
		return electric.Layout{}, false
	}
	var rest []int
	for _, k := range order {
		if conn[k] && !slices.Contains(mods, k) {
			rest = append(rest, k)
		}
	}
	l := electric.Layout{Inputs: make([][][]int, len(base.Inputs))}
	for a, in := range base.Inputs {
		for b, str := range in {
			if a == sa && b == sb {
				l.Inputs[a] = append(l.Inputs[a], slices.Clone(mods))
				continue
			}
			l.Inputs[a] = append(l.Inputs[a], slices.Clone(rest[:len(str)]))
			rest = rest[len(str):]
		}
	}
	return l, true
}
