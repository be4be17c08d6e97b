package electric

import (
	"cmp"
	"math"
	"slices"
	"strconv"
	"sync"
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
	// MaxBytes bounds the memory the entries take; zero means 64 MB.
	MaxBytes int64

	mu    sync.Mutex
	m     map[cacheKey]*inputYear
	fifo  []cacheKey
	bytes int64
	hits  int64
	calls int64
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
	size := int64(len(pt.p)) * 3 * 8
	for c.bytes+size > limit && len(c.fifo) > 0 {
		old := c.fifo[0]
		c.fifo = c.fifo[1:]
		if e := c.m[old]; e != nil {
			c.bytes -= int64(len(e.p)) * 3 * 8
			delete(c.m, old)
		}
	}
	c.m[k] = pt
	c.fifo = append(c.fifo, k)
	c.bytes += size
	return pt
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
	var sc *evalScratch
	var out []*inputYear
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
		if pt == nil {
			if sc == nil {
				sc = &evalScratch{}
			}
			pt = y.inputPart(canon, inv, opt, sc)
			pt.key = key
			if c != nil {
				pt = c.put(k, pt)
			}
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

// inputPart computes one input's share of the year: at every step the strings' curves added
// (series) and put in parallel, the operating point the tracker finds inside the window and
// the current limit, and the loss terms.
func (y *Year) inputPart(in [][]int, inv Inverter, opt EvalOptions, sc *evalScratch) *inputYear {
	pt := &inputYear{p: make([]float64, y.steps), pv: make([]float64, y.steps), un: make([]float64, y.steps), volts: !opt.ModuleLevel}
	vmin, vmax, imax := inv.MPPTMinV, inv.MPPTMaxV, inv.MaxInputCurrentA
	prevV := math.NaN()
	for s := range y.steps {
		h := float64(y.hours[s])
		row := s * y.n
		var un float64
		for _, str := range in {
			for _, k := range str {
				un += float64(y.unshadedW[row+k])
			}
		}
		pt.un[s] = un
		if opt.ModuleLevel {
			var dc float64
			for _, str := range in {
				for _, k := range str {
					dc += float64(y.curveMPP[y.modCurve[row+k]]) * opt.ModuleLevelEff
				}
			}
			pt.p[s] = dc
			pt.globalWh += dc * h
			continue
		}
		sc.gi = y.grid(s)
		is, vs := y.inputCurve(sc, row, in)
		pG, vG, iG := polyMax(is, vs, 0, math.Inf(1), math.Inf(1))
		pW, pC, vC := pG, pG, vG
		// Usually the global maximum is inside the window and the current limit: then the
		// constrained searches are not needed.
		if vG < vmin || vG > vmax {
			pW, _, _ = polyMax(is, vs, vmin, vmax, math.Inf(1))
			pC, vC, _ = polyMax(is, vs, vmin, vmax, imax)
		} else if iG > imax {
			pC, vC, _ = polyMax(is, vs, vmin, vmax, imax)
		}
		p, v := pC, vC
		if opt.Tracker == LocalClimb {
			p, v = climb(is, vs, prevV, vmin, vmax, imax)
			prevV = v
			if p <= 0 {
				prevV = math.NaN()
			}
		}
		pt.globalWh += pG * h
		pt.windowWh += (pG - pW) * h
		pt.currentWh += (pW - pC) * h
		pt.trackerWh += (pC - p) * h
		pt.p[s] = p
		pt.pv[s] = p * v
	}
	return pt
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
