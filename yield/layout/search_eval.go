package layout

import (
	"cmp"
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"

	"sunstring/yield/electric"
)

type searcher struct {
	ctx   context.Context
	p     Problem
	n     int
	eval  Evaluator
	opt   Options
	feat  [][]float64 // features with a small position term (see newSearcher)
	shade []float64   // per module: sum of its features
	norm  []float64   // per module: ‖feat‖²
	alike []int       // per module: the lowest index with identical shade features and face
	cache map[string]state
	evals int // new layouts evaluated, over all levels
	// stop is the most evaluations the search may have done when the current level ends, and
	// after the most the levels still to come may do: together the progress's total (see
	// report), which shrinks when a level ends before its budget.
	stop, after int
	// screened holds the screen's score of every layout screened (Options.Screen); screens
	// counts them.
	screened map[string]float64
	screens  int
	// exhaustive reports whether the last level enumerated every layout; budgetSpent
	// whether some level's local search ran out of budget.
	exhaustive, budgetSpent bool
	mu                      sync.Mutex
}

func newSearcher(ctx context.Context, p Problem, n int, eval Evaluator, opt Options) *searcher {
	s := &searcher{ctx: ctx, p: p, n: n, eval: eval, opt: opt, cache: map[string]state{}, screened: map[string]float64{}, shade: make([]float64, n)}
	dim := 0
	if len(p.Features) > 0 {
		dim = len(p.Features[0])
	}
	// The clustering distance is the shade distance plus a small position term: modules shaded
	// alike are then grouped with their neighbours rather than at random across the roof, and
	// a roof without shade comes out in compact groups. The position term is scaled to a tenth
	// of the shade vectors' spread so that it only decides between modules of similar shade.
	var fvar, pvar float64
	mean := make([]float64, dim)
	for _, f := range p.Features {
		for j, x := range f {
			mean[j] += x / float64(n)
		}
	}
	for i, f := range p.Features {
		for j, x := range f {
			fvar += sq(x - mean[j])
			s.shade[i] += x
		}
	}
	var pc Point
	for _, q := range p.Positions {
		pc.X += q.X / float64(n)
		pc.Y += q.Y / float64(n)
		pc.Z += q.Z / float64(n)
	}
	for _, q := range p.Positions {
		pvar += sq(q.X-pc.X) + sq(q.Y-pc.Y) + sq(q.Z-pc.Z)
	}
	w := 1.0
	if fvar > 0 && pvar > 0 {
		w = math.Sqrt(0.1 * fvar / pvar)
	}
	s.feat = make([][]float64, n)
	for i := range n {
		v := make([]float64, 0, dim+3)
		if dim > 0 {
			v = append(v, p.Features[i]...)
		}
		if len(p.Positions) > 0 {
			q := p.Positions[i]
			v = append(v, w*q.X, w*q.Y, w*q.Z)
		}
		s.feat[i] = v
	}
	s.norm = make([]float64, n)
	s.alike = make([]int, n)
	shadeOf := func(i int) []float64 {
		if dim == 0 {
			return nil
		}
		return p.Features[i]
	}
	faceOf := func(i int) int {
		if len(p.Faces) == 0 {
			return 0
		}
		return p.Faces[i]
	}
	for i := range n {
		s.norm[i] = dot(s.feat[i], s.feat[i])
		s.alike[i] = i
		for j := range i {
			if s.alike[j] == j && faceOf(i) == faceOf(j) && slices.Equal(shadeOf(i), shadeOf(j)) {
				s.alike[i] = j
				break
			}
		}
	}
	return s
}

func dot(a, b []float64) float64 {
	d := 0.0
	for i := range a {
		d += a[i] * b[i]
	}
	return d
}

// movesOrdered is how many of a round's moves are put in order at first (see orderMoves); each
// later call orders as many again as are ordered already.
const movesOrdered = 256

// searchBatch is how many neighbours the local search evaluates at a time: enough to keep
// the cores busy, few enough that little is wasted after an improvement. A constant, so that
// the result does not depend on the number of cores.
const searchBatch = 16

// runLevel searches one level of freedom, starting also from prev (the best of the narrower
// levels), and returns the best distinct states found so far.
func (s *searcher) runLevel(lv level, prev []state) ([]state, error) {
	stop := s.spent() + s.opt.MaxEvals
	shapes := shapesForInputs(s.p, s.n, lv.leaveOut, lv.inputs)
	// The count is exact but computed through log-gamma: half a layout of slack.
	// A list cut at MaxShapes is not every layout.
	if len(shapes) < MaxShapes && countLayouts(shapes, s.n) <= float64(s.opt.MaxEvals)+0.5 {
		if err := s.enumerate(shapes); err != nil {
			return nil, err
		}
		s.exhaustive = true
		return s.best(3), nil
	}
	s.exhaustive = false
	// The starts take about a third of the budget; the shapes listed first (most modules,
	// fewest strings) come first. They are evaluated together, on all cores.
	// Each shape gives startsPerShape starts; they are made on all cores (grouping by shade
	// takes a while on a large roof) and joined in the shapes' order.
	var use []Shape
	for _, sh := range shapes {
		if len(use)*startsPerShape >= s.opt.MaxEvals/3 && len(use) > 0 {
			break
		}
		use = append(use, sh)
	}
	per := make([][startsPerShape]state, len(use))
	if err := s.runAll(len(use), func(i int) error { per[i] = s.starts(use[i]); return nil }); err != nil {
		return nil, err
	}
	var starts []state
	for i := range per {
		starts = append(starts, per[i][:]...)
	}
	if s.opt.Screen != nil {
		var err error
		if starts, err = s.screenStarts(starts); err != nil {
			return nil, err
		}
	}
	// The caller's layouts and the narrower levels' best are always evaluated in full, so
	// that the search never reports a best worse than any of them.
	for _, l := range s.p.Starts {
		if st, ok := s.given(l, lv); ok {
			starts = append(starts, st)
		}
	}
	for _, st := range prev {
		starts = append(starts, st.clone())
	}
	ptrs := make([]*state, len(starts))
	for i := range starts {
		ptrs[i] = &starts[i]
	}
	if err := s.scoreAll(ptrs); err != nil {
		return nil, err
	}
	slices.SortStableFunc(starts, func(a, b state) int { return cmp.Or(cmp.Compare(b.score, a.score), cmp.Compare(a.key, b.key)) })
	// Local search from the best starts of distinct shapes, so that the ranking offers
	// real alternatives rather than one layout and its near copies.
	seen := map[string]bool{}
	var from []state
	for _, st := range starts {
		if k := st.shape.String(); !seen[k] && len(from) < 3 {
			seen[k] = true
			from = append(from, st)
		}
	}
	for i, st := range from {
		// Each run may use its share of what is left, the first the most.
		left := stop - s.spent()
		share := left / (len(from) - i)
		if i == 0 {
			share = left * 2 / (len(from) + 1)
		}
		if err := s.improve(st, lv, s.spent()+share); err != nil {
			return nil, err
		}
	}
	return s.best(3), nil
}

// best returns the n best evaluated states of distinct shapes.
func (s *searcher) best(n int) []state {
	all := s.sorted()
	seen := map[string]bool{}
	var out []state
	for _, st := range all {
		if k := st.shape.String(); !seen[k] && len(out) < n {
			seen[k] = true
			out = append(out, st.clone())
		}
	}
	return out
}

// sorted returns every evaluated state, best first (ties by key).
func (s *searcher) sorted() []state {
	all := make([]state, 0, len(s.cache))
	for _, st := range s.cache {
		all = append(all, st)
	}
	slices.SortFunc(all, func(a, b state) int {
		return cmp.Or(cmp.Compare(b.score, a.score), cmp.Compare(a.key, b.key))
	})
	return all
}

// unseen puts the states in canonical form and returns those not yet known (seen) and not
// repeated in the batch, each once.
func unseen(sts []*state, seen func(key string) bool) []*state {
	var todo []*state
	inBatch := map[string]bool{}
	for _, st := range sts {
		st.canon()
		if !seen(st.key) && !inBatch[st.key] {
			inBatch[st.key] = true
			todo = append(todo, st)
		}
	}
	return todo
}

// scoreAll evaluates states concurrently, through the cache; new ones count against the
// budget.
func (s *searcher) scoreAll(sts []*state) error {
	if err := s.ctx.Err(); err != nil {
		return err
	}
	todo := unseen(sts, func(key string) bool { _, ok := s.cache[key]; return ok })
	if err := s.runAll(len(todo), func(i int) error {
		st := todo[i]
		e, err := s.eval(st.layout)
		if err != nil {
			return fmt.Errorf("layout: evaluating %s: %w", st.shape, err)
		}
		st.energy = e
		return nil
	}); err != nil {
		return err
	}
	for _, st := range todo {
		st.cable = ExtraCableM(st.layout, s.p.Positions, s.p.ReachM)
		st.score = st.energy - s.opt.CableWeightWh*st.cable
		s.cache[st.key] = st.clone()
	}
	for _, st := range sts {
		c := s.cache[st.key]
		st.energy, st.cable, st.score = c.energy, c.cable, c.score
	}
	s.evals += len(todo)
	s.report()
	return nil
}

// spent is the budget used so far: evaluations, and screens at ScreenCost a evaluation.
func (s *searcher) spent() int {
	return s.evals + s.screens/s.opt.ScreenCost
}

// screenKeep is how many of a batch's screened neighbours that look better than the current
// layout are evaluated in full: the screen's error is small against most layouts'
// differences, so the true best of a batch is nearly always among its first three.
const screenKeep = 3

// screenStarts screens the starts and returns the most promising, to be evaluated in full:
// the best of each shape and the best overall, a sixth of them and at least eight.
func (s *searcher) screenStarts(starts []state) ([]state, error) {
	ptrs := make([]*state, len(starts))
	for i := range starts {
		ptrs[i] = &starts[i]
	}
	if err := s.screenAll(ptrs); err != nil {
		return nil, err
	}
	slices.SortStableFunc(starts, func(a, b state) int {
		return cmp.Or(cmp.Compare(s.screened[b.key], s.screened[a.key]), cmp.Compare(a.key, b.key))
	})
	n := max(8, len(starts)/6)
	seen := map[string]bool{}
	var out []state
	for i, st := range starts {
		k := st.shape.String()
		if i < n || !seen[k] {
			out = append(out, st)
		}
		seen[k] = true
	}
	return out, nil
}

// screenAll scores states with the screen concurrently, through its own cache; new ones count
// against the budget at 1/ScreenCost of an evaluation.
func (s *searcher) screenAll(sts []*state) error {
	todo := unseen(sts, func(key string) bool { _, ok := s.screened[key]; return ok })
	vals := make([]float64, len(todo))
	if err := s.runAll(len(todo), func(i int) error {
		e, err := s.opt.Screen(todo[i].layout)
		if err != nil {
			return fmt.Errorf("layout: screening %s: %w", todo[i].shape, err)
		}
		vals[i] = e
		return nil
	}); err != nil {
		return err
	}
	for i, st := range todo {
		s.screened[st.key] = vals[i] - s.opt.CableWeightWh*ExtraCableM(st.layout, s.p.Positions, s.p.ReachM)
	}
	s.screens += len(todo)
	s.report()
	return nil
}

// runAll calls do(0..n−1) on all cores and joins the errors; it stops early when the context
// is cancelled.
func (s *searcher) runAll(n int, do func(i int) error) error {
	if err := s.ctx.Err(); err != nil {
		return err
	}
	errs := make([]error, n)
	workers := min(runtime.GOMAXPROCS(0), n)
	var wg sync.WaitGroup
	next := 0
	for range workers {
		wg.Go(func() {
			for {
				s.mu.Lock()
				i := next
				next++
				s.mu.Unlock()
				if i >= n || s.ctx.Err() != nil {
					return
				}
				errs[i] = do(i)
			}
		})
	}
	wg.Wait()
	if err := s.ctx.Err(); err != nil {
		return err
	}
	return errors.Join(errs...)
}

// improve runs the local search from st until no neighbour is better or the number of
// evaluations reaches stop.
func (s *searcher) improve(st state, lv level, stop int) error {
	cur := st.clone()
	if err := s.scoreAll([]*state{&cur}); err != nil {
		return err
	}
	for {
		moves := s.neighbours(&cur, lv)
		next, ordered := -1, 0
		var batch []state
		for i := 0; i < len(moves) && next < 0; {
			if i+searchBatch > ordered && ordered < len(moves) {
				k := max(movesOrdered, ordered)
				orderMoves(moves, ordered, k)
				ordered = min(ordered+k, len(moves))
			}
			if s.spent() >= stop {
				s.budgetSpent = true
				return nil
			}
			batch = batch[:0]
			for ; i < len(moves) && len(batch) < searchBatch; i++ {
				batch = append(batch, s.apply(&cur, moves[i]))
			}
			ptrs := make([]*state, len(batch))
			for k := range batch {
				ptrs[k] = &batch[k]
			}
			if s.opt.Screen != nil {
				var err error
				if ptrs, err = s.promising(&cur, ptrs); err != nil {
					return err
				}
			}
			if err := s.scoreAll(ptrs); err != nil {
				return err
			}
			for k := range batch {
				if s.opt.Screen != nil && !s.fullyScored(&batch[k]) {
					continue
				}
				// A strict improvement beyond rounding, so that equal layouts never cycle.
				if batch[k].score > cur.score+1e-9*math.Abs(cur.score) && (next < 0 || batch[k].score > batch[next].score) {
					next = k
				}
			}
		}
		if next < 0 {
			return nil // no neighbour is better: a local optimum
		}
		cur = batch[next].clone()
	}
}

// promising screens a batch of neighbours of cur and returns those to evaluate in full: the
// screenKeep best whose screen beats cur's.
func (s *searcher) promising(cur *state, batch []*state) ([]*state, error) {
	if err := s.screenAll(append([]*state{cur}, batch...)); err != nil {
		return nil, err
	}
	base := s.screened[cur.key]
	var out []*state
	for _, st := range batch {
		if s.screened[st.key] > base+1e-9*math.Abs(base) {
			out = append(out, st)
		}
	}
	slices.SortStableFunc(out, func(a, b *state) int {
		return cmp.Or(cmp.Compare(s.screened[b.key], s.screened[a.key]), cmp.Compare(a.key, b.key))
	})
	return out[:min(len(out), screenKeep)], nil
}

// fullyScored reports whether st's layout has been evaluated in full (and copies the score).
func (s *searcher) fullyScored(st *state) bool {
	c, ok := s.cache[st.key]
	if ok {
		st.energy, st.cable, st.score = c.energy, c.cable, c.score
	}
	return ok
}

// ranked returns the distinct evaluated layouts, best first, at most Keep.
func (s *searcher) ranked() []Candidate {
	all := s.sorted()
	var out []Candidate
	for _, st := range all[:min(len(all), s.opt.Keep)] {
		l := electric.Layout{Inputs: make([][][]int, len(st.layout.Inputs))}
		for i, in := range st.layout.Inputs {
			for _, str := range in {
				l.Inputs[i] = append(l.Inputs[i], Chain(str, s.p.Positions))
			}
		}
		out = append(out, Candidate{
			Layout: l, Shape: slices.Clone(st.shape), Left: slices.Clone(st.pool),
			EnergyWh: st.energy, CableM: st.cable, Score: st.score, Start: st.start,
		})
	}
	return out
}
