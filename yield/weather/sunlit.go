package weather

import (
	"math"
	"time"

	"sunstring/shading/sun"
	"sunstring/yield/irradiance"
)

// intervalSun is the sun over one interval, following the project rule that the sun is
// evaluated at an interval's midpoint, and for the sunrise and sunset intervals at the midpoint
// of their sunlit part.
type intervalSun struct {
	frac  float64      // sunlit share of the interval, 0..1
	pos   sun.Position // at the midpoint of the sunlit part; at the interval midpoint when dark
	cosZ  float64      // max(0, cos zenith) at pos
	meanC float64      // mean of max(0, cos zenith) over the whole interval
	doy   int          // day of year (UTC) of pos, for the Sun–Earth distance
}

// bisectSteps halves an hour to under a second: far finer than any irradiance model needs.
const bisectSteps = 13

// sunOver returns the sun over each interval of a contiguous series ending at ends, each of
// length interval. It evaluates the sun at every boundary and midpoint; where the sun rises or
// sets inside an interval it finds the crossing by bisection, so the sunlit part is known to
// within a second. The mean cosine over the interval is Simpson's rule over the sunlit part
// (the cosine is zero at the crossings). All bisections advance together, one sun.AtEach call
// a step, so that the year's crossings share the sun package's per-day work.
func sunOver(ends []time.Time, interval time.Duration, obs sun.Observer) []intervalSun {
	n := len(ends)
	if n == 0 {
		return nil
	}
	ts := make([]time.Time, 0, 2*n+1)
	ts = append(ts, ends[0].Add(-interval))
	for _, e := range ends {
		ts = append(ts, e.Add(-interval/2), e)
	}
	pos := sun.AtEach(ts, obs)

	// Crossing searches: each has a bracket [lo, hi] with the sun's state at lo.
	type search struct {
		lo, hi time.Time
		upLo   bool
	}
	var searches []search
	find := func(lo, hi time.Time, upLo bool) int {
		searches = append(searches, search{lo, hi, upLo})
		return len(searches) - 1
	}
	// part records, per interval, which searches give the ends of its sunlit part (-1: the
	// interval's own end).
	type part struct{ a, b, c1, c2 int }
	parts := make([]part, n)
	out := make([]intervalSun, n)
	for i := range ends {
		p0, pm, p1 := pos[2*i], pos[2*i+1], pos[2*i+2]
		t0, tm, t1 := ts[2*i], ts[2*i+1], ts[2*i+2]
		u0, um, u1 := p0.Up(), pm.Up(), p1.Up()
		pt := part{-1, -1, -1, -1}
		switch {
		case u0 && um && u1:
			out[i] = intervalSun{frac: 1, pos: pm, meanC: (cosUp(p0) + 4*cosUp(pm) + cosUp(p1)) / 6, doy: tm.UTC().YearDay()}
		case !u0 && !um && !u1:
			out[i] = intervalSun{pos: pm, doy: tm.UTC().YearDay()}
		case !u0 && um && u1:
			pt.a = find(t0, tm, false)
		case u0 && um && !u1:
			pt.b = find(tm, t1, true)
		case !u0 && um && !u1:
			pt.a, pt.b = find(t0, tm, false), find(tm, t1, true)
		case !u0 && !um && u1:
			pt.a = find(tm, t1, false)
		case u0 && !um && !u1:
			pt.b = find(t0, tm, true)
		default: // up, down, up: the sun grazing the horizon near the poles
			pt.c1, pt.c2 = find(t0, tm, true), find(tm, t1, false)
		}
		parts[i] = pt
	}
	if len(searches) == 0 {
		finishCos(out)
		return out
	}
	probe := make([]time.Time, len(searches))
	for range bisectSteps {
		for k, sr := range searches {
			probe[k] = sr.lo.Add(sr.hi.Sub(sr.lo) / 2)
		}
		ps := sun.AtEach(probe, obs)
		for k := range searches {
			if ps[k].Up() == searches[k].upLo {
				searches[k].lo = probe[k]
			} else {
				searches[k].hi = probe[k]
			}
		}
	}
	at := func(k int) time.Time { return searches[k].lo.Add(searches[k].hi.Sub(searches[k].lo) / 2) }

	// Sunlit parts and their midpoints, evaluated together.
	type lit struct {
		i    int
		a, b time.Time
	}
	var lits []lit
	for i, pt := range parts {
		if pt == (part{-1, -1, -1, -1}) {
			continue
		}
		a, b := ts[2*i], ts[2*i+2]
		if pt.a >= 0 {
			a = at(pt.a)
		}
		if pt.b >= 0 {
			b = at(pt.b)
		}
		if pt.c1 >= 0 { // keep the longer of the two sunlit pieces
			c1, c2 := at(pt.c1), at(pt.c2)
			if c1.Sub(a) >= b.Sub(c2) {
				b = c1
			} else {
				a = c2
			}
		}
		lits = append(lits, lit{i, a, b})
	}
	mids := make([]time.Time, len(lits))
	for k, l := range lits {
		mids[k] = l.a.Add(l.b.Sub(l.a) / 2)
	}
	mp := sun.AtEach(mids, obs)
	for k, l := range lits {
		i := l.i
		t0, t1 := ts[2*i], ts[2*i+2]
		is := intervalSun{pos: mp[k], frac: l.b.Sub(l.a).Seconds() / t1.Sub(t0).Seconds(), doy: mids[k].UTC().YearDay()}
		ca, cb := 0.0, 0.0
		if l.a.Equal(t0) {
			ca = cosUp(pos[2*i])
		}
		if l.b.Equal(t1) {
			cb = cosUp(pos[2*i+2])
		}
		is.meanC = is.frac * (ca + 4*cosUp(is.pos) + cb) / 6
		out[i] = is
	}
	finishCos(out)
	return out
}

// finishCos sets cos Z. Refraction can lift the sun above the horizon while the cosine of its
// zenith rounds to zero: such slivers count as dark rather than divide by a vanishing cosine.
func finishCos(out []intervalSun) {
	for i := range out {
		out[i].cosZ = cosUp(out[i].pos)
		if out[i].frac > 0 && out[i].cosZ == 0 {
			out[i].frac, out[i].meanC = 0, 0
		}
	}
}

func cosUp(p sun.Position) float64 {
	if !p.Up() {
		return 0
	}
	return math.Max(0, math.Cos(p.Zenith.Radians()))
}

// splitGHI divides an interval's mean ghi into mean dni and dhi with the Erbs et al. (1982)
// diffuse fraction. The split is made for the sunlit part, where the mean global irradiance is
// ghi/frac, and scaled back to the whole interval, so that dni·cos Z + dhi = ghi with cos Z at
// the sunlit midpoint: the closure the rest of the program relies on. The beam is capped at
// the clear-sky beam of a very clean atmosphere (Linke turbidity 2) at elevation elevM, since
// the correlation knows no upper bound near the horizon; what it loses goes to the diffuse.
func splitGHI(ghi float64, is intervalSun, elevM float64) (dni, dhi float64) {
	if !(ghi > 0) || is.frac == 0 {
		return 0, math.Max(ghi, 0)
	}
	zen := is.pos.Zenith.Degrees()
	dni, _ = irradiance.Erbs(ghi/is.frac, zen, is.doy)
	_, capDNI := clearSky(zen, irradiance.ExtraterrestrialNormal(is.doy), envelopeTL, elevM)
	dni = math.Min(dni, capDNI) * is.frac
	return dni, math.Max(0, ghi-dni*is.cosZ)
}
