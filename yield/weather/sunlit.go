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
// (the cosine is zero at the crossings).
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
	out := make([]intervalSun, n)
	for i := range ends {
		p0, pm, p1 := pos[2*i], pos[2*i+1], pos[2*i+2]
		t0, t1 := ts[2*i], ts[2*i+2]
		out[i] = intervalFrom(t0, t1, p0, pm, p1, obs)
	}
	return out
}

func intervalFrom(t0, t1 time.Time, p0, pm, p1 sun.Position, obs sun.Observer) intervalSun {
	tm := t0.Add(t1.Sub(t0) / 2)
	length := t1.Sub(t0).Seconds()
	u0, um, u1 := p0.Up(), pm.Up(), p1.Up()
	var is intervalSun
	at := tm
	switch {
	case u0 && um && u1:
		is.frac = 1
		is.pos = pm
		is.meanC = (cosUp(p0) + 4*cosUp(pm) + cosUp(p1)) / 6
	case !u0 && !um && !u1:
		is.pos = pm
	default:
		// The sunlit part [a, b]: its ends are the interval's ends where the sun is up, and
		// crossings found by bisection otherwise. Twice-crossing intervals (the sun grazing
		// the horizon near the poles) keep the longer sunlit piece.
		a, b := t0, t1
		switch {
		case !u0 && um && u1:
			a = crossing(t0, tm, obs)
		case u0 && um && !u1:
			b = crossing(tm, t1, obs)
		case !u0 && um && !u1:
			a, b = crossing(t0, tm, obs), crossing(tm, t1, obs)
		case !u0 && !um && u1:
			a = crossing(tm, t1, obs)
		case u0 && !um && !u1:
			b = crossing(t0, tm, obs)
		default: // up, down, up
			c1, c2 := crossing(t0, tm, obs), crossing(tm, t1, obs)
			if c1.Sub(t0) >= t1.Sub(c2) {
				b = c1
			} else {
				a = c2
			}
		}
		at = a.Add(b.Sub(a) / 2)
		is.pos = sun.At(at, obs)
		is.frac = b.Sub(a).Seconds() / length
		ca, cb := 0.0, 0.0
		if a.Equal(t0) {
			ca = cosUp(p0)
		}
		if b.Equal(t1) {
			cb = cosUp(p1)
		}
		is.meanC = is.frac * (ca + 4*cosUp(is.pos) + cb) / 6
	}
	is.cosZ = cosUp(is.pos)
	if is.frac > 0 && is.cosZ == 0 {
		// Refraction lifts the sun above the horizon while cos of the zenith rounds to zero:
		// treat such slivers as dark rather than divide by a vanishing cosine.
		is.frac, is.meanC = 0, 0
	}
	is.doy = at.UTC().YearDay()
	return is
}

// crossing returns the instant in [lo, hi] where the sun's Up state changes.
func crossing(lo, hi time.Time, obs sun.Observer) time.Time {
	upLo := sun.At(lo, obs).Up()
	for range bisectSteps {
		mid := lo.Add(hi.Sub(lo) / 2)
		if sun.At(mid, obs).Up() == upLo {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo.Add(hi.Sub(lo) / 2)
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
