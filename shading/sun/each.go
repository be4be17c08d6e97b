package sun

import (
	"math"
	"time"
)

// AtEach returns the sun's position for each instant in ts, agreeing with At to within
// 0.0001° in zenith and azimuth.
//
// The geocentric part of the SPA (the long periodic series) changes smoothly, so it is
// evaluated once per day of Terrestrial Time and interpolated quadratically between the three
// nearest days, as the SPA's own appendix A.2 does for right ascension and declination; only the
// topocentric part runs per instant. The interpolation error is below 1e−6° (the shortest
// significant period, the lunar term of L0, is 29.5 days). When the instants are sparser than
// one per day, each is evaluated directly.
func AtEach(ts []time.Time, o Observer) []Position {
	out := make([]Position, len(ts))
	if len(ts) == 0 {
		return out
	}
	s := newSite(o)
	jds := make([]float64, len(ts))
	jdes := make([]float64, len(ts))
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, t := range ts {
		jds[i] = JulianDay(t)
		jdes[i] = jds[i] + o.deltaT(t)/86400
		lo = math.Min(lo, jdes[i])
		hi = math.Max(hi, jdes[i])
	}
	first := math.Floor(lo) - 1
	nNodes := int(math.Ceil(hi)-first) + 2
	if !(nNodes > 0 && nNodes <= len(ts)) { // also catches NaN from absurd times
		for i, t := range ts {
			out[i] = s.position(jds[i], apparentOf(GeocentricAt(jds[i], o.deltaT(t))))
		}
		return out
	}
	nodes := make([]node, nNodes)
	for k := range nodes {
		nodes[k] = nodeAt(first + float64(k))
	}
	for i := range ts {
		out[i] = s.position(jds[i], interpolate(nodes, first, jds[i], jdes[i]))
	}
	return out
}

// node is the geocentric state at one whole Julian Ephemeris Day.
type node struct {
	alphaDeg, deltaDeg, dpsiCosEpsDeg, r float64
}

func nodeAt(jde float64) node {
	g := GeocentricAt(jde, 0) // the UT-based sidereal time is not used from a node
	return node{
		alphaDeg:      g.RightAscension.Degrees(),
		deltaDeg:      g.Declination.Degrees(),
		dpsiCosEpsDeg: g.NutationLon.Degrees() * math.Cos(g.Obliquity.Radians()),
		r:             g.Radius,
	}
}

// interpolate evaluates the geocentric state at jde from the nodes (nodes[k] at first+k) with
// the three-point formula of Reda & Andreas (2004), eq. A10, about the nearest node.
func interpolate(nodes []node, first, jd, jde float64) apparent {
	k := int(math.Round(jde - first))
	k = max(1, min(k, len(nodes)-2))
	n := jde - (first + float64(k))
	a, b, c := &nodes[k-1], &nodes[k], &nodes[k+1]
	quad := func(y0, y1, y2 float64) float64 {
		d1, d2 := y1-y0, y2-y1
		return y1 + n*(d1+d2+(d2-d1)*n)/2
	}
	// Right ascension wraps at 360°: interpolate the unwrapped differences.
	d1 := normDeg180(b.alphaDeg - a.alphaDeg)
	d2 := normDeg180(c.alphaDeg - b.alphaDeg)
	alpha := normDeg(b.alphaDeg + n*(d1+d2+(d2-d1)*n)/2)
	dpsiCosEps := quad(a.dpsiCosEpsDeg, b.dpsiCosEpsDeg, c.dpsiCosEpsDeg)

	jc := (jd - j2000) / 36525
	nu0 := 280.46061837 + 360.98564736629*(jd-j2000) + jc*jc*(0.000387933-jc/38710000)
	jme := (jde - j2000) / 365250
	return apparent{
		alphaDeg: alpha,
		deltaRad: quad(a.deltaDeg, b.deltaDeg, c.deltaDeg) * deg,
		nuDeg:    normDeg(nu0 + dpsiCosEps),
		r:        quad(a.r, b.r, c.r),
		eotMin:   equationOfTimeMin(meanLonDeg(jme), alpha, dpsiCosEps),
	}
}
