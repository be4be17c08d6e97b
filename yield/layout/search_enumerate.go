package layout

import (
	"math"
	"slices"
)

// countLayouts returns how many distinct layouts the shapes give on n modules: for each
// shape, the ways to pick its modules and split them into its strings, where the order of
// modules in a string, of parallel strings on an input and of inputs of equal shape carries
// no meaning (n!/(n−m)! / Π Lᵢ!^sᵢ / Π sᵢ! / Π kⱼ! for m connected modules, strings of Lᵢ
// modules sᵢ to an input, and kⱼ inputs of each equal shape).
func countLayouts(shapes []Shape, n int) float64 {
	lf := func(k int) float64 { v, _ := math.Lgamma(float64(k) + 1); return v }
	total := 0.0
	for _, sh := range shapes {
		m := sh.Modules()
		lg := lf(n) - lf(n-m)
		same := map[InputShape]int{}
		for _, in := range sh {
			lg -= float64(in.Strings)*lf(in.Length) + lf(in.Strings)
			same[in]++
		}
		for _, k := range same {
			lg -= lf(k)
		}
		total += math.Exp(lg)
	}
	return total
}

// enumerate evaluates every layout of the shapes. Modules are dealt in index order to the
// strings or the pool; a string is opened only after the strings before it on the same input,
// so that parallel strings are not listed in every order. Layouts that differ only in the
// order of equal inputs come out more than once and are evaluated once (the cache).
func (s *searcher) enumerate(shapes []Shape) error {
	// The level evaluates at most every layout once: its share of the progress's total.
	s.stop = min(s.stop, s.evals+int(math.Round(countLayouts(shapes, s.n))))
	var batch []state
	flush := func() error {
		ptrs := make([]*state, len(batch))
		for i := range batch {
			ptrs[i] = &batch[i]
		}
		err := s.scoreAll(ptrs)
		batch = batch[:0]
		return err
	}
	for _, sh := range shapes {
		inputs, lengths := slotsOf(sh)
		strs := make([][]int, len(lengths))
		pool := make([]int, 0, s.n)
		free := s.n - sh.Modules()
		var err error
		var deal func(m int)
		deal = func(m int) {
			if err != nil {
				return
			}
			if m == s.n {
				st := state{shape: slices.Clone(sh), inputs: slices.Clone(inputs), strs: cloneStrings(strs), pool: slices.Clone(pool), start: StartEnumerated}
				batch = append(batch, st)
				if len(batch) >= 256 {
					err = flush()
				}
				return
			}
			if len(pool) < free {
				pool = append(pool, m)
				deal(m + 1)
				pool = pool[:len(pool)-1]
			}
			for j := range strs {
				if len(strs[j]) == lengths[j] {
					continue
				}
				if len(strs[j]) == 0 && j > 0 && inputs[j-1] == inputs[j] && len(strs[j-1]) == 0 {
					continue // open parallel strings in order
				}
				strs[j] = append(strs[j], m)
				deal(m + 1)
				strs[j] = strs[j][:len(strs[j])-1]
			}
		}
		deal(0)
		if err != nil {
			return err
		}
	}
	return flush()
}

func cloneStrings(s [][]int) [][]int {
	out := make([][]int, len(s))
	for i := range s {
		out[i] = slices.Clone(s[i])
	}
	return out
}
