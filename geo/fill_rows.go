package geo

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// Row placement in the face frame (s along the eave, w up the slope, both on the roof
// surface).
//
// A row is the band w0 ≤ w ≤ w0 + dw. A module whose lower-left corner is (s0, w0) is the
// rectangle R(s0) = [s0, s0 + ds] × [w0, w0 + dw]. It may be placed when R(s0) keeps the
// setback from every edge of the outline and lies inside it, and keeps the clearance from
// every edge of every obstacle and lies outside it. "Keeps distance m from an edge" means R
// does not meet the edge grown by m, a stadium (the set of points within m of the segment).
// A stadium is convex, so the part of it inside the band projects onto one interval [lo, hi]
// of s, and R(s0) meets it exactly when s0 ∈ [lo − ds, hi]. The union of these intervals over
// all edges is where no module may start; between them the rectangle touches no edge, so it
// is wholly inside or wholly outside the outline and each obstacle, which one test of its
// centre decides. What is left are the free intervals of the row, computed exactly rather than
// by scanning.

// span is a closed interval of s.
type span struct{ lo, hi float64 }

// edge is one segment of the outline or of an obstacle with the distance to keep from it.
type edge struct {
	a, b   orb.Point
	m      float64
	wlo, w float64 // w-range of the grown segment, for a quick reject
}

// rowPlanner finds the free intervals of rows on one face.
type rowPlanner struct {
	outline   orb.Ring
	obstacles []orb.Ring
	edges     []edge
	slo, shi  float64 // s-range of the outline, widened: beyond it nothing is inside
	forbid    []span  // scratch
}

func newRowPlanner(l *layout) *rowPlanner {
	p := &rowPlanner{outline: l.fr.outline, obstacles: l.obstacles}
	add := func(r orb.Ring, m float64) {
		for i := 0; i+1 < len(r); i++ {
			a, b := r[i], r[i+1]
			p.edges = append(p.edges, edge{a: a, b: b, m: m, wlo: math.Min(a[1], b[1]) - m, w: math.Max(a[1], b[1]) + m})
		}
	}
	add(l.fr.outline, l.setback)
	for _, ob := range l.obstacles {
		add(ob, l.clearance)
	}
	bd := l.fr.outline.Bound()
	p.slo, p.shi = bd.Min[0]-1, bd.Max[0]+1
	return p
}

// free returns, left to right, the intervals of s0 where a module ds wide may start in the
// band [w0, w1], inside the outline less the setback and clear of the obstacles. The
// rectangle is shrunk by fitEps on every side first, so that a module may touch an edge
// exactly (setback 0) and a millimetre of drawing skew does not cost a module.
func (p *rowPlanner) free(w0, w1, ds float64) []span {
	w0, w1 = w0+fitEps, w1-fitEps
	p.forbid = p.forbid[:0]
	for i := range p.edges {
		e := &p.edges[i]
		if e.w < w0 || e.wlo > w1 {
			continue
		}
		lo, hi, ok := stadiumSpan(e.a, e.b, e.m, w0, w1)
		if !ok {
			continue
		}
		p.forbid = append(p.forbid, span{lo - ds + fitEps, hi - fitEps})
	}
	slices.SortFunc(p.forbid, func(x, y span) int {
		switch {
		case x.lo < y.lo:
			return -1
		case x.lo > y.lo:
			return 1
		}
		return 0
	})
	var out []span
	keep := func(a, b float64) {
		if b < a {
			return
		}
		c := orb.Point{(a+b)/2 + ds/2, (w0 + w1) / 2}
		if !planar.RingContains(p.outline, c) {
			return
		}
		for _, ob := range p.obstacles {
			if planar.RingContains(ob, c) {
				return
			}
		}
		out = append(out, span{a, b})
	}
	at := p.slo - ds
	for _, f := range p.forbid {
		if f.lo > at {
			keep(at, f.lo)
		}
		at = math.Max(at, f.hi)
	}
	if at < p.shi {
		keep(at, p.shi)
	}
	return out
}

// stadiumSpan returns the s-range of the points within m of segment ab whose w lies in
// [w0, w1], and whether there are any. The set is convex, so its least and greatest s are
// reached either on the lines w = w0 and w = w1 or at the stadium's own extreme points (an
// end of the segment moved by m along s).
func stadiumSpan(a, b orb.Point, m, w0, w1 float64) (lo, hi float64, ok bool) {
	lo, hi = math.Inf(1), math.Inf(-1)
	take := func(x, y float64) {
		if x <= y {
			lo, hi = math.Min(lo, x), math.Max(hi, y)
		}
	}
	for _, q := range [2]orb.Point{a, b} {
		if q[1] >= w0 && q[1] <= w1 {
			take(q[0]-m, q[0]+m)
		}
	}
	for _, c := range [2]float64{w0, w1} {
		x, y := stadiumLine(a, b, m, c)
		take(x, y)
	}
	return lo, hi, lo <= hi
}

// stadiumLine returns the s-interval where the line w = c meets the points within m of
// segment ab; empty (x > y) when it misses. The set is the union of the two end discs and the
// strip beside the segment, each an interval on the line, and convex, so the hull of the three
// is the answer.
func stadiumLine(a, b orb.Point, m, c float64) (x, y float64) {
	x, y = math.Inf(1), math.Inf(-1)
	take := func(p, q float64) {
		if p <= q {
			x, y = math.Min(x, p), math.Max(y, q)
		}
	}
	for _, q := range [2]orb.Point{a, b} {
		if dw := c - q[1]; math.Abs(dw) <= m {
			h := math.Sqrt(m*m - dw*dw)
			take(q[0]-h, q[0]+h)
		}
	}
	es, ew := b[0]-a[0], b[1]-a[1]
	l := math.Hypot(es, ew)
	if l == 0 {
		return x, y
	}
	// Along the segment: t(s) = ((s − a_s)·es + (c − a_w)·ew)/l² ∈ [0, 1].
	// Across it:        n(s) = ((s − a_s)·ew − (c − a_w)·es)/l ∈ [−m, m].
	dc := c - a[1]
	p, q := linearRange(es/(l*l), (dc*ew)/(l*l)-a[0]*es/(l*l), 0, 1)
	r, s := linearRange(ew/l, -(dc*es)/l-a[0]*ew/l, -m, m)
	take(math.Max(p, r), math.Min(q, s))
	return x, y
}

// linearRange returns the interval of s where lo ≤ α·s + β ≤ hi: everything or nothing when α
// is nil (to rounding).
func linearRange(alpha, beta, lo, hi float64) (float64, float64) {
	if math.Abs(alpha) < 1e-12 {
		// A nanometre's slack for a segment lying exactly on the line, whose distance
		// rounds to ±1e-17 rather than 0.
		if beta >= lo-1e-9 && beta <= hi+1e-9 {
			return math.Inf(-1), math.Inf(1)
		}
		return math.Inf(1), math.Inf(-1)
	}
	x, y := (lo-beta)/alpha, (hi-beta)/alpha
	if x > y {
		x, y = y, x
	}
	return x, y
}

// pack sets modules ds wide at pitch ds + gap into the free intervals of one row and returns
// their left edges, left to right.
//
// The count comes first: modules go as far left as they can, each interval in turn, keeping
// the gap to the last module of the interval before (two intervals closer than the gap, either
// side of an obstacle thinner than the gap with no clearance, must not bring modules closer).
// Placing each module at the leftmost place it can take places the most a row can hold. Then
// each interval's run is centred in its interval, as an installer centres a row between the
// hips or either side of a chimney (common practice), within the room the runs beside it
// leave.
func pack(free []span, ds, gap float64, dst []float64) []float64 {
	pitch := ds + gap
	type run struct {
		n      int
		lo, hi float64 // where the run's first module may start
		at     float64
	}
	var runs []run
	next := math.Inf(-1)
	for _, f := range free {
		lo := math.Max(f.lo, next)
		if lo > f.hi {
			continue
		}
		n := int(math.Floor((f.hi-lo)/pitch)) + 1
		runs = append(runs, run{n: n, lo: lo, hi: f.hi - float64(n-1)*pitch, at: (f.lo + f.hi - float64(n-1)*pitch) / 2})
		next = lo + float64(n)*pitch
	}
	// Leftmost starts are runs[i].lo; the rightmost, with the same counts, come from the right.
	for i := len(runs) - 2; i >= 0; i-- {
		runs[i].hi = math.Min(runs[i].hi, runs[i+1].hi-float64(runs[i].n)*pitch)
	}
	prev := math.Inf(-1)
	for _, r := range runs {
		s := math.Max(math.Min(math.Max(r.at, r.lo), r.hi), prev)
		for k := range r.n {
			dst = append(dst, s+float64(k)*pitch)
		}
		prev = s + float64(r.n)*pitch
	}
	return dst
}
