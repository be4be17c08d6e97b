package weather

import (
	"fmt"
	"math"
	"time"
)

// TypicalYear is the non-leap calendar year onto which synthetic years and typical-year files
// (whose months come from different source years) are mapped.
const TypicalYear = 2025

// Source says where a Series came from.
type Source string

// The sources a Series may have.
const (
	SourceFile       Source = "file"       // measured or typical-year data read from a file
	SourceMonthly    Source = "monthly"    // synthesized from monthly totals and means
	SourceIndicative Source = "indicative" // clear sky: an upper bound, not a yield estimate
)

// Record is one interval of weather. The zero value is a dark, calm hour at 0 °C at the zero
// time.
type Record struct {
	End           time.Time // UTC; the end of the interval (hour-ending)
	GHI, DNI, DHI float64   // W/m², means over the interval
	AirTempC      float64   // air temperature, °C
	WindMS        float64   // wind speed, m/s
}

// Series is an ordered, gap-free run of weather records.
//
// The zero value is an empty series: no records, no location.
type Series struct {
	Interval time.Duration // the length of every interval: one hour
	Records  []Record      // ordered by End, each Interval after the one before
	Source   Source

	// HasLocation reports whether the fields below come from the data (an EPW LOCATION line,
	// CSV comment lines, or the site a synthetic year was made for).
	HasLocation   bool
	LatDeg        float64 // north positive
	LonDeg        float64 // east positive
	ElevationM    float64 // metres above sea level
	TZOffsetHours float64 // the data's standard-time offset from UTC, hours; Monthly bins by it

	// Warnings are things a surveyor should know about the data: typical-year mapping, dropped
	// rows, filled gaps. Ordered as found.
	Warnings []string
}

// Site is the place weather is wanted for. The zero value is on the equator at the prime
// meridian at sea level, with a nil Zone meaning UTC.
type Site struct {
	LatDeg, LonDeg, ElevationM float64
	Zone                       *time.Location // IANA zone of the site; nil means UTC
}

// Month holds the totals and means of one calendar month.
type Month struct {
	GHIKWhM2, DNIKWhM2, DHIKWhM2 float64 // irradiation, kWh/m²
	TempC                        float64 // mean air temperature, °C; 0 when the month is absent
}

// Monthly returns the irradiation totals and mean air temperature of each calendar month
// (index 0 is January). A record belongs to the month that contains its interval's midpoint on
// the data's standard-time clock (TZOffsetHours). For a series of more than one year the totals
// add up over the years; months without records are zero.
func (s *Series) Monthly() [12]Month {
	var out [12]Month
	if s == nil {
		return out
	}
	var n [12]int
	hours := s.Interval.Hours()
	zone := fixedZone(s.TZOffsetHours)
	for _, r := range s.Records {
		m := r.End.Add(-s.Interval/2).In(zone).Month() - 1
		out[m].GHIKWhM2 += r.GHI * hours / 1000
		out[m].DNIKWhM2 += r.DNI * hours / 1000
		out[m].DHIKWhM2 += r.DHI * hours / 1000
		out[m].TempC += r.AirTempC
		n[m]++
	}
	for m := range out {
		if n[m] > 0 {
			out[m].TempC /= float64(n[m])
		}
	}
	return out
}

// Thresholds for CheckSite: a weather station farther than this is a different climate for a
// roof (common practice: irradiation varies by a few per cent over tens of kilometres in
// complex terrain), and a height difference beyond this changes the air temperature by about
// 3 K (standard lapse rate 6.5 K/km, ISO 2533).
const (
	siteDistanceWarnKm  = 50
	siteElevationWarnM  = 500
	earthMeanRadiusKm   = 6371.0088 // IUGG mean radius
	zoneOffsetTolerance = 1e-6
)

// CheckSite returns warnings when the location the data carries disagrees with site: the
// distance between them, their heights, and the data's clock against the site zone's standard
// time. A series without a location gives one warning saying that nothing could be checked.
func (s *Series) CheckSite(site Site) []string {
	if s == nil || !s.HasLocation {
		return []string{"weather: the data carries no location; cannot check it against the site"}
	}
	var w []string
	d := greatCircleKm(s.LatDeg, s.LonDeg, site.LatDeg, site.LonDeg)
	if d > siteDistanceWarnKm {
		w = append(w, fmt.Sprintf("weather: data location (%.3f, %.3f) is %.0f km from the site (%.3f, %.3f); more than %d km, the climate may differ",
			s.LatDeg, s.LonDeg, d, site.LatDeg, site.LonDeg, siteDistanceWarnKm))
	}
	if dh := math.Abs(s.ElevationM - site.ElevationM); dh > siteElevationWarnM {
		w = append(w, fmt.Sprintf("weather: data elevation %.0f m differs from the site's %.0f m by more than %d m; air temperatures may be off by %.0f K",
			s.ElevationM, site.ElevationM, siteElevationWarnM, dh*6.5/1000))
	}
	std := StandardOffsetHours(site.Zone)
	if math.Abs(std-s.TZOffsetHours) > zoneOffsetTolerance {
		w = append(w, fmt.Sprintf("weather: data clock is UTC%+g h but the site zone %s keeps standard time UTC%+g h; the data may be for another place",
			s.TZOffsetHours, zoneName(site.Zone), std))
	}
	return w
}

// StandardOffsetHours returns the standard-time offset of zone from UTC in hours for
// TypicalYear: the smaller of the offsets on 1 January and 1 July, since daylight saving time
// adds to standard time. A nil zone is UTC.
func StandardOffsetHours(zone *time.Location) float64 {
	if zone == nil {
		return 0
	}
	_, jan := time.Date(TypicalYear, 1, 1, 12, 0, 0, 0, zone).Zone()
	_, jul := time.Date(TypicalYear, 7, 1, 12, 0, 0, 0, zone).Zone()
	return float64(min(jan, jul)) / 3600
}

func zoneName(z *time.Location) string {
	if z == nil {
		return "UTC"
	}
	return z.String()
}

// fixedZone returns a zone at a fixed offset of h hours (fractional offsets such as 5.5 and
// 9.5 exist).
func fixedZone(h float64) *time.Location {
	return time.FixedZone("", int(math.Round(h*3600)))
}

// greatCircleKm is the haversine distance on the mean sphere; good to about 0.5 %, plenty for
// a warning threshold.
func greatCircleKm(lat1, lon1, lat2, lon2 float64) float64 {
	const rad = math.Pi / 180
	dlat := (lat2 - lat1) * rad
	dlon := (lon2 - lon1) * rad
	a := math.Sin(dlat/2)*math.Sin(dlat/2) + math.Cos(lat1*rad)*math.Cos(lat2*rad)*math.Sin(dlon/2)*math.Sin(dlon/2)
	return 2 * earthMeanRadiusKm * math.Asin(math.Min(1, math.Sqrt(a)))
}
