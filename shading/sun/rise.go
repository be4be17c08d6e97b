package sun

import (
	"math"
	"time"
)

// Day holds the sun's rise, transit and set on one local calendar day.
//
// Sunrise and Sunset are the zero time.Time when the sun does not cross the horizon that day
// (PolarDay or PolarNight reports why) or, rarely near the polar circles, when the crossing
// falls on a neighbouring day. Transit is always set.
type Day struct {
	Sunrise, Transit, Sunset time.Time
	PolarDay                 bool // reports whether the sun stays above the horizon all day
	PolarNight               bool // reports whether the sun stays below the horizon all day
}

// RiseTransitSet returns the sunrise, sun transit and sunset on the local calendar day of day
// in day.Location(), as instants in that location, by the method of Reda & Andreas (2004),
// appendix A.2: the sun's upper limb on the horizon with standard refraction (0.5667°) and
// sun radius 0.26667°, so pressure and temperature do not enter.
func RiseTransitSet(day time.Time, o Observer) Day {
	loc := day.Location()
	y, m, d := day.Date()
	start := time.Date(y, m, d, 0, 0, 0, 0, loc)
	end := time.Date(y, m, d+1, 0, 0, 0, 0, loc)
	noon := start.Add(end.Sub(start) / 2)

	// The appendix works on UT days; an event of the local day belongs to the UT day of the
	// local noon or to one of its neighbours.
	uy, um, ud := noon.UTC().Date()
	var out Day
	var found [3]bool
	for _, k := range [...]int{0, -1, 1} {
		if found[0] && (found[1] && found[2] || out.PolarDay || out.PolarNight) {
			break
		}
		day0 := time.Date(uy, um, ud+k, 0, 0, 0, 0, time.UTC)
		ev, polar := rtsUTDay(JulianDay(day0), o, o.deltaT(day0))
		if k == 0 {
			out.PolarDay, out.PolarNight = polar > 0, polar < 0
		}
		for i, frac := range ev {
			if found[i] || (polar != 0 && i != 0) {
				continue
			}
			at := day0.Add(time.Duration(frac * 86400 * float64(time.Second)))
			if !at.Before(start) && at.Before(end) {
				found[i] = true
				switch i {
				case 0:
					out.Transit = at.In(loc)
				case 1:
					out.Sunrise = at.In(loc)
				case 2:
					out.Sunset = at.In(loc)
				}
			}
		}
	}
	if out.PolarDay || out.PolarNight {
		out.Sunrise, out.Sunset = time.Time{}, time.Time{}
	}
	return out
}

// rtsUTDay is appendix A.2 of Reda & Andreas (2004) for the UT day starting at Julian Day
// jd0 (0h UT): transit, sunrise and sunset as fractions of that day (they may stray a little
// outside [0, 1)). polar is +1 when the sun stays up, −1 when it stays down, 0 otherwise.
func rtsUTDay(jd0 float64, o Observer, deltaTSec float64) (ev [3]float64, polar int) {
	const h0p = -(sunRadiusDeg + stdRefractionDeg) // h0′, eq. A5 note
	nu := GeocentricAt(jd0, deltaTSec).SiderealTime.Degrees()
	var alpha, delta [3]float64
	for i := range alpha {
		// The appendix takes α, δ at 0h TT of the days before, of and after (ΔT = 0).
		g := GeocentricAt(jd0+float64(i-1), 0)
		alpha[i], delta[i] = g.RightAscension.Degrees(), g.Declination.Degrees()
	}
	lat := o.LatDeg * deg
	sinLat, cosLat := math.Sincos(lat)

	m0 := (alpha[1] - o.LonDeg - nu) / 360 // eq. A3
	cosH0 := (math.Sin(h0p*deg) - sinLat*math.Sin(delta[1]*deg)) / (cosLat * math.Cos(delta[1]*deg))
	var h0 float64
	switch {
	case cosH0 < -1:
		polar = 1
	case cosH0 > 1:
		polar = -1
	default:
		h0 = math.Acos(cosH0) / deg // eq. A4, in [0, 180]
	}
	m := [3]float64{frac(m0), frac(m0 - h0/360), frac(m0 + h0/360)} // eqs. A5–A7

	// Eq. A10 with the differences unwrapped across 0°/360° (the appendix reduces them to
	// [0, 1) instead, which is 1° off on the day α wraps).
	a := normDeg180(alpha[1] - alpha[0])
	b := normDeg180(alpha[2] - alpha[1])
	ad, bd := delta[1]-delta[0], delta[2]-delta[1]
	var hp, hAlt, dp [3]float64
	for i := range m {
		nuI := nu + 360.985647*m[i] // eq. A8
		n := m[i] + deltaTSec/86400 // eq. A9
		alphaP := alpha[1] + n*(a+b+(b-a)*n)/2
		dp[i] = delta[1] + n*(ad+bd+(bd-ad)*n)/2
		hp[i] = normDeg180(nuI + o.LonDeg - alphaP) // eq. A11
		sd, cd := math.Sincos(dp[i] * deg)
		hAlt[i] = math.Asin(sinLat*sd+cosLat*cd*math.Cos(hp[i]*deg)) / deg // eq. A12
	}
	ev[0] = m[0] - hp[0]/360 // eq. A13
	for i := 1; i < 3; i++ { // eqs. A14–A15
		ev[i] = m[i] + (hAlt[i]-h0p)/(360*math.Cos(dp[i]*deg)*cosLat*math.Sin(hp[i]*deg))
	}
	return ev, polar
}

// frac reduces x to [0, 1).
func frac(x float64) float64 {
	x -= math.Floor(x)
	if x >= 1 {
		x = 0
	}
	return x
}
