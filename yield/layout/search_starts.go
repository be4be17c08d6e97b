package layout

import (
	"cmp"
	"math"
	"slices"

	"sunstring/yield/electric"
)

// starts builds the shape's starting states.
func (s *searcher) starts(sh Shape) [startsPerShape]state {
	inputs, lengths := slotsOf(sh)
	total := sh.Modules()
	// Modules left out: the most shaded ones (largest feature sum; ties to the higher index,
	// the end of the roof order).
	rank := make([]int, s.n)
	for i := range rank {
		rank[i] = i
	}
	slices.SortStableFunc(rank, func(a, b int) int { return cmp.Compare(s.shade[b], s.shade[a]) })
	pool := slices.Clone(rank[:s.n-total])
	out := map[int]bool{}
	for _, m := range pool {
		out[m] = true
	}
	mk := func(name string, strs [][]int) state {
		return state{shape: slices.Clone(sh), inputs: slices.Clone(inputs), strs: strs, pool: slices.Clone(pool), start: name}
	}
	fill := func(order []int) [][]int {
		var use []int
		for _, m := range order {
			if !out[m] {
				use = append(use, m)
			}
		}
		strs := make([][]int, len(lengths))
		for i, L := range lengths {
			strs[i] = slices.Clone(use[:L])
			use = use[L:]
		}
		return strs
	}
	roof := s.p.Order
	if len(roof) == 0 {
		roof = make([]int, s.n)
		for i := range roof {
			roof[i] = i
		}
	}
	// Ranked by shade, most shaded first, ties in roof order: the shaded modules end up in
	// the first strings together.
	pos := make([]int, s.n)
	for i, m := range roof {
		pos[m] = i
	}
	byShade := slices.Clone(roof)
	slices.SortStableFunc(byShade, func(a, b int) int { return cmp.Compare(s.shade[b], s.shade[a]) })
	var used []int
	for _, m := range roof {
		if !out[m] {
			used = append(used, m)
		}
	}
	return [startsPerShape]state{
		mk(StartClustered, s.cluster(used, lengths)),
		mk(StartRoofOrder, fill(roof)),
		mk(StartShadeRank, fill(byShade)),
	}
}

// startsPerShape is how many starts searcher.starts makes of a shape.
const startsPerShape = 3

// given turns a caller's layout into a search state: inputs ordered as shapes are (more
// modules first, then longer strings), strings in slot order. It reports false for a layout
// outside the bounds of the level or using a module twice.
func (s *searcher) given(l electric.Layout, lv level) (state, bool) {
	type in struct {
		is   InputShape
		strs [][]int
	}
	var ins []in
	used := make([]bool, s.n)
	b := s.p.Bounds
	for _, strs := range l.Inputs {
		if len(strs) == 0 {
			continue
		}
		L := len(strs[0])
		if len(strs) > b.MaxParallel || L < b.MinSeries || L > b.MaxSeries {
			return state{}, false
		}
		for _, st := range strs {
			if len(st) != L {
				return state{}, false
			}
			for _, m := range st {
				if m < 0 || m >= s.n || used[m] {
					return state{}, false
				}
				used[m] = true
			}
		}
		ins = append(ins, in{InputShape{len(strs), L}, strs})
	}
	if len(ins) == 0 || len(ins) > lv.inputs {
		return state{}, false
	}
	slices.SortStableFunc(ins, func(a, c in) int {
		return cmp.Or(cmp.Compare(c.is.Modules(), a.is.Modules()), cmp.Compare(c.is.Length, a.is.Length))
	})
	st := state{start: StartGiven}
	for i, g := range ins {
		st.shape = append(st.shape, g.is)
		for _, str := range g.strs {
			st.inputs = append(st.inputs, i)
			st.strs = append(st.strs, slices.Clone(str))
		}
	}
	for m, u := range used {
		if !u {
			st.pool = append(st.pool, m)
		}
	}
	if s.n-len(st.pool) < minModules(s.p, s.n, lv.leaveOut, lv.inputs) {
		return state{}, false
	}
	return st, true
}

// cluster splits the modules into groups of the given sizes with similar features: seeds by
// farthest-first traversal from the most shaded module, then a few rounds of capacitated
// assignment (all module–group distances in increasing order, each module to the first
// group with room) and centroid updates. Deterministic: ties go to the lower index.
func (s *searcher) cluster(mods, sizes []int) [][]int {
	k := len(sizes)
	dim := len(s.feat[0])
	cent := make([][]float64, k)
	if dim == 0 {
		cent = nil
	}
	if cent != nil {
		first := mods[0]
		for _, m := range mods {
			if s.shade[m] > s.shade[first] {
				first = m
			}
		}
		seeds := []int{first}
		minD := make([]float64, len(mods))
		for i, m := range mods {
			minD[i] = d2(s.feat[m], s.feat[first])
		}
		for len(seeds) < k {
			bi := 0
			for i := range mods {
				if minD[i] > minD[bi] {
					bi = i
				}
			}
			seeds = append(seeds, mods[bi])
			for i, m := range mods {
				minD[i] = math.Min(minD[i], d2(s.feat[m], s.feat[mods[bi]]))
			}
		}
		// Larger groups take the seeds in the order found; the order matters little after
		// the centroid updates.
		for g := range k {
			cent[g] = slices.Clone(s.feat[seeds[g]])
		}
	}
	groups := make([][]int, k)
	type pair struct {
		d    float64
		m, g int
	}
	pairs := make([]pair, 0, len(mods)*k)
	for round := range 6 {
		pairs = pairs[:0]
		for _, m := range mods {
			for g := range k {
				d := 0.0
				if cent != nil {
					d = d2(s.feat[m], cent[g])
				}
				pairs = append(pairs, pair{d, m, g})
			}
		}
		slices.SortFunc(pairs, func(a, b pair) int {
			return cmp.Or(cmp.Compare(a.d, b.d), cmp.Compare(a.m, b.m), cmp.Compare(a.g, b.g))
		})
		done := make(map[int]bool, len(mods))
		next := make([][]int, k)
		for _, pr := range pairs {
			if done[pr.m] || len(next[pr.g]) >= sizes[pr.g] {
				continue
			}
			done[pr.m] = true
			next[pr.g] = append(next[pr.g], pr.m)
		}
		same := round > 0
		for g := range k {
			slices.Sort(next[g])
			same = same && slices.Equal(next[g], groups[g])
		}
		groups = next
		if same || cent == nil {
			break
		}
		for g := range k {
			clear(cent[g])
			for _, m := range groups[g] {
				for j, x := range s.feat[m] {
					cent[g][j] += x / float64(len(groups[g]))
				}
			}
		}
	}
	return groups
}

func d2(a, b []float64) float64 {
	// Four partial sums: one sum's additions wait on each other, four proceed side by side.
	b = b[:len(a)]
	var d0, d1, d2, d3 float64
	i := 0
	for ; i+4 <= len(a); i += 4 {
		d0 += sq(a[i] - b[i])
		d1 += sq(a[i+1] - b[i+1])
		d2 += sq(a[i+2] - b[i+2])
		d3 += sq(a[i+3] - b[i+3])
	}
	for ; i < len(a); i++ {
		d0 += sq(a[i] - b[i])
	}
	return (d0 + d1) + (d2 + d3)
}

// improve runs the local search from st until no evaluated neighbour improves or the
