package electric

import (
	"cmp"
	"container/list"
	"math"
	"runtime"
	"slices"
	"strconv"
	"sync"
	"sync/atomic"
)

// inputYear is one input's share of a year (or the share of the modules with converters of
// their own): per step the DC power at its operating point, that power times the operating
// voltage, and its modules' unshaded power; and the year's loss terms of the input. The
// inputs of a layout are independent until the inverter adds their power, so a layout's year
// is the sum of its inputs' shares, and a layout search that changes one or two inputs at a
// time recomputes only those.
type inputYear struct {
	key       string
	p, pv, un []float64 // per step: W, W·V, W
	// Per step, for string inputs: the global maximum, the maximum inside the window and the
	// maximum inside the window and the current limit (W), from which the loss terms are
	// summed; a neighbour's input that equals this one at a step takes them from here.
	pg, pw, pc []float64
	// volts reports whether pv holds an operating voltage (string inputs) or not
	// (module-level converters, which set their own).
	volts                                    bool
	globalWh, windowWh, currentWh, trackerWh float64
}

// EvalCache keeps the inputs' shares of the year from recent evaluations, so that
// EvaluateCached recomputes only the inputs a layout changes. The zero value is ready for use
// and keeps up to 64 MB; it is safe for concurrent use and may serve several years,
// inverters and options (they are part of each entry's key). Entries are dropped first in,
// first out; what is kept never changes a result, only how long it takes.
type EvalCache struct {
	// MaxBytes bounds the memory the inputs' entries take; zero means 64 MB.
	MaxBytes int64
	// MaxStringBytes bounds the memory the strings' years take (see stringYear); zero means
	// 160 MB, room for the strings of a large roof's layout and the parents of its neighbours.
	MaxStringBytes int64

	mu    sync.Mutex
	m     map[cacheKey]*inputYear
	fifo  []cacheKey
	bytes int64
	hits  int64
	calls int64
	// reused counts input-steps read from a parent input (see inputJob.parent), thinned those
	// read from a thinned year's (inputJob.thin).
	reused, thinned int64
	strs            stringCache
}

type cacheKey struct {
	y   *Year
	key string
}

// Stats returns how many inputs were asked for and how many of them were found in the cache.
func (c *EvalCache) Stats() (lookups, hits int64) {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.calls, c.hits
}

func (c *EvalCache) get(k cacheKey) *inputYear {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.calls++
	pt := c.m[k]
	if pt != nil {
		c.hits++
	}
	return pt
}

func (c *EvalCache) put(k cacheKey, pt *inputYear) *inputYear {
	c.mu.Lock()
	defer c.mu.Unlock()
	if old := c.m[k]; old != nil {
		return old // computed meanwhile by another goroutine: the same values
	}
	if c.m == nil {
		c.m = map[cacheKey]*inputYear{}
	}
	limit := c.MaxBytes
	if limit <= 0 {
		limit = 64 << 20
	}
	size := pt.bytes()
	for c.bytes+size > limit && len(c.fifo) > 0 {
		old := c.fifo[0]
		c.fifo = c.fifo[1:]
		if e := c.m[old]; e != nil {
			c.bytes -= e.bytes()
			delete(c.m, old)
		}
	}
	c.m[k] = pt
	c.fifo = append(c.fifo, k)
	c.bytes += size
	return pt
}

// bytes is what the entry's arrays take.
func (pt *inputYear) bytes() int64 {
	return 8 * int64(len(pt.p)+len(pt.pv)+len(pt.un)+len(pt.pg)+len(pt.pw)+len(pt.pc))
}

// peek returns a kept entry without counting a lookup.
func (c *EvalCache) peek(k cacheKey) *inputYear {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.m[k]
}

// checkConverters reports a module with a converter of its own that is out of range, listed
// twice or also in the layout's strings.
func (y *Year) checkConverters(l Layout, conv []int) error {
	if len(conv) == 0 {
		return nil
	}
	used := make([]bool, y.n)
	for _, in := range l.Inputs {
		for _, str := range in {
			for _, k := range str {
				used[k] = true
			}
		}
	}
	for _, k := range conv {
		if k < 0 || k >= y.n {
			return outOfModelf("converters_on", "module %d out of range 0..%d", k, y.n-1)
		}
		if used[k] {
			return outOfModelf("converters_on", "module %d is in a string or listed twice", k)
		}
		used[k] = true
	}
	return nil
}

// parts returns the layout's shares of the year, one per input (and one for the modules
// with converters of their own), in an order that depends only on their content, so that
// their sum does not depend on the layout's order of inputs.
func (y *Year) parts(l Layout, inv Inverter, opt EvalOptions, c *EvalCache) []*inputYear {
	prefix := strconv.AppendInt(nil, int64(opt.Tracker), 10)
	prefix = strconv.AppendBool(append(prefix, ' '), opt.ModuleLevel)
	for _, x := range []float64{opt.ModuleLevelEff, inv.MPPTMinV, inv.MPPTMaxV, inv.MaxInputCurrentA} {
		prefix = strconv.AppendUint(append(prefix, ' '), math.Float64bits(x), 16)
	}
	prefix = append(prefix, ':')
	var out []*inputYear
	var todo []inputJob
	for _, in := range l.Inputs {
		if len(in) == 0 {
			continue
		}
		canon := canonInput(in)
		key := string(appendInputKey(slices.Clone(prefix), canon))
		k := cacheKey{y, key}
		var pt *inputYear
		if c != nil {
			pt = c.get(k)
		}
		if pt != nil {
			out = append(out, pt)
			continue
		}
		var strs []stringRecipe
		if c != nil && !opt.ModuleLevel {
			for _, str := range canon {
				strs = append(strs, c.stringRecipe(y, str))
			}
		}
		job := inputJob{in: canon, strs: strs, key: key}
		if opt.Tracker == GlobalMPP && strs != nil {
			job.parent, job.swaps = c.parentInput(y, prefix, strs)
			if t := y.thin.Load(); t != nil {
				if pt := c.peek(cacheKey{t, key}); pt != nil && pt.pg != nil {
					job.thin, job.stride = pt, t.stride
				}
			}
		}
		todo = append(todo, job)
	}
	pts, reused, thinned := y.inputParts(todo, inv, opt)
	if c != nil && reused+thinned > 0 {
		c.mu.Lock()
		c.reused += reused
		c.thinned += thinned
		c.mu.Unlock()
	}
	for j, pt := range pts {
		pt.key = todo[j].key
		if c != nil {
			pt = c.put(cacheKey{y, pt.key}, pt)
		}
		out = append(out, pt)
	}
	if len(opt.ConvertersOn) > 0 && !opt.ModuleLevel {
		conv := slices.Sorted(slices.Values(opt.ConvertersOn))
		pt := y.converterPart(conv, opt.ModuleLevelEff)
		pt.key = string(appendInputKey(append(slices.Clone(prefix), 'c'), [][]int{conv}))
		out = append(out, pt)
	}
	slices.SortFunc(out, func(a, b *inputYear) int { return cmp.Compare(a.key, b.key) })
	return out
}

// canonInput returns the input's strings with their modules sorted, strings sorted.
func canonInput(in [][]int) [][]int {
	out := make([][]int, len(in))
	for i, s := range in {
		out[i] = slices.Sorted(slices.Values(s))
	}
	slices.SortFunc(out, slices.Compare)
	return out
}

func appendInputKey(b []byte, in [][]int) []byte {
	for i, s := range in {
		if i > 0 {
			b = append(b, '/')
		}
		for j, k := range s {
			if j > 0 {
				b = append(b, ',')
			}
			b = strconv.AppendInt(b, int64(k), 10)
		}
	}
	return b
}

// inputJob is an input to compute: its strings (canonical order), how to read each (nil, or
// recipes; see stringYear) and its cache key.
type inputJob struct {
	in   [][]int
	strs []stringRecipe
	key  string
	// parent is a kept input whose strings are this one's but for the modules swapped in
	// swaps (in, out): at a step where every swapped pair shares a curve the two inputs are
	// the same, and the step is read from parent.
	parent *inputYear
	swaps  [][2]int
	// thin is the same input's share of the year thinned to every stride-th step (see
	// Year.Thin), kept from a screening: step j there is step j·stride here, to the bit (the
	// same curves, grid and sums; a global tracker's step depends on nothing else).
	thin   *inputYear
	stride int
}

// parentInput finds, for an input whose strings' recipes are strs, a kept input of the same
// year and options whose strings are the recipes' parents, each the same string or one module
// swapped: what a layout search's swap leaves of its parent. Strings that grew or shrank give
// none. The order of the strings does not matter: strings are put in parallel the same to the
// bit in any order (see merger.parallel).
func (c *EvalCache) parentInput(y *Year, prefix []byte, strs []stringRecipe) (*inputYear, [][2]int) {
	var swaps [][2]int
	parents := make([][]int, len(strs))
	for b, r := range strs {
		if r.parent == nil {
			return nil, nil
		}
		if r.padd >= 0 || r.psub >= 0 {
			if r.padd < 0 || r.psub < 0 {
				return nil, nil
			}
			swaps = append(swaps, [2]int{r.padd, r.psub})
		}
		parents[b] = r.parent.mods
	}
	if len(swaps) == 0 {
		return nil, nil
	}
	slices.SortFunc(parents, slices.Compare)
	key := string(appendInputKey(slices.Clone(prefix), parents))
	pt := c.peek(cacheKey{y, key})
	if pt == nil || pt.pg == nil {
		return nil, nil
	}
	return pt, swaps
}

// inputParts computes the inputs' shares of the year: at every step the strings' curves added
// (series) and put in parallel, the operating point the tracker finds inside the window and
// the current limit, and the loss terms. The inputs go through the steps together, so that a
// step's curves are read from memory once for all of them; each input's share is what it
// would be alone.
func (y *Year) inputParts(jobs []inputJob, inv Inverter, opt EvalOptions) (pts []*inputYear, reused, thinned int64) {
	if len(jobs) == 0 {
		return nil, 0, 0
	}
	pts = make([]*inputYear, len(jobs))
	for j := range jobs {
		pts[j] = &inputYear{p: make([]float64, y.steps), pv: make([]float64, y.steps), un: make([]float64, y.steps), volts: !opt.ModuleLevel}
		if !opt.ModuleLevel {
			pt := pts[j]
			pt.pg, pt.pw, pt.pc = make([]float64, y.steps), make([]float64, y.steps), make([]float64, y.steps)
		}
	}
	// The steps are independent, but for a climbing tracker, which starts from the step
	// before: runs of steps go to all cores (a layout search often waits on one evaluation),
	// and the year's totals are then summed in step order. A climbing tracker's inputs go
	// through the year each on its own. A parent input's steps (see inputJob) serve only a
	// global tracker's.
	if opt.Tracker == LocalClimb {
		// The inputs go through the year on their own instead, one core each.
		var wg sync.WaitGroup
		for j := range jobs {
			wg.Go(func() { y.stepParts(jobs[j:j+1], pts[j:j+1], inv, opt, 0, y.steps) })
		}
		wg.Wait()
	} else {
		var nr, nt atomic.Int64
		y.eachPart(func(lo, hi int) {
			r, t := y.stepParts(jobs, pts, inv, opt, lo, hi)
			nr.Add(r)
			nt.Add(t)
		})
		reused, thinned = nr.Load(), nt.Load()
	}
	for _, pt := range pts {
		for s := range y.steps {
			h := float64(y.hours[s])
			if opt.ModuleLevel {
				pt.globalWh += pt.p[s] * h
				continue
			}
			pG, pW, pC := pt.pg[s], pt.pw[s], pt.pc[s]
			pt.globalWh += pG * h
			pt.windowWh += (pG - pW) * h
			pt.currentWh += (pW - pC) * h
			pt.trackerWh += (pC - pt.p[s]) * h
		}
	}
	return pts, reused, thinned
}

// minPartSteps is the fewest steps worth a goroutine of their own (see eachPart).
const minPartSteps = 256

// eachPart calls do on runs of steps lo..hi−1 that cover the year, on all cores when the year
// is long enough, and returns when all are done.
func (y *Year) eachPart(do func(lo, hi int)) {
	parts := max(1, min(runtime.GOMAXPROCS(0), y.steps/minPartSteps))
	if parts == 1 {
		do(0, y.steps)
		return
	}
	var wg sync.WaitGroup
	for q := range parts {
		wg.Go(func() { do(q*y.steps/parts, (q+1)*y.steps/parts) })
	}
	wg.Wait()
}

// stepParts fills the inputs' shares pts at steps lo..hi−1 (see inputParts) and returns how
// many input-steps it read from a parent input and from a thinned year.
func (y *Year) stepParts(jobs []inputJob, pts []*inputYear, inv Inverter, opt EvalOptions, lo, hi int) (reused, thinned int64) {
	prevV := make([]float64, len(jobs))
	for j := range prevV {
		prevV[j] = math.NaN()
	}
	vmin, vmax, imax := inv.MPPTMinV, inv.MPPTMaxV, inv.MaxInputCurrentA
	var sc evalScratch
	for s := lo; s < hi; s++ {
		row := s * y.n
		sc.gi = y.grid(s)
		for j, job := range jobs {
			pt := pts[j]
			if th := job.thin; th != nil && s%job.stride == 0 {
				t := s / job.stride
				pt.pg[s], pt.pw[s], pt.pc[s] = th.pg[t], th.pw[t], th.pc[t]
				pt.p[s], pt.pv[s], pt.un[s] = th.p[t], th.pv[t], th.un[t]
				thinned++
				continue
			}
			var un float64
			for _, str := range job.in {
				for _, k := range str {
					un += float64(y.unshadedW[row+k])
				}
			}
			pt.un[s] = un
			if opt.ModuleLevel {
				var dc float64
				for _, str := range job.in {
					for _, k := range str {
						dc += float64(y.curveMPP[y.modCurve[row+k]]) * opt.ModuleLevelEff
					}
				}
				pt.p[s] = dc
				continue
			}
			if par := job.parent; par != nil && y.sameAt(row, job.swaps) {
				pt.pg[s], pt.pw[s], pt.pc[s] = par.pg[s], par.pw[s], par.pc[s]
				pt.p[s], pt.pv[s] = par.p[s], par.pv[s]
				reused++
				continue
			}
			ns, same := y.stringSums(&sc, s, job.in, job.strs)
			var is, vs []float64
			var pG, vG, iG float64
			pruned := false
			if (ns == 2 || ns == 3) && !same && opt.Tracker == GlobalMPP {
				// Two or three strings, the usual inputs: the maximum from the part of their
				// merged curve that can hold it. The window and the current limit, when they
				// act, need the whole curve.
				pG, vG, iG, pruned = sc.m.parallelMaxFree(sc.gi, sc.sums[:ns])
				pruned = pruned && vG >= vmin && vG <= vmax && iG <= imax
			}
			if !pruned {
				is, vs = sc.inputPolyline(ns, same)
				pG, vG, iG = polyMaxFree(is, vs)
			}
			pW, pC, vC := pG, pG, vG
			// Usually the global maximum is inside the window and the current limit: then the
			// constrained searches are not needed.
			if vG < vmin || vG > vmax {
				pW, _, _ = polyMax(is, vs, vmin, vmax, math.Inf(1))
				pC, vC, _ = polyMax(is, vs, vmin, vmax, imax)
			} else if iG > imax {
				pC, vC, _ = polyMax(is, vs, vmin, vmax, imax)
			}
			pt.pg[s], pt.pw[s], pt.pc[s] = pG, pW, pC
			p, v := pC, vC
			if opt.Tracker == LocalClimb {
				p, v = climb(is, vs, prevV[j], vmin, vmax, imax)
				prevV[j] = v
				if p <= 0 {
					prevV[j] = math.NaN()
				}
			}
			pt.p[s] = p
			pt.pv[s] = p * v
		}
	}
	return reused, thinned
}

// sameAt reports whether every pair of swapped modules shares a curve at the step starting at
// row: the strings' voltages are then those of the parent's.
func (y *Year) sameAt(row int, swaps [][2]int) bool {
	for _, sw := range swaps {
		if y.modCurve[row+sw[0]] != y.modCurve[row+sw[1]] {
			return false
		}
	}
	return true
}

// converterPart is the share of modules with converters of their own: each at its own
// maximum power times the converters' efficiency.
func (y *Year) converterPart(mods []int, eff float64) *inputYear {
	pt := &inputYear{p: make([]float64, y.steps), pv: make([]float64, y.steps), un: make([]float64, y.steps)}
	for s := range y.steps {
		h := float64(y.hours[s])
		row := s * y.n
		var dc, un float64
		for _, k := range mods {
			dc += float64(y.curveMPP[y.modCurve[row+k]]) * eff
			un += float64(y.unshadedW[row+k])
		}
		pt.p[s], pt.un[s] = dc, un
		pt.globalWh += dc * h
	}
	return pt
}

// stringYear is one string's voltages over the whole year: at every step, on the step's
// current grid, the sum of its modules' curves (units of voltQuantum), laid out as Year.gridI.
// A layout search's neighbour differs from its parent in one or two strings, each one module
// in and one out (or only one of the two): such a string is read as its parent's voltages plus
// one module's curve less another's, three passes over a step instead of one a module. A
// string's year is built (v) the second time it is asked for, itself or as a parent: a string
// asked for once (most of a search's starts) is only added up, as without a cache.
type stringYear struct {
	y    *Year
	mods []int // sorted
	key  string
	elem *list.Element // in the cache's use order

	// Guarded by the cache's lock: base, add and sub say the string is base plus module add
	// less module sub (−1: none); a nil base: added up module by module.
	base     *stringYear
	add, sub int
	derived  []*stringYear // the kept strings whose base this is
	counted  bool          // v's bytes are in the cache's total
	asked    int           // times asked for, itself or as a parent
	// near is, for a string with no base, a built string several modules away to read it from
	// (nil: none); nearUsers are the kept strings whose near reads this one.
	near      *nearYear
	nearUsers []*stringYear
	// indexed says the string is in the cache's index of built strings by module; mark and
	// hits are nearest's scratch.
	indexed bool
	mark    uint64
	hits    int

	once  sync.Once
	ready atomic.Bool
	v     []int32 // the year's voltages, once ready (see narrow); never written after
}

// nominalBytes is what a kept string costs besides its voltages.
const nominalBytes = 256

// stringRecipe is how stringSums reads a string at a step: a year of voltages (v), plus
// module add and less module sub (−1: none); a nil v: add the string up, or read it from near
// where that is cheaper.
type stringRecipe struct {
	v        []int32
	add, sub int
	near     *nearYear
	// parent is the kept string this one is (padd and psub −1) or differs from by module padd
	// in and module psub out (either −1: moved in or out only), whether or not its year is
	// built; nil: none.
	parent     *stringYear
	padd, psub int
}

// narrow writes the sums into v, held in int32, and reports whether each fits: a string's
// voltage in units of voltQuantum fits for strings up to 2048 V, more than any system's
// voltage allows. A string that does not fit is not kept, and is added up each time.
func narrow(v []int32, sums []int64) bool {
	v = v[:len(sums)]
	for k, x := range sums {
		if x != int64(int32(x)) {
			return false
		}
		v[k] = int32(x)
	}
	return true
}

// nearYear reads a string from a built one several modules away: the built string's year
// (from.v, never written once built) plus the curves of the modules in adds, less those of the
// modules in subs. A string of
// modules each lit a little differently (a large roof's modules see their own share of the
// sky) has nearly as many distinct curves at a step as modules, and a search's new strings
// often share most of their modules with one built before.
type nearYear struct {
	from       *stringYear
	adds, subs []int
}

// stringCache keeps strings, the least recently used dropped first, and finds for a string a
// kept one that differs by a module moved in, moved out or swapped.
type stringCache struct {
	byKey  map[stringKey]*stringYear
	minus  map[stringKey][]*stringYear // key of the string less one module → the strings
	order  list.List                   // most recently used first
	bytes  int64
	built  int64 // years built
	recipe int64 // strings read from a parent one module away
	near   int64 // strings read from a built string several modules away
	// byMod lists the built strings kept, by each of their modules; gen and cand are
	// nearest's scratch.
	byMod map[modKey][]*stringYear
	gen   uint64
	cand  []*stringYear
}

type modKey struct {
	y *Year
	k int
}

type stringKey struct {
	y   *Year
	key string
}

// modsKey encodes sorted module indices, leaving out the one at position skip (−1: none).
func modsKey(buf []byte, mods []int, skip int) []byte {
	buf = buf[:0]
	for j, k := range mods {
		if j != skip {
			buf = append(buf, byte(k), byte(k>>8), byte(k>>16), byte(k>>24))
		}
	}
	return buf
}

// StringStats returns how many strings' years were built and how many strings were read
// from a parent one module away.
func (c *EvalCache) StringStats() (built, fromParent int64) {
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.strs.built, c.strs.recipe
}

// stringRecipe returns how to read the string (sorted module indices) of year y at each
// step, and keeps the string for later lookups.
func (c *EvalCache) stringRecipe(y *Year, mods []int) stringRecipe {
	buf := modsKey(nil, mods, -1)
	key := string(buf)
	c.mu.Lock()
	cs := &c.strs
	if cs.byKey == nil {
		cs.byKey = map[stringKey]*stringYear{}
		cs.minus = map[stringKey][]*stringYear{}
	}
	if sy := cs.byKey[stringKey{y, key}]; sy != nil {
		cs.order.MoveToFront(sy.elem)
		sy.asked++
		base, add, sub, asked, near := sy.base, sy.add, sy.sub, sy.asked, sy.near
		c.mu.Unlock()
		if !sy.ready.Load() && asked >= 2 {
			c.build(sy, base, add, sub, near)
		}
		self := stringRecipe{add: -1, sub: -1, parent: sy, padd: -1, psub: -1}
		if sy.ready.Load() {
			self.v = sy.v
		} else if base != nil {
			self.v, self.add, self.sub = base.v, add, sub
		}
		if self.v == nil {
			self.near = near
		}
		return self
	}
	// Of the kept strings one module away, a built one is read at once, one asked for before
	// will be built now, any other only counts the asking: the first of the best kind.
	var b *stringYear
	add, sub := -1, -1
	rank := func(e *stringYear) int {
		switch {
		case e.ready.Load():
			return 2
		case e.asked >= 1:
			return 1
		}
		return 0
	}
	consider := func(e *stringYear, a, s int) {
		if b == nil || rank(e) > rank(b) {
			b, add, sub = e, a, s
		}
	}
	for j := range mods {
		k := string(modsKey(buf, mods, j))
		if e := cs.byKey[stringKey{y, k}]; e != nil {
			consider(e, mods[j], -1) // one module moved in
		}
		for _, e := range cs.minus[stringKey{y, k}] {
			if x, ok := oneMore(e.mods, mods, mods[j]); ok {
				consider(e, mods[j], x) // one module swapped
			}
		}
		if b != nil && rank(b) == 2 {
			break
		}
	}
	if b == nil || rank(b) < 2 {
		for _, e := range cs.minus[stringKey{y, key}] {
			if x, ok := oneMore(e.mods, mods, -1); ok {
				consider(e, -1, x) // one module moved out
			}
		}
	}
	out := stringRecipe{add: -1, sub: -1, parent: b, padd: add, psub: sub}
	var bb *stringYear
	var bn *nearYear
	ba, bs := -1, -1
	if b != nil {
		cs.order.MoveToFront(b.elem)
		b.asked++
		bb, ba, bs, bn = b.base, b.add, b.sub, b.near
		// Building a year costs about what adding the string up over the year costs, and
		// pays only when it is read again: a parent asked for the first time is not built.
		if b.asked < 2 && !b.ready.Load() {
			b = nil
		}
	}
	var near *nearYear
	if b == nil {
		near = cs.nearest(y, mods)
	}
	c.mu.Unlock()
	if b != nil {
		c.build(b, bb, ba, bs, bn)
	}
	sy := &stringYear{y: y, mods: slices.Clone(mods), key: key, base: b, add: add, sub: sub, near: near}
	if b == nil {
		sy.add, sy.sub = -1, -1
	}
	c.mu.Lock()
	c.putString(sy)
	if b != nil {
		c.strs.recipe++
	}
	if near != nil {
		c.strs.near++
	}
	c.mu.Unlock()
	if b != nil {
		out.v, out.add, out.sub = b.v, add, sub
	}
	out.near = near
	return out
}

// KeepStrings builds now the years of the layout's strings that are not built yet, however
// often they were asked for, so that evaluations of the layout, and of layouts whose strings
// are near its (a few modules in or out, see nearYear), read them instead of adding them up:
// what a survey does with its best layout after the search.
func (c *EvalCache) KeepStrings(y *Year, l Layout) {
	for _, in := range l.Inputs {
		for _, str := range in {
			if len(str) == 0 {
				continue
			}
			mods := slices.Sorted(slices.Values(str))
			c.stringRecipe(y, mods) // finds or keeps it
			c.mu.Lock()
			sy := c.strs.byKey[stringKey{y, string(modsKey(nil, mods, -1))}]
			var base *stringYear
			var near *nearYear
			add, sub := -1, -1
			if sy != nil {
				base, add, sub, near = sy.base, sy.add, sy.sub, sy.near
			}
			c.mu.Unlock()
			if sy != nil && !sy.ready.Load() {
				c.build(sy, base, add, sub, near)
			}
		}
	}
}

// build computes sy's year once, from base (plus add, less sub) when base's year is ready,
// else from near where that is cheaper, else module by module; it counts its bytes and
// indexes it by module if sy is still kept.
func (c *EvalCache) build(sy, base *stringYear, add, sub int, near *nearYear) {
	did := false
	sy.once.Do(func() {
		did = true
		y := sy.y
		v := make([]int32, len(y.gridI))
		fromBase := base != nil && base.ready.Load() && base.v != nil
		var fits atomic.Bool
		fits.Store(true)
		// Every step on its own: runs of steps on all cores, as readers wait for the year.
		y.eachPart(func(lo, hi int) {
			var pr, dp []curveCount
			var sum []int64
			for s := lo; s < hi; s++ {
				off, np := int(y.gridOff[s]), int(y.gridOff[s+1]-y.gridOff[s])
				row := s * y.n
				sum = growInt64(sum, np)
				switch {
				case !fromBase && near != nil:
					pr, dp = y.addNear(sum, off, row, sy.mods, near, pr, dp)
				case !fromBase:
					clear(sum)
					pr = y.addString(sum, row, sy.mods, pr)
				default:
					var a, b []int32
					if add >= 0 {
						a = y.curve(y.modCurve[row+add], np)
					}
					if sub >= 0 {
						b = y.curve(y.modCurve[row+sub], np)
					}
					plusMinus(sum, base.v[off:off+np], a, b)
				}
				if !narrow(v[off:off+np], sum) {
					fits.Store(false)
				}
			}
		})
		if fits.Load() {
			sy.v = v
		}
		sy.ready.Store(true)
	})
	if !did {
		return
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	c.strs.built++
	if c.strs.byKey[stringKey{sy.y, sy.key}] == sy && !sy.counted && sy.v != nil {
		sy.counted = true
		c.strs.bytes += int64(len(sy.v)) * 4
		c.strs.index(sy)
		c.trimStrings()
	}
}

// oneMore reports the one module of big (sorted) that is not in small (sorted) once skip is
// left out of small, if big is small less skip plus that module.
func oneMore(big, small []int, skip int) (int, bool) {
	extra, found := 0, false
	i := 0
	for _, k := range big {
		for i < len(small) && small[i] == skip {
			i++
		}
		if i < len(small) && small[i] == k {
			i++
			continue
		}
		if found {
			return 0, false
		}
		extra, found = k, true
	}
	for i < len(small) && small[i] == skip {
		i++
	}
	return extra, found && i == len(small)
}

// putString keeps sy (unless another goroutine kept the same string meanwhile). c.mu is held.
func (c *EvalCache) putString(sy *stringYear) {
	cs := &c.strs
	k := stringKey{sy.y, sy.key}
	if cs.byKey[k] != nil {
		return
	}
	sy.elem = cs.order.PushFront(sy)
	cs.byKey[k] = sy
	cs.bytes += nominalBytes
	var buf []byte
	for j := range sy.mods {
		mk := stringKey{sy.y, string(modsKey(buf, sy.mods, j))}
		cs.minus[mk] = append(cs.minus[mk], sy)
	}
	if sy.base != nil {
		sy.base.derived = append(sy.base.derived, sy)
	}
	if sy.near != nil {
		sy.near.from.nearUsers = append(sy.near.from.nearUsers, sy)
	}
	c.trimStrings()
}

// index lists a built string under each of its modules, for nearest. c.mu is held.
func (cs *stringCache) index(sy *stringYear) {
	if cs.byMod == nil {
		cs.byMod = map[modKey][]*stringYear{}
	}
	for _, k := range sy.mods {
		mk := modKey{sy.y, k}
		cs.byMod[mk] = append(cs.byMod[mk], sy)
	}
	sy.indexed = true
}

// nearest returns how to read the string mods (sorted) from the built string with the fewest
// modules in and out, if those are at most half the string's modules: nil when there is none.
// Each built string sharing a module is counted once per shared module. c.mu is held.
func (cs *stringCache) nearest(y *Year, mods []int) *nearYear {
	if len(cs.byMod) == 0 {
		return nil
	}
	cs.gen++
	for _, k := range mods {
		for _, e := range cs.byMod[modKey{y, k}] {
			if e.mark != cs.gen {
				e.mark, e.hits = cs.gen, 0
				cs.cand = append(cs.cand, e)
			}
			e.hits++
		}
	}
	var best *stringYear
	bd := len(mods)/2 + 1
	for _, e := range cs.cand {
		if d := len(mods) + len(e.mods) - 2*e.hits; d < bd {
			best, bd = e, d
		}
	}
	clear(cs.cand)
	cs.cand = cs.cand[:0]
	if best == nil {
		return nil
	}
	nb := &nearYear{from: best}
	// Both sorted: one merge gives the modules in and out.
	i, j := 0, 0
	for i < len(mods) || j < len(best.mods) {
		switch {
		case j == len(best.mods) || i < len(mods) && mods[i] < best.mods[j]:
			nb.adds = append(nb.adds, mods[i])
			i++
		case i == len(mods) || best.mods[j] < mods[i]:
			nb.subs = append(nb.subs, best.mods[j])
			j++
		default:
			i++
			j++
		}
	}
	return nb
}

// trimStrings drops the least recently used strings over the budget. c.mu is held.
func (c *EvalCache) trimStrings() {
	limit := c.MaxStringBytes
	if limit <= 0 {
		limit = 160 << 20
	}
	cs := &c.strs
	for cs.bytes > limit && cs.order.Len() > 1 {
		c.dropString(cs.order.Back().Value.(*stringYear))
	}
}

// dropString forgets a kept string. Strings read from it are then added up module by module;
// what a reader already holds stays valid (years are never written once ready). c.mu is held.
func (c *EvalCache) dropString(e *stringYear) {
	cs := &c.strs
	cs.order.Remove(e.elem)
	delete(cs.byKey, stringKey{e.y, e.key})
	cs.bytes -= nominalBytes
	if e.counted {
		cs.bytes -= int64(len(e.v)) * 4
	}
	var buf []byte
	for j := range e.mods {
		mk := stringKey{e.y, string(modsKey(buf, e.mods, j))}
		if l := slices.DeleteFunc(cs.minus[mk], func(d *stringYear) bool { return d == e }); len(l) > 0 {
			cs.minus[mk] = l
		} else {
			delete(cs.minus, mk)
		}
	}
	for _, d := range e.derived {
		if d.base == e {
			d.base, d.add, d.sub = nil, -1, -1
		}
	}
	e.derived = nil
	// Strings read near e forget it, so that a dropped year is not held; a reader holding its
	// recipe still reads it (years are never written once ready).
	for _, d := range e.nearUsers {
		if d.near != nil && d.near.from == e {
			d.near = nil
		}
	}
	e.nearUsers = nil
	if e.near != nil {
		from := e.near.from
		from.nearUsers = slices.DeleteFunc(from.nearUsers, func(d *stringYear) bool { return d == e })
		e.near = nil
	}
	if e.indexed {
		for _, k := range e.mods {
			mk := modKey{e.y, k}
			if l := slices.DeleteFunc(cs.byMod[mk], func(d *stringYear) bool { return d == e }); len(l) > 0 {
				cs.byMod[mk] = l
			} else {
				delete(cs.byMod, mk)
			}
		}
		e.indexed = false
	}
	if e.base != nil {
		e.base.derived = slices.DeleteFunc(e.base.derived, func(d *stringYear) bool { return d == e })
	}
}
