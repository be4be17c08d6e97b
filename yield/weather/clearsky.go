package weather

import (
	"math"
	"time"

	"sunstring/shading/sun"
	"sunstring/yield/irradiance"
)

// DefaultLinkeTurbidity holds the monthly Linke turbidity factors (air mass 2) used for the
// indicative clear-sky year: a rural mid-latitude atmosphere, clearest in winter and hazier in
// summer (common practice; typical European values lie between 2.5 and 5).
var DefaultLinkeTurbidity = [12]float64{3.0, 3.2, 3.5, 3.8, 4.0, 4.1, 4.2, 4.1, 3.8, 3.5, 3.2, 3.0}

// DefaultTempC are the monthly mean air temperatures used when none are given: a temperate
// northern mid-latitude climate (common practice), shifted by six months south of the
// equator. They are placeholders for an indicative year, not a climate.
var DefaultTempC = [12]float64{0, 1.5, 5, 9.5, 14, 17.5, 19.5, 19, 15, 10, 5, 1}

// DefaultTemps returns DefaultTempC for a site at latDeg: as they are in the northern
// hemisphere, six months on in the southern one.
func DefaultTemps(latDeg float64) [12]float64 {
	t := DefaultTempC
	if latDeg < 0 {
		for m := range t {
			t[m] = DefaultTempC[(m+6)%12]
		}
	}
	return t
}

// envelopeTL is the Linke turbidity of the clearest air expected anywhere (common practice: 2
// is a very clean, dry atmosphere): hours synthesized from monthly values stay below
// the clear sky it gives.
const envelopeTL = 2.0

// clearSky returns global horizontal and direct normal clear-sky irradiance (W/m²) for a sun
// at zenithDeg, extraterrestrial normal irradiance i0, Linke turbidity tl and site elevation
// elevM, after Ineichen & Perez (2002), Solar Energy 73(3):151–157, with the Kasten & Young
// (1989) air mass. The beam is limited to what the global irradiance can hold, so the
// diffuse part GHI − DNI·cos Z is never negative.
func clearSky(zenithDeg, i0, tl, elevM float64) (ghi, dni float64) {
	cz := math.Cos(zenithDeg * math.Pi / 180)
	if zenithDeg >= 90 || cz <= 0 {
		return 0, 0
	}
	am := irradiance.AirMass(zenithDeg)
	fh1 := math.Exp(-elevM / 8000)
	fh2 := math.Exp(-elevM / 1250)
	cg1 := 5.09e-5*elevM + 0.868
	cg2 := 3.92e-5*elevM + 0.0387
	ghi = cg1 * i0 * cz * math.Exp(-cg2*am*(fh1+fh2*(tl-1))) * math.Exp(0.01*math.Pow(am, 1.8))
	b := 0.664 + 0.163/fh1
	dni = b * i0 * math.Exp(-0.09*am*(tl-1))
	dni = math.Max(0, math.Min(dni, ghi/cz))
	return ghi, dni
}

// ClearSky returns an indicative hourly year (TypicalYear, local standard time of the site's
// zone) under a cloudless sky: Ineichen & Perez (2002) with DefaultLinkeTurbidity. Air
// temperatures follow tempC (monthly means), or DefaultTempC when tempC is nil, with the daily
// swing of synthetic years. Wind is DefaultWindMS. The result overstates yield: it is a
// placeholder when no climate data is given, and its Source says so.
func ClearSky(s Site, tempC *[12]float64) *Series {
	ser, ends, suns := emptyYear(s, SourceIndicative)
	temps := DefaultTemps(s.LatDeg)
	if tempC != nil {
		temps = *tempC
	}
	zone := fixedZone(ser.TZOffsetHours)
	clear := make([]float64, len(ends)) // daily clearness for the temperature swing
	for i, e := range ends {
		is := suns[i]
		rec := &ser.Records[i]
		rec.End = e
		rec.WindMS = DefaultWindMS
		clear[i] = 0.75 // a cloudless day (common practice: daily kt 0.7–0.8)
		if is.frac == 0 {
			continue
		}
		m := e.Add(-ser.Interval/2).In(zone).Month() - 1
		g, b := clearSky(is.pos.Zenith.Degrees(), irradiance.ExtraterrestrialNormal(is.doy), DefaultLinkeTurbidity[m], s.ElevationM)
		rec.GHI = g * is.frac
		rec.DNI = b * is.frac
		rec.DHI = math.Max(0, rec.GHI-rec.DNI*is.cosZ)
	}
	fillTemps(ser, temps, clear)
	return ser
}

// emptyYear returns a series of TypicalYear's hours on the site zone's standard-time clock,
// with the sun over each hour.
func emptyYear(s Site, src Source) (*Series, []time.Time, []intervalSun) {
	off := StandardOffsetHours(s.Zone)
	zone := fixedZone(off)
	start := time.Date(TypicalYear, 1, 1, 0, 0, 0, 0, zone)
	n := int(time.Date(TypicalYear+1, 1, 1, 0, 0, 0, 0, zone).Sub(start) / time.Hour)
	ends := make([]time.Time, n)
	for i := range ends {
		ends[i] = start.Add(time.Duration(i+1) * time.Hour).UTC()
	}
	ser := &Series{
		Interval: time.Hour, Records: make([]Record, n), Source: src,
		HasLocation: true, LatDeg: s.LatDeg, LonDeg: s.LonDeg, ElevationM: s.ElevationM, TZOffsetHours: off,
	}
	suns := sunOver(ends, time.Hour, sun.Observer{LatDeg: s.LatDeg, LonDeg: s.LonDeg, ElevationM: s.ElevationM})
	return ser, ends, suns
}

// Daily temperature swing: the hourly air temperature is the day's mean plus A·cos(2π(h − 15)/24),
// h the local standard hour of the interval's midpoint, warmest at 15:00, with the amplitude
// A = 1 + 6·kt growing with the day's clearness index kt: about 2 K on an overcast day
// and 5.5 K on a clear one (common practice: clear days swing 8–12 K, overcast 2–4 K).
const (
	swingBaseK   = 1.0
	swingPerKt   = 6.0
	warmestHourH = 15.0
)

// fillTemps sets the air temperatures of a synthetic year: monthly means interpolated linearly
// between mid-months, the daily swing, and a final shift per month so that each month's mean
// equals temps exactly. dayKt gives each record's daily clearness index.
func fillTemps(ser *Series, temps [12]float64, dayKt []float64) {
	zone := fixedZone(ser.TZOffsetHours)
	var sum [12]float64
	var n [12]int
	for i := range ser.Records {
		mid := ser.Records[i].End.Add(-ser.Interval / 2).In(zone)
		m := int(mid.Month()) - 1
		// Fraction of the way from this month's middle to the next (or previous) one.
		dim := float64(daysIn(m+1, mid.Year()))
		h := float64(mid.Hour()) + float64(mid.Minute())/60
		pos := (float64(mid.Day()-1) + h/24) / dim // 0..1 through the month
		var base float64
		if pos >= 0.5 {
			next := temps[(m+1)%12]
			base = temps[m] + (pos-0.5)*(next-temps[m])
		} else {
			prev := temps[(m+11)%12]
			base = temps[m] + (0.5-pos)*(prev-temps[m])
		}
		amp := swingBaseK + swingPerKt*dayKt[i]
		t := base + amp*math.Cos(2*math.Pi*(h-warmestHourH)/24)
		ser.Records[i].AirTempC = t
		sum[m] += t
		n[m]++
	}
	var shift [12]float64
	for m := range shift {
		if n[m] > 0 {
			shift[m] = temps[m] - sum[m]/float64(n[m])
		}
	}
	for i := range ser.Records {
		m := ser.Records[i].End.Add(-ser.Interval/2).In(zone).Month() - 1
		ser.Records[i].AirTempC += shift[m]
	}
}

// CheckClearSky returns an *InputError, named name, for every calendar month (on the data's
// standard-time clock) whose global irradiation in the series exceeds what a cloudless, very
// clean sky (Ineichen & Perez 2002 at Linke turbidity 2) gives at site over the same records.
// Clouds can lift single minutes above a clear sky, never a month: a month above it means
// wrong units, a file for another place, or stamps far off.
func (s *Series) CheckClearSky(name string, site Site) error {
	p := &problems{name: name}
	if s == nil || len(s.Records) == 0 || s.Interval <= 0 {
		return nil
	}
	ends := make([]time.Time, len(s.Records))
	for i, r := range s.Records {
		ends[i] = r.End
	}
	suns := sunOver(ends, s.Interval, sun.Observer{LatDeg: site.LatDeg, LonDeg: site.LonDeg, ElevationM: site.ElevationM})
	zone := fixedZone(s.TZOffsetHours)
	hours := s.Interval.Hours()
	var data, env [12]float64
	for i, r := range s.Records {
		m := r.End.Add(-s.Interval/2).In(zone).Month() - 1
		data[m] += r.GHI * hours / 1000
		if is := suns[i]; is.frac > 0 {
			g, _ := clearSky(is.pos.Zenith.Degrees(), irradiance.ExtraterrestrialNormal(is.doy), envelopeTL, site.ElevationM)
			env[m] += g * is.frac * hours / 1000
		}
	}
	for m := range 12 {
		if data[m] > env[m] && data[m] > 0 {
			p.add(0, "GHI "+monthNames[m], "%.1f kWh/m² over the month, above the %.1f kWh/m² a cloudless sky gives at the site (%.2f°, %.2f°) over the same hours; check the units (W/m², the mean over each hour), that the file is for this site, and the stamps",
				data[m], env[m], site.LatDeg, site.LonDeg)
		}
	}
	return p.err()
}
