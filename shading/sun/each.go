package sun

import (
	"math"
	"time"
)

// AtEach returns the sun's position for each instant in ts. It agrees with At to within
// 0.0001° in zenith and azimuth (1e−6° in practice; within 0.1° of the zenith, where azimuth
// is ill-conditioned, the bound holds for the displacement on the sky).
//
// The geocentric part of the SPA (the long periodic series) changes smoothly, so it is
// evaluated once per day of Terrestrial Time and interpolated with a cubic through the four
// nearest days (the SPA's own appendix A.2 interpolates α and δ the same way, with three days);
// only the topocentric part runs per instant. The shortest significant period, the lunar
// term of L0, is 29.5 days; a quadratic would leave 1e−5°. When the instants are sparser than one per day, each is evaluated directly.
func AtEach(ts []time.Time, o Observer) []Position {
	out := make([]Position, len(ts))
	if len(ts) == 0 {
		return out
	}
	s := newSite(o)
	var dt deltaTCache
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, t := range ts {
		jde := JulianDay(t) + dt.at(t, o)/86400
		lo, hi = min(lo, jde), max(hi, jde)
	}
	first := math.Floor(lo) - 1
	nNodes := int(math.Floor(hi)-first) + 3
	if !(nNodes > 0 && nNodes <= len(ts)) { // also catches a NaN ΔT override
		for i, t := range ts {
			jd := JulianDay(t)
			out[i] = s.position(jd, apparentOf(GeocentricAt(jd, dt.at(t, o))))
		}
		return out
	}
	nodes := make([]node, nNodes)
	stepL := newStepper(earthL[:], first)
	stepB := newStepper(earthB[:], first)
	stepR := newStepper(earthR[:], first)
	for k := range nodes {
		g := geocentricFrom(first+float64(k), 0, stepL.next(), stepB.next(), stepR.next())
		nodes[k] = nodeOf(g)
	}
	for i, t := range ts {
		jd := JulianDay(t)
		out[i] = s.position(jd, interpolate(nodes, first, jd, jd+dt.at(t, o)/86400))
	}
	return out
}

// deltaTCache remembers ΔT for the calendar month of the last instant: the model is constant
// within a month, and working out the month costs more than the rest of an instant's ΔT.
type deltaTCache struct {
	from, to int64 // Unix seconds, [from, to)
	v        float64
}

func (c *deltaTCache) at(t time.Time, o Observer) float64 {
	if o.DeltaTSec != nil {
		return *o.DeltaTSec
	}
	u := t.Unix()
	if c.to > c.from && u >= c.from && u < c.to {
		return c.v
	}
	y, m, _ := t.UTC().Date()
	c.from = time.Date(y, m, 1, 0, 0, 0, 0, time.UTC).Unix()
	c.to = time.Date(y, m+1, 1, 0, 0, 0, 0, time.UTC).Unix()
	c.v = DeltaT(t)
	return c.v
}

// node is the geocentric state at one whole Julian Ephemeris Day.
type node struct {
	alphaDeg, deltaDeg, dpsiCosEpsDeg, r float64
}

// nodeOf keeps what interpolation needs from g (its JD is the JDE of the node: the UT-based
// sidereal time is not used from a node).
func nodeOf(g Geocentric) node {
	return node{
		alphaDeg:      g.RightAscension.Degrees(),
		deltaDeg:      g.Declination.Degrees(),
		dpsiCosEpsDeg: g.NutationLon.Degrees() * math.Cos(g.Obliquity.Radians()),
		r:             g.Radius,
	}
}

// interpolate evaluates the geocentric state at jde from the nodes (nodes[k] at first+k) with
// the four-point Lagrange cubic about the two nodes that bracket it.
func interpolate(nodes []node, first, jd, jde float64) apparent {
	k := int(math.Floor(jde - first))
	k = max(1, min(k, len(nodes)-3))
	n := jde - (first + float64(k)) // in [0, 1) between nodes k and k+1
	a, b, c, d := &nodes[k-1], &nodes[k], &nodes[k+1], &nodes[k+2]
	// Lagrange weights for nodes at −1, 0, 1, 2.
	w0 := -n * (n - 1) * (n - 2) / 6
	w1 := (n + 1) * (n - 1) * (n - 2) / 2
	w2 := -(n + 1) * n * (n - 2) / 2
	w3 := (n + 1) * n * (n - 1) / 6
	cubic := func(y0, y1, y2, y3 float64) float64 { return w0*y0 + w1*y1 + w2*y2 + w3*y3 }
	// Right ascension wraps at 360°: interpolate offsets from node k.
	alpha := normDeg(b.alphaDeg + cubic(normDeg180(a.alphaDeg-b.alphaDeg), 0,
		normDeg180(c.alphaDeg-b.alphaDeg), normDeg180(d.alphaDeg-b.alphaDeg)))
	dpsiCosEps := cubic(a.dpsiCosEpsDeg, b.dpsiCosEpsDeg, c.dpsiCosEpsDeg, d.dpsiCosEpsDeg)

	jc := (jd - j2000) / 36525
	nu0 := 280.46061837 + 360.98564736629*(jd-j2000) + jc*jc*(0.000387933-jc/38710000)
	jme := (jde - j2000) / 365250
	return apparent{
		alphaDeg: alpha,
		deltaRad: cubic(a.deltaDeg, b.deltaDeg, c.deltaDeg, d.deltaDeg) * deg,
		nuDeg:    normDeg(nu0 + dpsiCosEps),
		r:        cubic(a.r, b.r, c.r, d.r),
		eotMin:   equationOfTimeMin(meanLonDeg(jme), alpha, dpsiCosEps),
	}
}

// stepper sums a periodic series at whole days first, first+1, ... (Julian Ephemeris Days)
// without a cosine per term and day: each term's phase advances by a fixed angle per day, so
// its (cos, sin) pair is rotated by a fixed pair. Over a few thousand steps the rounding
// stays near 1e−13 of each term, far below the series' 1e−8 units.
type stepper struct {
	rows    [][]term
	cs, rot [][][2]float64 // per row and term: current (cos, sin) and per-day rotation
	tau     float64        // Julian ephemeris millennia of the next day
}

const dayInMillennia = 1.0 / 365250

func newStepper(tab [][]term, jde float64) *stepper {
	s := &stepper{rows: tab, tau: (jde - j2000) * dayInMillennia}
	s.cs = make([][][2]float64, len(tab))
	s.rot = make([][][2]float64, len(tab))
	for i, row := range tab {
		s.cs[i] = make([][2]float64, len(row))
		s.rot[i] = make([][2]float64, len(row))
		for j, t := range row {
			sn, c := math.Sincos(t.b + t.c*s.tau)
			s.cs[i][j] = [2]float64{c, sn}
			sr, cr := math.Sincos(t.c * dayInMillennia)
			s.rot[i][j] = [2]float64{cr, sr}
		}
	}
	return s
}

// next returns the series at the current day, as series does, and advances one day.
func (s *stepper) next() float64 {
	var sum, pow float64 = 0, 1
	for i, row := range s.rows {
		var acc float64
		cs, rot := s.cs[i], s.rot[i]
		for j := range row {
			c, sn := cs[j][0], cs[j][1]
			acc += row[j].a * c
			cs[j] = [2]float64{c*rot[j][0] - sn*rot[j][1], sn*rot[j][0] + c*rot[j][1]}
		}
		sum += acc * pow
		pow *= s.tau
	}
	s.tau += dayInMillennia
	return sum / 1e8
}
