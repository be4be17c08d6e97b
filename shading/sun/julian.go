package sun

import (
	"math"
	"time"
)

// JulianDay returns the Julian Day of the instant t (UT). time.Time counts days in the
// proleptic Gregorian calendar, so any instant maps to its true Julian Day, including those
// before the Gregorian reform.
func JulianDay(t time.Time) float64 {
	return (float64(t.Unix())+float64(t.Nanosecond())/1e9)/86400 + 2440587.5
}

// calendarJD is eq. 4 of Reda & Andreas (2004): the Julian Day of a calendar date, in the
// Julian calendar before 1582-10-15 and the Gregorian calendar from then on, as the report's
// Table A4.1 counts. day may carry a fraction of a day (UT).
func calendarJD(year, month int, day float64) float64 {
	y, m := float64(year), float64(month)
	if month < 3 {
		y--
		m += 12
	}
	jd := math.Floor(365.25*(y+4716)) + math.Floor(30.6001*(m+1)) + day - 1524.5
	if jd > 2299160 {
		a := math.Floor(y / 100)
		jd += 2 - a + math.Floor(a/4)
	}
	return jd
}
