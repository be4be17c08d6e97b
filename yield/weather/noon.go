package weather

import (
	"fmt"
	"math"
	"slices"
	"time"

	"sunstring/shading/sun"
	"sunstring/yield/irradiance"
)

// NoonShift is how far the irradiance of a weather series peaks from solar noon, measured on
// its clearest days.
type NoonShift struct {
	// Hours is the mean, over the days used, of the GHI-weighted mean time of day less the
	// same mean of the extraterrestrial horizontal irradiance over the same records (which is
	// solar noon, sampled the way the data is). Positive: the data's light comes later than
	// the sun's.
	Hours float64
	// SpreadHours is the standard deviation of the daily values: a real shift moves every
	// day alike, clouds scatter them.
	SpreadHours float64
	// Days is how many days were used: the clearest quarter (by daily clearness index) of the
	// whole days with sunrise and sunset.
	Days int
}

// Noon-shift thresholds. A stamping mistake moves every day by a whole interval (one hour) or
// half of one (stamps at the middle instead of the end); a synthetic or clear-sky year here
// stays within a minute or two, and measured clear days within a few minutes, since morning
// haze and afternoon clouds are not symmetric (common practice). A third of an hour flags the
// half-hour mistake with room for the weather.
const (
	noonShiftWarnH  = 1.0 / 3
	noonShiftMinDay = 7 // fewer clear days than this give no verdict
)

// NoonShift measures how far the series' daily light lies from solar noon at obs. It reports
// false when fewer than a week of whole days with sunrise and sunset are available (a short
// series, a polar site in midsummer).
//
// Each day is the local standard-time day of the data (TZOffsetHours). A day's mean time is
// the GHI-weighted mean of its records' interval midpoints; its reference is the same mean
// weighted by the extraterrestrial irradiance on a horizontal surface over each record
// (package irradiance, with the sun from package sun), so the sunrise and sunset hours are
// treated the same in both.
func (s *Series) NoonShift(obs sun.Observer) (NoonShift, bool) {
	if s == nil || len(s.Records) == 0 || s.Interval <= 0 {
		return NoonShift{}, false
	}
	ends := make([]time.Time, len(s.Records))
	for i, r := range s.Records {
		ends[i] = r.End
	}
	suns := sunOver(ends, s.Interval, obs)
	zone := fixedZone(s.TZOffsetHours)
	perDay := int(24 * time.Hour / s.Interval)

	type day struct{ kt, shift float64 }
	var days []day
	for start := 0; start < len(ends); {
		mid0 := ends[start].Add(-s.Interval / 2).In(zone)
		y, m, d := mid0.Date()
		dayStart := time.Date(y, m, d, 0, 0, 0, 0, zone)
		end := start
		var g, gt, e, et float64
		for end < len(ends) {
			mid := ends[end].Add(-s.Interval / 2).In(zone)
			if my, mm, md := mid.Date(); my != y || mm != m || md != d {
				break
			}
			h := mid.Sub(dayStart).Hours()
			etr := irradiance.ExtraterrestrialNormal(suns[end].doy) * suns[end].meanC
			g += s.Records[end].GHI
			gt += s.Records[end].GHI * h
			e += etr
			et += etr * h
			end++
		}
		// Whole days only, and only days that begin and end in darkness: a polar day has no
		// noon to centre on.
		if end-start == perDay && e > 0 && g > 0 && suns[start].meanC == 0 && suns[end-1].meanC == 0 {
			days = append(days, day{kt: g / e, shift: gt/g - et/e})
		}
		start = end
	}
	if len(days) < noonShiftMinDay {
		return NoonShift{}, false
	}
	slices.SortStableFunc(days, func(a, b day) int { return cmpFloat(b.kt, a.kt) })
	use := days[:max(noonShiftMinDay, (len(days)+3)/4)]
	var sum, sum2 float64
	for _, d := range use {
		sum += d.shift
	}
	mean := sum / float64(len(use))
	for _, d := range use {
		sum2 += (d.shift - mean) * (d.shift - mean)
	}
	return NoonShift{Hours: mean, SpreadHours: math.Sqrt(sum2 / float64(len(use))), Days: len(use)}, true
}

// NoonWarning returns a warning naming the file (name) when the series' light peaks a third
// of an hour or more from solar noon at obs, with the size of the shift and what to check;
// otherwise "".
func (s *Series) NoonWarning(name string, obs sun.Observer) string {
	ns, ok := s.NoonShift(obs)
	if !ok || math.Abs(ns.Hours) < noonShiftWarnH {
		return ""
	}
	when, hint := "after", "stamps an hour (or half an hour) late: check the UTC offset of the stamps (daylight saving time given as standard time?) and the site's time zone"
	if ns.Hours < 0 {
		when, hint = "before", "stamps early: check that each stamp marks the END of its hour (a file stamped at the start of each hour reads an hour early), the UTC offset of the stamps and the site's time zone"
	}
	return fmt.Sprintf("%s: irradiance peaks %.0f minutes %s solar noon on average over the %d clearest days (spread %.0f minutes); the data looks shifted in time, which moves shade to the wrong hours. Likely cause: %s",
		name, math.Abs(ns.Hours)*60, when, ns.Days, ns.SpreadHours*60, hint)
}
