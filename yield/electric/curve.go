package electric

import (
	"math"
	"slices"
)

// Curve is an I-V curve stored as a polyline of points (I[k], V[k]) with the
// current non-decreasing and the voltage non-increasing, in float32 to keep
// a year of curves small. Between points the curve is linear; beyond the
// first point (reverse current, voltage above the last computed point) it
// continues the first segment, and beyond the last point it keeps the last
// voltage (every substring bypassed). The points are exact solutions of the
// model; Module.Curve spaces them evenly in current and adds points around
// each bypass diode's knee (a partly shaded cell), so that the maximum power
// read from the polyline is within 0.1 % of the exact single-diode value,
// evenly lit or with one cell at any level of shade (see the tests; in a Year
// a step shares its points among its modules, and a module whose knee is not
// among the step's maxKnees most shared reads up to 1.7 % low, as with even
// points alone); strings of unequal length in parallel, where the shorter one
// works near its open-circuit voltage, read up to 0.4 % low.
// The zero Curve is empty: it delivers no power.
type Curve struct {
	i, v []float32
}

// Len returns the number of points.
func (c Curve) Len() int { return len(c.i) }

// At returns point k: current (A) and voltage (V).
func (c Curve) At(k int) (iA, vV float64) { return float64(c.i[k]), float64(c.v[k]) }

func (c Curve) f64() (is, vs []float64) {
	is = make([]float64, len(c.i))
	vs = make([]float64, len(c.v))
	for k := range c.i {
		is[k], vs[k] = float64(c.i[k]), float64(c.v[k])
	}
	return is, vs
}

func curveFrom(is, vs []float64) Curve {
	c := Curve{i: make([]float32, len(is)), v: make([]float32, len(vs))}
	for k := range is {
		c.i[k], c.v[k] = float32(is[k]), float32(vs[k])
	}
	return c
}

// voltageOn returns V at current x on polyline (is, vs) with the extension
// rules of Curve. k is a hint: the search starts there and the returned hint
// lets a caller walking with increasing x stay linear.
func voltageOn(is, vs []float64, x float64, k int) (float64, int) {
	n := len(is)
	if n == 1 {
		return vs[0], 0
	}
	if x <= is[0] {
		return vs[0] + (x-is[0])*slope(is[0], vs[0], is[1], vs[1]), 0
	}
	if x >= is[n-1] {
		return vs[n-1], n - 2
	}
	k = max(min(k, n-2), 0)
	for k > 0 && is[k] > x {
		k--
	}
	for k < n-2 && is[k+1] < x {
		k++
	}
	di := is[k+1] - is[k]
	if di <= 0 {
		return vs[k+1], k
	}
	return vs[k] + (x-is[k])*(vs[k+1]-vs[k])/di, k
}

func slope(i0, v0, i1, v1 float64) float64 {
	if i1 == i0 {
		return 0
	}
	return (v1 - v0) / (i1 - i0)
}

// SeriesSum returns the curve of devices in series: voltages added at equal
// current. Curves on the same current points add point by point; otherwise
// the result has the union of their current points, so no corner is lost.
func SeriesSum(cs ...Curve) Curve {
	cs = slices.DeleteFunc(slices.Clone(cs), func(c Curve) bool { return c.Len() == 0 })
	if len(cs) == 0 {
		return Curve{}
	}
	same := true
	for _, c := range cs[1:] {
		if !slices.Equal(c.i, cs[0].i) {
			same = false
			break
		}
	}
	if same {
		out := Curve{i: slices.Clone(cs[0].i), v: make([]float32, len(cs[0].v))}
		for k := range out.v {
			var s float64
			for _, c := range cs {
				s += float64(c.v[k])
			}
			out.v[k] = float32(s)
		}
		return out
	}
	var all []float64
	is := make([][]float64, len(cs))
	vs := make([][]float64, len(cs))
	for n, c := range cs {
		is[n], vs[n] = c.f64()
		all = append(all, is[n]...)
	}
	slices.Sort(all)
	all = slices.Compact(all)
	outV := make([]float64, len(all))
	hints := make([]int, len(cs))
	for k, x := range all {
		var s float64
		for n := range cs {
			var v float64
			v, hints[n] = voltageOn(is[n], vs[n], x, hints[n])
			s += v
		}
		outV[k] = s
	}
	return curveFrom(all, outV)
}

// ParallelSum returns the curve of devices in parallel: currents added at
// equal voltage. A device driven above its own open-circuit voltage takes
// reverse current along its first segment, as the I-V sum says.
func ParallelSum(cs ...Curve) Curve {
	cs = slices.DeleteFunc(slices.Clone(cs), func(c Curve) bool { return c.Len() == 0 })
	if len(cs) == 0 {
		return Curve{}
	}
	is := make([][]float64, len(cs))
	vs := make([][]float64, len(cs))
	for n, c := range cs {
		is[n], vs[n] = c.f64()
	}
	var m merger
	oi, ov := m.parallel(is, vs)
	return curveFrom(oi, ov)
}

// merger holds scratch space for parallel merges so the year engine does not
// allocate per step.
type merger struct {
	k        []int
	oi, ov   []float64
	own, oth []float64    // one breakpoint's currents
	grids    [3][]float64 // parallelMaxFree's strings' grid, one per string for walk3
}

// parallel merges polylines (is[s], vs[s]) into the polyline of their parallel connection.
// It walks the inputs' points in descending voltage; the inputs with a point at a voltage
// give one breakpoint together, whose current is the sum of their points' currents plus the
// sum of the other inputs' currents interpolated on their segments at that voltage, each sum
// taken in increasing order of the terms. The polyline is therefore the same to the bit in any
// order of the inputs, so that an input of strings gives the same result however its strings
// are listed. Cost O(S²·K) for S inputs of K points; two and three inputs, the usual cases of
// strings on one MPPT input, take walks of their own.
func (m *merger) parallel(is, vs [][]float64) ([]float64, []float64) {
	switch {
	case len(is) == 2 && len(is[0]) > 1 && len(is[1]) > 1:
		return m.parallel2(is[0], vs[0], is[1], vs[1])
	case len(is) == 3 && len(is[0]) > 1 && len(is[1]) > 1 && len(is[2]) > 1:
		return m.parallel3(is, vs)
	}
	return m.parallelN(is, vs)
}

// parallelN is parallel for any number of inputs.
func (m *merger) parallelN(is, vs [][]float64) ([]float64, []float64) {
	ns := len(is)
	m.k = slices.Grow(m.k[:0], ns)[:ns]
	clear(m.k)
	m.oi, m.ov = m.oi[:0], m.ov[:0]
	return m.walkFrom(is, vs)
}

// walkFrom continues the walk of parallelN from the inputs' next points m.k, appending to
// m.oi and m.ov.
func (m *merger) walkFrom(is, vs [][]float64) ([]float64, []float64) {
	oi, ov := m.oi, m.ov
	for {
		// Next breakpoint: the highest voltage among the inputs' next points.
		bv, any := math.Inf(-1), false
		for s, k := range m.k {
			if k < len(vs[s]) && (!any || vs[s][k] > bv) {
				bv, any = vs[s][k], true
			}
		}
		if !any {
			break
		}
		m.own, m.oth = m.own[:0], m.oth[:0]
		for s, k := range m.k {
			switch {
			case k < len(vs[s]) && vs[s][k] == bv:
				m.own = append(m.own, is[s][k])
				m.k[s]++
			case k > 0 && k < len(is[s]):
				m.oth = append(m.oth, onSegment(is[s], vs[s], k, bv))
			default:
				m.oth = append(m.oth, currentOff(is[s], vs[s], k, bv))
			}
		}
		oi = append(oi, sortedSum(m.own)+sortedSum(m.oth))
		ov = append(ov, bv)
	}
	m.oi, m.ov = oi, ov
	return oi, ov
}

// sortedSum returns the sum of xs taken in increasing order (xs is sorted in place): the same
// bits in any order of the terms.
func sortedSum(xs []float64) float64 {
	for i := 1; i < len(xs); i++ { // insertion sort: a few terms
		for j := i; j > 0 && xs[j] < xs[j-1]; j-- {
			xs[j], xs[j-1] = xs[j-1], xs[j]
		}
	}
	var t float64
	for _, x := range xs {
		t += x
	}
	return t
}

// parallel3 is parallel for three inputs of at least two points each, to the bit: a walk of
// its own while every input has points left (each other input's next point is then not past
// its last; see inside), then walk2. A sum of two terms is the same in either order;
// three points at one voltage, which is rare, go through sortedSum.
func (m *merger) parallel3(is, vs [][]float64) ([]float64, []float64) {
	n := len(vs[0]) + len(vs[1]) + len(vs[2])
	m.oi, m.ov = m.walk3(slices.Grow(m.oi[:0], n), slices.Grow(m.ov[:0], n), is, vs, [3]int{}, math.Inf(-1))
	return m.oi, m.ov
}

// walk3 is parallel3's walk from the inputs' points k, appending to oi and ov; it ends after
// the first point below the voltage stop (−Inf: the whole walk), as parallelMaxFree asks.
func (m *merger) walk3(oi, ov []float64, is, vs [][]float64, k [3]int, stop float64) ([]float64, []float64) {
	ia, ib, ic := is[0], is[1], is[2]
	va, vb, vc := vs[0], vs[1], vs[2]
	na, nb, nc := len(va), len(vb), len(vc)
	ka, kb, kc := k[0], k[1], k[2]
	for ka < na && kb < nb && kc < nc {
		xa, xb, xc := va[ka], vb[kb], vc[kc]
		var x float64
		switch {
		case xa > xb && xa > xc:
			oi = append(oi, ia[ka]+(inside(ib, vb, kb, xa)+inside(ic, vc, kc, xa)))
			x = xa
			ka++
		case xb > xa && xb > xc:
			oi = append(oi, ib[kb]+(inside(ia, va, ka, xb)+inside(ic, vc, kc, xb)))
			x = xb
			kb++
		case xc > xa && xc > xb:
			oi = append(oi, ic[kc]+(inside(ia, va, ka, xc)+inside(ib, vb, kb, xc)))
			x = xc
			kc++
		case xa == xb && xa > xc:
			oi = append(oi, (ia[ka]+ib[kb])+inside(ic, vc, kc, xa))
			x = xa
			ka, kb = ka+1, kb+1
		case xa == xc && xa > xb:
			oi = append(oi, (ia[ka]+ic[kc])+inside(ib, vb, kb, xa))
			x = xa
			ka, kc = ka+1, kc+1
		case xb == xc && xb > xa:
			oi = append(oi, (ib[kb]+ic[kc])+inside(ia, va, ka, xb))
			x = xb
			kb, kc = kb+1, kc+1
		default: // all three at one voltage
			m.own = append(m.own[:0], ia[ka], ib[kb], ic[kc])
			oi = append(oi, sortedSum(m.own))
			x = xa
			ka, kb, kc = ka+1, kb+1, kc+1
		}
		ov = append(ov, x)
		if x < stop {
			return oi, ov
		}
	}
	// One input is used up: the other two finish the walk with its last current.
	switch {
	case kc == nc:
		return walk2(oi, ov, ia, va, ka, ib, vb, kb, ic[nc-1], stop)
	case kb == nb:
		return walk2(oi, ov, ia, va, ka, ic, vc, kc, ib[nb-1], stop)
	}
	return walk2(oi, ov, ib, vb, kb, ic, vc, kc, ia[na-1], stop)
}

// walk2 walks inputs a and b from their points ka and kb, adding cst to the other input's
// current at each point: parallel2's whole walk (cst 0), or the end of parallel3's once its
// third input is used up and gives its last current as cst. As walkFrom would, to the bit (a
// sum of two terms is the same in either order). While both have points left, the other
// input's next point is not past its last (see inside); once one is used up, the other's
// points see its last current. The walk ends after the first point below the voltage stop
// (−Inf: the whole walk), as parallelMaxFree asks.
func walk2(oi, ov, ia, va []float64, ka int, ib, vb []float64, kb int, cst, stop float64) ([]float64, []float64) {
	na, nb := len(va), len(vb)
	for ka < na && kb < nb {
		var x float64
		switch xa, xb := va[ka], vb[kb]; {
		case xa > xb:
			oi = append(oi, ia[ka]+(inside(ib, vb, kb, xa)+cst))
			x = xa
			ka++
		case xb > xa:
			oi = append(oi, ib[kb]+(inside(ia, va, ka, xb)+cst))
			x = xb
			kb++
		default:
			oi = append(oi, (ia[ka]+ib[kb])+cst)
			x = xa
			ka, kb = ka+1, kb+1
		}
		ov = append(ov, x)
		if x < stop {
			return oi, ov
		}
	}
	for ; ka < na; ka++ {
		oi = append(oi, ia[ka]+(ib[nb-1]+cst))
		ov = append(ov, va[ka])
		if va[ka] < stop {
			return oi, ov
		}
	}
	for ; kb < nb; kb++ {
		oi = append(oi, ib[kb]+(ia[na-1]+cst))
		ov = append(ov, vb[kb])
		if vb[kb] < stop {
			return oi, ov
		}
	}
	return oi, ov
}

// inside is currentOn for an input of at least two points whose next point k is not past its
// last: above the first point (k = 0) the first segment is extended, as on the segment to
// point 1.
func inside(is, vs []float64, k int, v float64) float64 {
	return onSegment(is, vs, max(k, 1), v)
}

// parallel2 is parallel for two inputs a and b of at least two points each, to the bit:
// walk2 with no third input.
func (m *merger) parallel2(ia, va, ib, vb []float64) ([]float64, []float64) {
	n := len(va) + len(vb)
	m.oi, m.ov = walk2(slices.Grow(m.oi[:0], n), slices.Grow(m.ov[:0], n), ia, va, 0, ib, vb, 0, 0, math.Inf(-1))
	return m.oi, m.ov
}

// pruneMargin widens parallelMaxFree's bounds against rounding: the currents and powers it
// bounds are sums and products of a few terms, each rounded to within 1e-16 relative.
const pruneMargin = 1e-9

// parallelMaxFree returns polyMaxFree of the polyline of two or three strings in parallel on
// one current grid gi (voltages vs[s], non-increasing with current; the walk of parallel) to
// the bit, and true; false when it leaves the question to the whole walk.
//
// Most of the polyline cannot hold the maximum, and is not walked. The merged curve has a
// point at the first string's best grid point; its power, less pruneMargin, bounds the answer
// from below (lb). Let M_j be the highest of the strings' voltages at grid point j:
// at a voltage of at least M_j each of the S strings carries at most gi[j]. Every merged point
// above M_j and below M_(j−1) carries at most S·gi[j], and the segment from it to the next
// point at most S·gi[j+1]: below lb up to the first j where M_(j−1)·S·gi[j+1] reaches it, the
// walk starts there (at M_k, the state of the whole walk once every point above it is out).
// Below a voltage V, power is at most V·S·gi[last]: the walk stops after its first point
// below lb/(S·gi[last]). polyMaxFree skips a segment whose corner power is at most its best so
// far and takes a point or segment only if it beats it, so leaving out points and segments
// whose bound is below lb changes neither its answer nor which of equal candidates it
// returns. The bounds carry pruneMargin against rounding.
func (m *merger) parallelMaxFree(gi []float64, vs [][]float64) (pW, vV, iA float64, ok bool) {
	n, ns := len(gi), len(vs)
	if n < 2 || ns < 2 || ns > 3 {
		return 0, 0, 0, false
	}
	for _, v := range vs {
		if len(v) != n || !nonIncreasing(v) {
			return 0, 0, 0, false
		}
	}
	// One string's best point: the strings of an input are lit much alike, and a looser
	// bound only walks a little more.
	cand := mergedAt(gi, vs, 0, bestPoint(gi, vs[0]))
	if !(cand > 0) || !(gi[n-1] > 0) {
		return 0, 0, 0, false
	}
	lb := cand * (1 - pruneMargin)
	scale := float64(ns) * (1 + pruneMargin)
	va, vb, vc := vs[0], vs[1], vs[1] // a third string's voltages, or the second's again
	if ns == 3 {
		vc = vs[2]
	}
	hi := lb / scale // bound on M_(j−1)·gi[j+1]
	k, mPrev := -1, max(va[0], vb[0], vc[0])
	for j := 0; j+1 < n && mPrev*gi[j+1] < hi; j++ {
		k, mPrev = j, max(va[j], vb[j], vc[j])
	}
	var ks [3]int
	if k >= 0 {
		vt := max(va[k], vb[k], vc[k])
		for s, v := range vs {
			ks[s] = k
			for ks[s] > 0 && v[ks[s]-1] <= vt {
				ks[s]--
			}
		}
	}
	stop := lb / (scale * gi[n-1])
	oi, ov := slices.Grow(m.oi[:0], ns*n), slices.Grow(m.ov[:0], ns*n)
	if ns == 2 {
		oi, ov = walk2(oi, ov, gi, va, ks[0], gi, vb, ks[1], 0, stop)
	} else {
		m.grids = [3][]float64{gi, gi, gi}
		oi, ov = m.walk3(oi, ov, m.grids[:], vs, ks, stop)
	}
	m.oi, m.ov = oi, ov
	if len(oi) < 2 {
		return 0, 0, 0, false
	}
	pW, vV, iA = polyMaxFree(oi, ov)
	return pW, vV, iA, true
}

// bestPoint returns the index of the grid point of most power (first of equals; −1 when none
// has positive current and power).
func bestPoint(gi, v []float64) int {
	v = v[:len(gi)]
	best, bp := -1, 0.0
	for k, i := range gi {
		// With i > 0, a power above the best so far (at least 0) has a positive voltage.
		if p := i * v[k]; i > 0 && p > bp {
			best, bp = k, p
		}
	}
	return best
}

// nonIncreasing reports whether v never rises, as the walk's state and parallelMaxFree's
// bounds assume (a string's voltage falls with current).
func nonIncreasing(v []float64) bool {
	for k := 1; k < len(v); k++ {
		if v[k] > v[k-1] {
			return false
		}
	}
	return true
}

// mergedAt returns a lower bound of the power of the merged point at voltage vs[s][k], string
// s's point k, of the strings vs on grid gi (each other string's current there as the walk
// interpolates it; the sum in another order than the walk's, so within rounding), or 0 when
// k < 0, that voltage is not positive or a string has no point above it.
func mergedAt(gi []float64, vs [][]float64, s, k int) float64 {
	if k < 0 || !(vs[s][k] > 0) {
		return 0
	}
	x := vs[s][k]
	cur := gi[k]
	for r, v := range vs {
		if r == s {
			continue
		}
		// j: the number of r's points above x (v non-increasing), r's next point in the walk.
		lo, hi := 0, len(v)
		for lo < hi {
			mid := int(uint(lo+hi) >> 1)
			if v[mid] > x {
				lo = mid + 1
			} else {
				hi = mid
			}
		}
		switch {
		case lo == 0:
			return 0
		case lo == len(v):
			cur += gi[lo-1]
		case v[lo] == x:
			cur += gi[lo]
		default:
			cur += inside(gi, v, lo, x)
		}
	}
	return cur * x
}

// currentOn returns the current of polyline (is, vs) at voltage v, where k is
// the index of its next unvisited point (vs[k] ≤ v ≤ vs[k−1]).
func currentOn(is, vs []float64, k int, v float64) float64 {
	if k > 0 && k < len(is) {
		return onSegment(is, vs, k, v)
	}
	return currentOff(is, vs, k, v)
}

// onSegment is currentOn on the segment from point k−1 to point k (0 < k < len(is)).
func onSegment(is, vs []float64, k int, v float64) float64 {
	if dv := vs[k] - vs[k-1]; dv != 0 {
		return is[k-1] + (v-vs[k-1])*(is[k]-is[k-1])/dv
	}
	return is[k-1]
}

// currentOff is currentOn before the first point and after the last.
func currentOff(is, vs []float64, k int, v float64) float64 {
	n := len(is)
	switch {
	case n == 1:
		return is[0]
	case k == 0:
		// Above the first point: extend the first segment (reverse current).
		dv := vs[1] - vs[0]
		if dv == 0 {
			return is[0]
		}
		return is[0] + (v-vs[0])*(is[1]-is[0])/dv
	}
	return is[n-1]
}

// MaxPower returns the global maximum power point (W, V, A) of the curve with
// the voltage in [vMin, vMax]; pass vMin = 0 and vMax = +Inf for the
// unconstrained maximum. Power is zero when no point of positive power lies in
// the window.
func (c Curve) MaxPower(vMin, vMax float64) (pW, vV, iA float64) {
	if c.Len() == 0 {
		return 0, 0, 0
	}
	is, vs := c.f64()
	return polyMax(is, vs, vMin, vMax, math.Inf(1))
}

// polyMax returns the highest power on the polyline with vlo ≤ V ≤ vhi and
// 0 ≤ I ≤ imax. On each segment P is a concave quadratic in the segment
// parameter (current rises as voltage falls), so its maximum over the
// feasible part of the segment is the clamped vertex: exact for the polyline.
func polyMax(is, vs []float64, vlo, vhi, imax float64) (pW, vV, iA float64) {
	vlo = math.Max(vlo, 0)
	n := len(is)
	if n == 0 || vhi < vlo {
		return 0, 0, 0
	}
	if n == 1 {
		if vs[0] >= vlo && vs[0] <= vhi && is[0] >= 0 && is[0] <= imax {
			return math.Max(is[0]*vs[0], 0), vs[0], is[0]
		}
		return 0, 0, 0
	}
	// Start from the best feasible point: most segments are then ruled out
	// by the cheap bound below without clamping.
	for j := range n {
		if i, v := is[j], vs[j]; i >= 0 && i <= imax && v >= vlo && v <= vhi {
			if p := i * v; p > pW {
				pW, vV, iA = p, v, i
			}
		}
	}
	for j := range n - 1 {
		ia, va, ib, vb := is[j], vs[j], is[j+1], vs[j+1]
		// Cheap bound: power on the segment is at most max(I)·max(V).
		if ib <= 0 || va <= vlo && vb < vlo {
			continue
		}
		// Plain comparisons: math.Min's NaN handling is slow in this loop.
		bi, bv := ib, va
		if imax < bi {
			bi = imax
		}
		if vhi < bv {
			bv = vhi
		}
		if bi*bv <= pW {
			continue
		}
		if p, v, i, ok := segmentMax(ia, va, ib, vb, vlo, vhi, imax); ok && p > pW {
			pW, vV, iA = p, v, i
		}
	}
	return pW, vV, iA
}

// polyMaxFree is polyMax without bounds (vlo ≤ 0, vhi and imax infinite), to the bit, with
// the bounds' comparisons left out: the operating point of most steps.
func polyMaxFree(is, vs []float64) (pW, vV, iA float64) {
	n := len(is)
	if n < 2 {
		return polyMax(is, vs, 0, math.Inf(1), math.Inf(1))
	}
	vs = vs[:n]
	for j, i := range is {
		if v := vs[j]; i >= 0 && v >= 0 {
			if p := i * v; p > pW {
				pW, vV, iA = p, v, i
			}
		}
	}
	for j := range n - 1 {
		ia, va, ib, vb := is[j], vs[j], is[j+1], vs[j+1]
		if ib <= 0 || va <= 0 && vb < 0 || ib*va <= pW {
			continue
		}
		if p, v, i, ok := segmentMax(ia, va, ib, vb, 0, math.Inf(1), math.Inf(1)); ok && p > pW {
			pW, vV, iA = p, v, i
		}
	}
	return pW, vV, iA
}

// segmentMax returns the highest power on the segment from (ia, va) to (ib, vb) with
// vlo ≤ V ≤ vhi and 0 ≤ I ≤ imax, and false when no part of it is feasible.
func segmentMax(ia, va, ib, vb, vlo, vhi, imax float64) (pW, vV, iA float64, ok bool) {
	di, dv := ib-ia, vb-va
	t0, t1 := 0.0, 1.0
	// Feasible t: V in [vlo, vhi], I in [0, imax].
	if dv != 0 {
		ta, tb := (vlo-va)/dv, (vhi-va)/dv
		if ta > tb {
			ta, tb = tb, ta
		}
		t0, t1 = fmax(t0, ta), fmin(t1, tb)
	} else if va < vlo || va > vhi {
		return 0, 0, 0, false
	}
	if di != 0 {
		ta, tb := (0-ia)/di, (imax-ia)/di
		if ta > tb {
			ta, tb = tb, ta
		}
		t0, t1 = fmax(t0, ta), fmin(t1, tb)
	} else if ia < 0 || ia > imax {
		return 0, 0, 0, false
	}
	if t0 > t1 {
		return 0, 0, 0, false
	}
	t := t1
	if q := di * dv; q < 0 {
		t = -(ia*dv + va*di) / (2 * q)
		t = fmin(fmax(t, t0), t1)
	} else if ia*va+t0*(ia*dv+va*di) > ia*va+t1*(ia*dv+va*di) {
		t = t0
	}
	i, v := ia+t*di, va+t*dv
	return i * v, v, i, true
}

// fmin and fmax are math.Min and math.Max for operands known not to be NaN
// or signed zeros that matter: plain comparisons the compiler inlines.
func fmin(a, b float64) float64 {
	if a < b {
		return a
	}
	return b
}

func fmax(a, b float64) float64 {
	if a > b {
		return a
	}
	return b
}
