package sun

import (
	"math"

	"github.com/golang/geo/s1"
)

const (
	deg   = math.Pi / 180
	j2000 = 2451545.0 // Julian Day of 2000-01-01 12:00 TT
)

// Geocentric is the sun's apparent place seen from the Earth's centre at one instant: the
// expensive, observer-independent part of the Solar Position Algorithm (Reda & Andreas 2004,
// steps 3.1 to 3.8). Its zero value describes no instant; build it with GeocentricAt.
type Geocentric struct {
	JD  float64 // Julian Day (UT)
	JDE float64 // Julian Ephemeris Day (TT = UT + ΔT)

	HelioLon s1.Angle // L, heliocentric longitude of the Earth, [0, 360°)
	HelioLat s1.Angle // B, heliocentric latitude of the Earth
	Radius   float64  // R, Earth–sun distance, astronomical units

	NutationLon s1.Angle // Δψ, nutation in longitude
	NutationObl s1.Angle // Δε, nutation in obliquity
	Obliquity   s1.Angle // ε, true obliquity of the ecliptic

	ApparentLon    s1.Angle // λ, apparent longitude of the sun, [0, 360°)
	RightAscension s1.Angle // α, [0, 360°)
	Declination    s1.Angle // δ

	// SiderealTime is ν, the apparent sidereal time at Greenwich, [0, 360°).
	SiderealTime s1.Angle
	// meanLonDeg is M of eq. A2 (for the equation of time), degrees, not reduced.
	meanLonDeg float64
}

// GeocentricAt evaluates the geocentric part of the SPA at Julian Day jd (UT) with
// TT − UT = deltaTSec seconds.
func GeocentricAt(jd, deltaTSec float64) Geocentric {
	jme := (jd + deltaTSec/86400 - j2000) / 365250
	// Eqs. 9–11: heliocentric coordinates from the truncated VSOP87 series.
	return geocentricFrom(jd, deltaTSec, series(earthL[:], jme), series(earthB[:], jme), series(earthR[:], jme))
}

// geocentricFrom completes GeocentricAt from the sums of the heliocentric series: L and B in
// radians, R in AU.
func geocentricFrom(jd, deltaTSec, lRad, bRad, r float64) Geocentric {
	g := Geocentric{JD: jd, JDE: jd + deltaTSec/86400}
	jc := (jd - j2000) / 36525
	jce := (g.JDE - j2000) / 36525
	jme := jce / 10

	lDeg := normDeg(lRad / deg)
	bDeg := bRad / deg
	g.HelioLon = s1.Angle(lDeg * deg)
	g.HelioLat = s1.Angle(bRad)
	g.Radius = r

	// Eqs. 13–14: geocentric longitude and latitude.
	theta := normDeg(lDeg + 180)
	beta := -bDeg

	// Eqs. 15–23: nutation.
	dpsi, deps := nutationDeg(jce)
	g.NutationLon = s1.Angle(dpsi * deg)
	g.NutationObl = s1.Angle(deps * deg)

	// Eqs. 24–25: true obliquity of the ecliptic (Laskar 1986 polynomial, arc seconds).
	u := jme / 10
	eps0 := 84381.448 + u*(-4680.93+u*(-1.55+u*(1999.25+u*(-51.38+u*(-249.67+
		u*(-39.05+u*(7.12+u*(27.87+u*(5.79+u*2.45)))))))))
	eps := eps0/3600 + deps
	g.Obliquity = s1.Angle(eps * deg)

	// Eqs. 26–27: aberration and apparent longitude.
	lambda := theta + dpsi - 20.4898/(3600*r)
	g.ApparentLon = s1.Angle(normDeg(lambda) * deg)

	// Eqs. 28–29: apparent sidereal time at Greenwich (UT based).
	nu0 := normDeg(280.46061837 + 360.98564736629*(jd-j2000) + jc*jc*(0.000387933-jc/38710000))
	epsR := eps * deg
	sinEps, cosEps := math.Sincos(epsR)
	nu := nu0 + dpsi*cosEps
	g.SiderealTime = s1.Angle(normDeg(nu) * deg)

	// Eqs. 30–31: right ascension and declination.
	sinL, cosL := math.Sincos(lambda * deg)
	betaR := beta * deg
	sinB, cosB := math.Sincos(betaR)
	alpha := math.Atan2(sinL*cosEps-math.Tan(betaR)*sinEps, cosL)
	g.RightAscension = s1.Angle(normDeg(alpha/deg) * deg)
	g.Declination = s1.Angle(math.Asin(sinB*cosEps + cosB*sinEps*sinL))

	g.meanLonDeg = meanLonDeg(jme)
	return g
}

// meanLonDeg is the sun's mean longitude M of eq. A2 (for the equation of time), jme in Julian
// ephemeris millennia from J2000.
func meanLonDeg(jme float64) float64 {
	return 280.4664567 + jme*(360007.6982779+jme*(0.03032028+jme*(1.0/49931+
		jme*(-1.0/15300+jme*(-1.0/2000000)))))
}

// series sums a VSOP87-style table: Σ_i τ^i Σ_k a·cos(b + c·τ), scaled by 1e−8.
func series(tab [][]term, tau float64) float64 {
	var sum, pow float64 = 0, 1
	for _, row := range tab {
		var s float64
		for _, t := range row {
			s += t.a * math.Cos(t.b+t.c*tau)
		}
		sum += s * pow
		pow *= tau
	}
	return sum / 1e8
}

// nutationDeg returns Δψ and Δε in degrees at jce Julian ephemeris centuries from J2000
// (Reda & Andreas 2004, eqs. 15–23).
func nutationDeg(jce float64) (dpsi, deps float64) {
	x := [5]float64{
		297.85036 + jce*(445267.111480+jce*(-0.0019142+jce/189474)),
		357.52772 + jce*(35999.050340+jce*(-0.0001603-jce/300000)),
		134.96298 + jce*(477198.867398+jce*(0.0086972+jce/56250)),
		93.27191 + jce*(483202.017538+jce*(-0.0036825+jce/327270)),
		125.04452 + jce*(-1934.136261+jce*(0.0020708+jce/450000)),
	}
	for i := range x {
		x[i] *= deg
	}
	for i := len(nutation) - 1; i >= 0; i-- { // smallest terms first
		n := &nutation[i]
		arg := float64(n.y[0])*x[0] + float64(n.y[1])*x[1] + float64(n.y[2])*x[2] +
			float64(n.y[3])*x[3] + float64(n.y[4])*x[4]
		s, c := math.Sincos(arg)
		dpsi += (n.a + n.b*jce) * s
		deps += (n.c + n.d*jce) * c
	}
	return dpsi / 36e6, deps / 36e6
}

// equationOfTimeMin returns the equation of time in minutes (apparent minus mean solar
// time), eq. A1, reduced to ±20 min as the report's appendix does.
func equationOfTimeMin(meanLonDeg, alphaDeg, dpsiCosEpsDeg float64) float64 {
	e := 4 * normDeg(meanLonDeg-0.0057183-alphaDeg+dpsiCosEpsDeg)
	if e > 20 {
		e -= 1440
	} else if e < -20 {
		e += 1440
	}
	return e
}

// normDeg reduces x to [0, 360). Floor, not math.Mod: Mod is exact but several times slower,
// and the inputs (sidereal time reaches millions of degrees) carry no more precision than
// Floor keeps.
func normDeg(x float64) float64 {
	x -= 360 * math.Floor(x/360)
	if x >= 360 || x < 0 { // rounding at the edges
		x = 0
	}
	return x
}

func normDeg180(x float64) float64 {
	x = normDeg(x)
	if x > 180 {
		x -= 360
	}
	return x
}
