package sun

import (
	"math"
	"time"

	"github.com/golang/geo/s1"
)

// At computes the topocentric, refraction-corrected position of the sun at t.
//
// Interim method: the low-accuracy solar coordinates of Meeus, Astronomical Algorithms, 2nd ed.
// (1998), ch. 25 (about 0.01°), with the mean sidereal time of ch. 12 and the refraction of
// Reda & Andreas (2004).
func At(t time.Time, o Observer) Position {
	jd := JulianDay(t)
	tc := (jd - 2451545.0) / 36525
	l0 := 280.46646 + tc*(36000.76983+0.0003032*tc)
	m := 357.52911 + tc*(35999.05029-0.0001537*tc)
	mr := m * math.Pi / 180
	c := (1.914602-tc*(0.004817+0.000014*tc))*math.Sin(mr) + (0.019993-0.000101*tc)*math.Sin(2*mr) + 0.000289*math.Sin(3*mr)
	omega := (125.04 - 1934.136*tc) * math.Pi / 180
	lambda := (l0 + c - 0.00569 - 0.00478*math.Sin(omega)) * math.Pi / 180
	eps := (23.0 + (26.0+(21.448-tc*(46.815+tc*(0.00059-tc*0.001813)))/60)/60 + 0.00256*math.Cos(omega)) * math.Pi / 180
	ra := math.Atan2(math.Cos(eps)*math.Sin(lambda), math.Cos(lambda))
	dec := math.Asin(math.Sin(eps) * math.Sin(lambda))
	gmst := 280.46061837 + 360.98564736629*(jd-2451545.0) + tc*tc*(0.000387933-tc/38710000)
	h := normDeg(gmst+o.LonDeg-ra*180/math.Pi) * math.Pi / 180
	lat := o.LatDeg * math.Pi / 180
	e0 := math.Asin(math.Sin(lat)*math.Sin(dec) + math.Cos(lat)*math.Cos(dec)*math.Cos(h))
	az := math.Atan2(math.Sin(h), math.Cos(h)*math.Sin(lat)-math.Tan(dec)*math.Cos(lat))
	e0d := e0 * 180 / math.Pi
	de := refraction(e0d, o.pressure(), o.temp())
	eot := normDeg180(l0-0.0057183-ra*180/math.Pi) * 4 // minutes
	return Position{
		Zenith:          s1.Angle((90 - e0d - de) * math.Pi / 180),
		Azimuth:         s1.Angle(normDeg(az*180/math.Pi+180) * math.Pi / 180),
		JD:              jd,
		Declination:     s1.Angle(dec),
		HourAngle:       s1.Angle(h),
		RefractionDelta: s1.Angle(de * math.Pi / 180),
		EquationOfTime:  time.Duration(eot * float64(time.Minute)),
	}
}

// refraction returns the elevation, in degrees, that the atmosphere adds to a true elevation
// e0 (degrees), after Reda & Andreas (2004), eq. 42; zero when the sun is below the horizon.
func refraction(e0, pressureMbar, tempC float64) float64 {
	const sunRadius, stdRefraction = 0.26667, 0.5667
	if e0 < -(sunRadius + stdRefraction) {
		return 0
	}
	return pressureMbar / 1010 * 283 / (273 + tempC) * 1.02 / (60 * math.Tan((e0+10.3/(e0+5.11))*math.Pi/180))
}

// JulianDay returns the Julian Day of t (UT), Meeus (1998) eq. 7.1 with the Gregorian
// calendar throughout.
func JulianDay(t time.Time) float64 {
	t = t.UTC()
	return float64(t.Unix())/86400 + 2440587.5
}

func normDeg(x float64) float64 {
	x = math.Mod(x, 360)
	if x < 0 {
		x += 360
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
