package layout

import (
	"cmp"
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"

	"sunstring/yield/electric"
)

// Evaluator returns a layout's annual energy in Wh (higher is better). The search calls it
// from several goroutines at once, so it must be safe for concurrent use; it must give the
// same value for the same layout whatever the order of strings within an input, of inputs,
// and of modules within a string (true of any electrical model of identical inputs).
type Evaluator func(l electric.Layout) (float64, error)

// Problem is what the search arranges.
type Problem struct {
	// Features describe, per module, when it is shaded: a vector of the same length for
	// every module (for instance the shaded share of beam irradiance by month and hour),
	// larger meaning more shade. Modules with close vectors are shaded alike and belong in
	// one string. Nil or empty vectors: all modules alike.
	Features [][]float64
	// Positions are the modules' centres (optional: nil means no cable estimate and no
	// contiguity preference).
	Positions []Point
	// ReachM is how far two neighbouring modules' leads reach without extra cable (m);
	// zero means 1.8 m, about a module's length (common practice).
	ReachM float64
	Bounds Bounds
	Inputs int // inverter inputs (identical)
	// Order is the caller's roof order of the modules, used as one of the starts
	// (optional: nil means index order).
	Order []int
	// Starts are layouts of the caller's own to start from as well (optional), for instance
	// strings kept on one roof face each. A start that breaks the bounds is skipped.
	Starts []electric.Layout
}

// Options tune the search. The zero value searches with every module used, cable reported
// but not weighed, five candidates returned and a budget of 400 evaluations.
type Options struct {
	// LeaveOut allows layouts that leave some modules unconnected, when that yields more
	// (a module so shaded it costs its string more than it gives).
	LeaveOut bool
	// CableWeightWh is the annual energy (Wh) one metre of extra cable is worth in the
	// ranking: Score = EnergyWh − CableWeightWh·CableM.
	CableWeightWh float64
	Keep          int // distinct candidates returned; 0 means 5
	MaxEvals      int // evaluations of new layouts (cache hits are free); 0 means 400
	// Progress, when set, is told how many of the budgeted evaluations are done.
	Progress func(done, total int)
}

// Candidate is one evaluated layout.
type Candidate struct {
	Layout   electric.Layout // strings in wiring order (Chain) when positions are given
	Shape    Shape
	Left     []int   // modules left unconnected
	EnergyWh float64 // the evaluator's value
	CableM   float64 // ExtraCableM
	Score    float64 // EnergyWh − CableWeightWh·CableM, the ranking
	Start    string  // the start the local search began from
}

// Names of the starts, as Candidate.Start reports them.
const (
	StartClustered = "clustered by shade"
	StartRoofOrder = "roof order"
	StartShadeRank = "ranked by shade"
	StartGiven     = "given by the caller"
)

// ErrNoShape means no layout of the bounds takes the modules.
var ErrNoShape = errors.New("layout: no string layout fits the bounds")

// Search looks for the layouts that give the most energy. For every valid shape (Shapes) it
// builds starts in which modules with similar shade share a string — balanced clustering of
// the Features, the roof order, and a ranking by total shade — evaluates them, and then
// improves the best few by local search on the full evaluator: swaps of two modules between
// strings, moves of one module between single-string inputs and, with LeaveOut, in and out
// of the unconnected pool. Each round ranks the possible swaps and moves by how much closer
// they bring each module to its string's shade pattern and evaluates the most promising ones
// in full; the best improvement is taken, and the search stops when none of them improves or
// the budget is spent. Every evaluated layout is a candidate; the distinct best Keep are
// returned, best first. The result depends only on the inputs (ties go to the lower module
// index), however many goroutines evaluate.
func Search(ctx context.Context, p Problem, eval Evaluator, opt Options) ([]Candidate, error) {
	n := len(p.Features)
	if n == 0 {
		n = len(p.Order)
	}
	if n == 0 {
		return nil, nil
	}
	if err := p.check(n); err != nil {
		return nil, err
	}
	if opt.Keep <= 0 {
		opt.Keep = 5
	}
	if opt.MaxEvals <= 0 {
		opt.MaxEvals = 400
	}
	if p.ReachM == 0 {
		p.ReachM = 1.8
	}
	s := newSearcher(ctx, p, n, eval, opt)
	capacity := p.Inputs * p.Bounds.MaxParallel * p.Bounds.MaxSeries
	minMods := n
	if opt.LeaveOut || capacity < n {
		// Leaving out more than a quarter of the roof never pays for itself in practice;
		// the cap keeps the number of shapes small.
		minMods = min(n, capacity) - n/4
	}
	shapes := Shapes(n, minMods, p.Inputs, p.Bounds)
	if len(shapes) == 0 {
		return nil, fmt.Errorf("%w: %d modules, %d inputs, %d..%d in series, up to %d in parallel",
			ErrNoShape, n, p.Inputs, p.Bounds.MinSeries, p.Bounds.MaxSeries, p.Bounds.MaxParallel)
	}
	// The starts take at most a third of the budget; the shapes listed first (most modules,
	// fewest strings) come first.
	var starts []state
	for _, sh := range shapes {
		if s.evals >= opt.MaxEvals/3 && len(starts) > 0 {
			break
		}
		for _, st := range s.starts(sh) {
			if err := s.score(&st); err != nil {
				return nil, err
			}
			starts = append(starts, st)
		}
	}
	for _, l := range p.Starts {
		st, ok := s.given(l)
		if !ok {
			continue
		}
		if err := s.score(&st); err != nil {
			return nil, err
		}
		starts = append(starts, st)
	}
	slices.SortStableFunc(starts, func(a, b state) int { return cmp.Compare(b.score, a.score) })
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
		left := opt.MaxEvals - s.evals
		share := left / (len(from) - i)
		if i == 0 {
			share = left * 2 / (len(from) + 1)
		}
		if err := s.improve(st, s.evals+share); err != nil {
			return nil, err
		}
	}
	if opt.Progress != nil {
		opt.Progress(opt.MaxEvals, opt.MaxEvals)
	}
	return s.ranked(), nil
}

func (p *Problem) check(n int) error {
	if p.Inputs < 1 {
		return fmt.Errorf("layout: search needs at least one input, got %d", p.Inputs)
	}
	if len(p.Features) != 0 && len(p.Features) != n {
		return fmt.Errorf("layout: %d feature vectors for %d modules", len(p.Features), n)
	}
	for i, f := range p.Features {
		if len(f) != len(p.Features[0]) {
			return fmt.Errorf("layout: module %d: feature vector of %d values, module 0 has %d", i, len(f), len(p.Features[0]))
		}
	}
	if len(p.Positions) != 0 && len(p.Positions) != n {
		return fmt.Errorf("layout: %d positions for %d modules", len(p.Positions), n)
	}
	if len(p.Order) != 0 {
		if len(p.Order) != n {
			return fmt.Errorf("layout: roof order of %d modules for %d", len(p.Order), n)
		}
		seen := make([]bool, n)
		for _, m := range p.Order {
			if m < 0 || m >= n || seen[m] {
				return fmt.Errorf("layout: roof order is not a permutation of 0..%d (module %d)", n-1, m)
			}
			seen[m] = true
		}
	}
	return nil
}

// state is a layout under search: strings in slot order (each sorted), the pool of left-out
// modules (sorted), and its evaluation.
type state struct {
	shape  Shape
	inputs []int // slot → input
	strs   [][]int
	pool   []int
	energy float64
	cable  float64
	score  float64
	start  string
	key    string // canonical form, set by canon
	layout electric.Layout
}

func (st *state) clone() state {
	c := *st
	c.shape = slices.Clone(st.shape)
	c.strs = make([][]int, len(st.strs))
	for i, s := range st.strs {
		c.strs[i] = slices.Clone(s)
	}
	c.pool = slices.Clone(st.pool)
	c.inputs = slices.Clone(st.inputs)
	if c.key != "" {
		c.layout = build(c.shape, c.strs) // share nothing with st
	}
	return c
}

// canon sorts strings and inputs so that equal layouts get equal keys.
func (st *state) canon() {
	for _, s := range st.strs {
		slices.Sort(s)
	}
	slices.Sort(st.pool)
	// Re-derive the shape from the (possibly moved) string lengths, then order inputs.
	type in struct{ strs [][]int }
	ins := make([]in, 0, len(st.shape))
	k := 0
	for _, is := range st.shape {
		var g in
		for range is.Strings {
			g.strs = append(g.strs, st.strs[k])
			k++
		}
		slices.SortFunc(g.strs, func(a, b []int) int { return slices.Compare(a, b) })
		ins = append(ins, g)
	}
	slices.SortStableFunc(ins, func(a, b in) int {
		ma, mb := len(a.strs)*len(a.strs[0]), len(b.strs)*len(b.strs[0])
		return cmp.Or(cmp.Compare(mb, ma), cmp.Compare(len(b.strs[0]), len(a.strs[0])), slices.Compare(a.strs[0], b.strs[0]))
	})
	st.shape = st.shape[:0]
	st.strs = st.strs[:0]
	st.inputs = st.inputs[:0]
	var sb strings.Builder
	for i, g := range ins {
		st.shape = append(st.shape, InputShape{len(g.strs), len(g.strs[0])})
		if i > 0 {
			sb.WriteByte('|')
		}
		for j, s := range g.strs {
			if j > 0 {
				sb.WriteByte('/')
			}
			for k, m := range s {
				if k > 0 {
					sb.WriteByte(',')
				}
				sb.WriteString(strconv.Itoa(m))
			}
			st.strs = append(st.strs, s)
			st.inputs = append(st.inputs, i)
		}
	}
	st.key = sb.String()
	st.layout = build(st.shape, st.strs)
}

type searcher struct {
	ctx   context.Context
	p     Problem
	n     int
	eval  Evaluator
	opt   Options
	feat  [][]float64 // features with a small position term (see newSearcher)
	shade []float64   // per module: sum of its features
	norm  []float64   // per module: ‖feat‖²
	alike []int       // per module: the lowest index with identical features
	cache map[string]state
	evals int
	mu    sync.Mutex
}

func newSearcher(ctx context.Context, p Problem, n int, eval Evaluator, opt Options) *searcher {
	s := &searcher{ctx: ctx, p: p, n: n, eval: eval, opt: opt, cache: map[string]state{}, shade: make([]float64, n)}
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
	for i := range n {
		s.norm[i] = dot(s.feat[i], s.feat[i])
		s.alike[i] = i
		for j := range i {
			if s.alike[j] == j && slices.Equal(s.feat[i], s.feat[j]) {
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

// score evaluates a state (through the cache), counting new evaluations.
func (s *searcher) score(st *state) error {
	_, err := s.scoreAll([]*state{st})
	return err
}

// scoreAll evaluates states concurrently; new ones count against the budget. It returns how
// many were new.
func (s *searcher) scoreAll(sts []*state) (int, error) {
	if err := s.ctx.Err(); err != nil {
		return 0, err
	}
	var todo []*state
	inBatch := map[string]bool{}
	for _, st := range sts {
		st.canon()
		if c, ok := s.cache[st.key]; ok {
			st.energy, st.cable, st.score = c.energy, c.cable, c.score
			continue
		}
		if !inBatch[st.key] {
			inBatch[st.key] = true
			todo = append(todo, st)
		}
	}
	errs := make([]error, len(todo))
	workers := min(runtime.GOMAXPROCS(0), len(todo))
	var wg sync.WaitGroup
	next := 0
	for range workers {
		wg.Go(func() {
			for {
				s.mu.Lock()
				i := next
				next++
				s.mu.Unlock()
				if i >= len(todo) {
					return
				}
				st := todo[i]
				e, err := s.eval(st.layout)
				if err != nil {
					errs[i] = fmt.Errorf("layout: evaluating %s: %w", st.shape, err)
					continue
				}
				st.energy = e
			}
		})
	}
	wg.Wait()
	if err := errors.Join(errs...); err != nil {
		return 0, err
	}
	for _, st := range todo {
		st.cable = ExtraCableM(st.layout, s.p.Positions, s.p.ReachM)
		st.score = st.energy - s.opt.CableWeightWh*st.cable
		s.cache[st.key] = st.clone()
	}
	for _, st := range sts {
		if c, ok := s.cache[st.key]; ok {
			st.energy, st.cable, st.score = c.energy, c.cable, c.score
		}
	}
	s.evals += len(todo)
	if s.opt.Progress != nil {
		s.opt.Progress(min(s.evals, s.opt.MaxEvals), s.opt.MaxEvals)
	}
	return len(todo), nil
}

// starts builds the shape's starting states.
func (s *searcher) starts(sh Shape) []state {
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
	return []state{
		mk(StartClustered, s.cluster(used, lengths)),
		mk(StartRoofOrder, fill(roof)),
		mk(StartShadeRank, fill(byShade)),
	}
}

// given turns a caller's layout into a search state: inputs ordered as shapes are (more
// modules first, then longer strings), strings in slot order. It reports false for a layout
// outside the bounds or using a module twice.
func (s *searcher) given(l electric.Layout) (state, bool) {
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
	if len(ins) == 0 || len(ins) > s.p.Inputs {
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
	if len(st.pool) > 0 && !s.opt.LeaveOut {
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
	d := 0.0
	for i := range a {
		d += sq(a[i] - b[i])
	}
	return d
}

// improve runs the local search from st until no evaluated neighbour improves or the
// number of evaluations reaches stop.
func (s *searcher) improve(st state, stop int) error {
	cur := st.clone()
	cur.canon()
	if err := s.score(&cur); err != nil {
		return err
	}
	for s.evals < stop {
		props := s.neighbours(&cur, min(s.batch(), stop-s.evals))
		if len(props) == 0 {
			return nil
		}
		ptrs := make([]*state, len(props))
		for i := range props {
			ptrs[i] = &props[i]
		}
		if _, err := s.scoreAll(ptrs); err != nil {
			return err
		}
		best := -1
		for i := range props {
			// A strict improvement beyond rounding, so that equal layouts never cycle.
			if props[i].score > cur.score+1e-9*math.Abs(cur.score) && (best < 0 || props[i].score > props[best].score) {
				best = i
			}
		}
		if best < 0 {
			return nil
		}
		cur = props[best].clone()
		cur.canon()
		cur.energy, cur.cable, cur.score = props[best].energy, props[best].cable, props[best].score
	}
	return nil
}

// batch is how many neighbours a round evaluates: enough to cover a small roof's whole
// neighbourhood, and a multiple of the cores.
func (s *searcher) batch() int { return max(24, 4*runtime.GOMAXPROCS(0)) }

// neighbours proposes up to k unevaluated swaps and moves from cur, most promising first.
// A swap's promise is how much closer it brings both modules to the centres of their new
// strings (squared feature distances, each module's own contribution left out of its old
// string's centre); a move's is the same for one module.
func (s *searcher) neighbours(cur *state, k int) []state {
	ns := len(cur.strs)
	// Squared distances through dot products, ‖x − c‖² = ‖x‖² − 2x·c + ‖c‖², so that each
	// round costs one pass over the features (modules × strings dot products) and every
	// proposal after it is O(1).
	cent := make([][]float64, ns)
	cc := make([]float64, ns) // ‖Σ members‖²
	for i, str := range cur.strs {
		c := make([]float64, len(s.feat[0]))
		for _, m := range str {
			for j, x := range s.feat[m] {
				c[j] += x
			}
		}
		cent[i] = c
		cc[i] = dot(c, c)
	}
	xc := make([][]float64, s.n) // module · string sum
	for m := range s.n {
		xc[m] = make([]float64, ns)
		for i := range ns {
			xc[m][i] = dot(s.feat[m], cent[i])
		}
	}
	// distance from module m to string i's centre, m itself taken out if it is a member.
	dTo := func(m, i int, member bool) float64 {
		L := float64(len(cur.strs[i]))
		xx := s.norm[m]
		if !member {
			return xx - 2*xc[m][i]/L + cc[i]/(L*L)
		}
		if L <= 1 {
			return 0
		}
		rest := cc[i] - 2*xc[m][i] + xx // ‖Σ others‖²
		return xx - 2*(xc[m][i]-xx)/(L-1) + rest/((L-1)*(L-1))
	}
	type prop struct {
		gain float64
		kind int // 0 swap, 1 move, 2 pool swap, 3 drop, 4 add
		a, b int // modules (or -1)
		i, j int // strings (j = -1: pool)
	}
	var props []prop
	alone := func(i int) bool { return cur.shape[cur.inputs[i]].Strings == 1 }
	for i := range ns {
		for j := i + 1; j < ns; j++ {
			for _, a := range cur.strs[i] {
				for _, b := range cur.strs[j] {
					if s.alike[a] == s.alike[b] {
						continue // nothing to gain from swapping look-alikes
					}
					g := dTo(a, i, true) + dTo(b, j, true) - dTo(a, j, false) - dTo(b, i, false)
					props = append(props, prop{g, 0, a, b, i, j})
				}
			}
		}
	}
	b := s.p.Bounds
	for i := range ns {
		if !alone(i) || len(cur.strs[i])-1 < b.MinSeries {
			continue
		}
		for j := range ns {
			if j == i || !alone(j) || len(cur.strs[j])+1 > b.MaxSeries {
				continue
			}
			for _, a := range cur.strs[i] {
				props = append(props, prop{dTo(a, i, true) - dTo(a, j, false), 1, a, -1, i, j})
			}
		}
	}
	if s.opt.LeaveOut || len(cur.pool) > 0 {
		for i := range ns {
			for _, a := range cur.strs[i] {
				for _, c := range cur.pool {
					props = append(props, prop{dTo(a, i, true) - dTo(c, i, false), 2, a, c, i, -1})
				}
				if s.opt.LeaveOut && alone(i) && len(cur.strs[i])-1 >= b.MinSeries {
					props = append(props, prop{dTo(a, i, true), 3, a, -1, i, -1})
				}
			}
			if alone(i) && len(cur.strs[i])+1 <= b.MaxSeries {
				for _, c := range cur.pool {
					props = append(props, prop{-dTo(c, i, false), 4, -1, c, i, -1})
				}
			}
		}
	}
	slices.SortStableFunc(props, func(x, y prop) int {
		return cmp.Or(cmp.Compare(y.gain, x.gain), cmp.Compare(x.kind, y.kind), cmp.Compare(x.a, y.a), cmp.Compare(x.b, y.b), cmp.Compare(x.j, y.j))
	})
	var out []state
	for _, pr := range props {
		if len(out) >= k {
			break
		}
		nx := cur.clone()
		nx.start = cur.start
		switch pr.kind {
		case 0:
			replace(nx.strs[pr.i], pr.a, pr.b)
			replace(nx.strs[pr.j], pr.b, pr.a)
		case 1:
			nx.strs[pr.i] = remove(nx.strs[pr.i], pr.a)
			nx.strs[pr.j] = append(nx.strs[pr.j], pr.a)
			nx.shape[nx.inputs[pr.i]].Length--
			nx.shape[nx.inputs[pr.j]].Length++
		case 2:
			replace(nx.strs[pr.i], pr.a, pr.b)
			replace(nx.pool, pr.b, pr.a)
		case 3:
			nx.strs[pr.i] = remove(nx.strs[pr.i], pr.a)
			nx.pool = append(nx.pool, pr.a)
			nx.shape[nx.inputs[pr.i]].Length--
		case 4:
			nx.strs[pr.i] = append(nx.strs[pr.i], pr.b)
			nx.pool = remove(nx.pool, pr.b)
			nx.shape[nx.inputs[pr.i]].Length++
		}
		nx.canon()
		if _, ok := s.cache[nx.key]; ok {
			continue // evaluated before: it did not beat what we had then, or we came from it
		}
		out = append(out, nx)
	}
	return out
}

func replace(s []int, old, new int) {
	s[slices.Index(s, old)] = new
}

func remove(s []int, m int) []int {
	i := slices.Index(s, m)
	return slices.Delete(s, i, i+1)
}

// ranked returns the distinct evaluated layouts, best first, at most Keep.
func (s *searcher) ranked() []Candidate {
	all := make([]state, 0, len(s.cache))
	for _, st := range s.cache {
		all = append(all, st)
	}
	slices.SortFunc(all, func(a, b state) int {
		return cmp.Or(cmp.Compare(b.score, a.score), cmp.Compare(a.key, b.key))
	})
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
