package weather

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
	"strings"
	"time"

	"sunstring/shading/sun"
)

// EPW layout, from the EPW data dictionary (EnergyPlus Auxiliary Programs, "EnergyPlus Weather
// File (EPW) Data Dictionary"): eight header lines, then one comma-separated row per interval.
// Field indices below are 0-based.
const (
	epwHeaderLines = 8
	epwFields      = 35 // N1..N30 with A1..A3: a complete data row
	epwReadFields  = 22 // everything up to and including wind speed, the last field read here

	epwYear, epwMonth, epwDay, epwHour = 0, 1, 2, 3
	epwDryBulb                         = 6          // N6, °C, missing 99.9
	epwGHI, epwDNI, epwDHI             = 13, 14, 15 // N13..N15, Wh/m² over the hour, missing 9999
	epwWind                            = 21         // N21, m/s, missing 999

	epwMissingRadiation = 9999
	epwMissingTemp      = 99.9
	epwMissingWind      = 999
)

var epwFieldNames = map[int]string{
	epwYear: "Year", epwMonth: "Month", epwDay: "Day", epwHour: "Hour",
	epwDryBulb: "Dry Bulb Temperature",
	epwGHI:     "Global Horizontal Radiation", epwDNI: "Direct Normal Radiation", epwDHI: "Diffuse Horizontal Radiation",
	epwWind: "Wind Speed",
}

// maxLineBytes bounds one line so a binary file given by mistake fails fast.
const maxLineBytes = 1 << 16

// ReadEPW reads an hourly EPW weather file; name is used in messages.
//
// Read from the file: LOCATION (latitude, longitude, time zone, elevation), DATA PERIODS
// (records per hour must be 1), and for each row the date, the hour (1–24, the hour ending at
// that clock hour of local standard time, UTC + the LOCATION offset), dry bulb temperature,
// global, direct normal and diffuse horizontal radiation (Wh/m² over the hour, read as the mean
// in W/m²) and wind speed. The minute field is not used.
//
// Rules:
//   - Typical-year files take each month from a different source year. When the rows carry
//     more than one year, every row is mapped onto TypicalYear and a warning says so; a
//     29 February in such a file is dropped, with a warning, since TypicalYear has none. A file
//     of one calendar year keeps its year, and its 29 February when that year is a leap year.
//   - Missing global radiation (9999) is an error. Missing direct or diffuse radiation in a row
//     is replaced by an Erbs et al. (1982) split of its global radiation; missing temperature
//     (99.9) and wind speed (999) by linear interpolation between neighbouring hours. Each
//     fill is counted in a warning.
//   - Rows must be hourly, in order and without gaps or duplicates after the mapping.
//
// All problems are returned together as an *InputError.
func ReadEPW(r io.Reader, name string) (*Series, error) {
	p := &problems{name: name}
	s := &Series{Interval: time.Hour, Source: SourceFile}
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 4096), maxLineBytes)
	type rawRow struct {
		line                   int
		year, month, day, hour int
		vals                   [epwReadFields]float64
		missBeam, missT, missW bool
	}
	var raws []rawRow
	line := 0
	perHour := 1
	for sc.Scan() {
		line++
		text := strings.TrimRight(sc.Text(), "\r")
		if line == 1 {
			text = strings.TrimPrefix(text, "\ufeff")
		}
		f := strings.Split(text, ",")
		switch {
		case line == 1:
			readLocation(p, f, s)
			continue
		case line == epwHeaderLines:
			if !strings.EqualFold(strings.TrimSpace(f[0]), "DATA PERIODS") {
				p.add(line, "DATA PERIODS", "line %d must be the DATA PERIODS header, found %q", epwHeaderLines, clip(f[0]))
			} else if len(f) > 2 {
				if v, err := strconv.Atoi(strings.TrimSpace(f[2])); err == nil {
					perHour = v
				}
				if perHour != 1 {
					p.add(line, "Number of Records per Hour", "%q: only hourly files (1 record per hour) are read", clip(f[2]))
				}
			}
			continue
		case line < epwHeaderLines:
			continue
		}
		if strings.TrimSpace(text) == "" {
			continue // a trailing blank line is common and harmless
		}
		if len(f) != epwFields {
			// Fields are known only by position: a row of another length would be read shifted.
			p.add(line, "", "row has %d fields, want %d", len(f), epwFields)
			continue
		}
		rr := rawRow{line: line}
		ok := true
		ints := [...]struct {
			idx    int
			dst    *int
			lo, hi int
		}{{epwYear, &rr.year, 1, 9999}, {epwMonth, &rr.month, 1, 12}, {epwDay, &rr.day, 1, 31}, {epwHour, &rr.hour, 1, 24}}
		for _, c := range ints {
			v, err := strconv.Atoi(strings.TrimSpace(f[c.idx]))
			switch {
			case err != nil:
				p.add(line, epwFieldNames[c.idx], "%q is not a whole number", clip(strings.TrimSpace(f[c.idx])))
				ok = false
			case v < c.lo || v > c.hi:
				p.add(line, epwFieldNames[c.idx], "value %d outside %d..%d", v, c.lo, c.hi)
				ok = false
			}
			*c.dst = v
		}
		if ok && rr.day > daysIn(rr.month, 2000) { // 2000: a leap year, so 29 February passes here
			p.add(line, epwFieldNames[epwDay], "value %d: month %d has %d days", rr.day, rr.month, daysIn(rr.month, 2000))
			ok = false
		}
		for _, idx := range [...]int{epwDryBulb, epwGHI, epwDNI, epwDHI, epwWind} {
			v, good := parseNum(p, line, epwFieldNames[idx], f[idx])
			if !good {
				ok = false
				continue
			}
			rr.vals[idx] = v
			switch idx {
			case epwDryBulb:
				if v >= epwMissingTemp {
					rr.missT = true
				} else if !limTemp.check(p, line, epwFieldNames[idx], v) {
					ok = false
				}
			case epwWind:
				if v >= epwMissingWind {
					rr.missW = true
				} else if !limWind.check(p, line, epwFieldNames[idx], v) {
					ok = false
				}
			case epwGHI:
				if v >= epwMissingRadiation {
					p.add(line, epwFieldNames[idx], "missing (%s); global horizontal radiation is required in every row", fmtNum(v))
					ok = false
				} else if !limIrradiance.check(p, line, epwFieldNames[idx], v) {
					ok = false
				}
			default:
				if v >= epwMissingRadiation {
					rr.missBeam = true
				} else if !limIrradiance.check(p, line, epwFieldNames[idx], v) {
					ok = false
				}
			}
		}
		if ok {
			raws = append(raws, rr)
		}
	}
	if err := sc.Err(); err != nil {
		p.add(line+1, "", "cannot read: %v", err)
	}
	if line < epwHeaderLines {
		p.add(line, "", "file has %d lines; an EPW file has %d header lines and then data", line, epwHeaderLines)
	} else if len(raws) == 0 && p.count() == 0 {
		p.add(line, "", "no data rows after the %d header lines", epwHeaderLines)
	}

	years := map[int]bool{}
	minYear, maxYear := 0, 0
	for i, rr := range raws {
		years[rr.year] = true
		if i == 0 || rr.year < minYear {
			minYear = rr.year
		}
		if rr.year > maxYear {
			maxYear = rr.year
		}
	}
	typical := len(years) > 1
	// A file of one year that ends at hour 24 of 31 December has the next year's first instant
	// as its last stamp, which is fine; only the row labels decide.
	if typical {
		s.Warnings = append(s.Warnings, fmt.Sprintf("typical-year file: rows from the years %d–%d are mapped onto %d", minYear, maxYear, TypicalYear))
	}
	zone := fixedZone(s.TZOffsetHours)
	rows := make([]row, 0, len(raws))
	dropped, firstDropped := 0, 0
	for _, rr := range raws {
		year := rr.year
		if typical {
			year = TypicalYear
		}
		if rr.month == 2 && rr.day == 29 && daysIn(2, year) == 28 {
			if typical {
				if dropped == 0 {
					firstDropped = rr.line
				}
				dropped++
				continue
			}
			p.add(rr.line, epwFieldNames[epwDay], "29 February in %d, which is not a leap year", year)
			continue
		}
		end := time.Date(year, time.Month(rr.month), rr.day, 0, 0, 0, 0, zone).Add(time.Duration(rr.hour) * time.Hour).UTC()
		rows = append(rows, row{
			line:     rr.line,
			rec:      Record{End: end, GHI: rr.vals[epwGHI], DNI: rr.vals[epwDNI], DHI: rr.vals[epwDHI], AirTempC: rr.vals[epwDryBulb], WindMS: rr.vals[epwWind]},
			missBeam: rr.missBeam, missTemp: rr.missT, missWind: rr.missW,
		})
	}
	if dropped > 0 {
		s.Warnings = append(s.Warnings, fmt.Sprintf("%d rows of 29 February dropped (from line %d): %d has no such day", dropped, firstDropped, TypicalYear))
	}
	checkSequence(p, rows, s.Interval, "Month/Day/Hour")
	if p.count() > 0 {
		return nil, p.err()
	}
	obs := &sun.Observer{LatDeg: s.LatDeg, LonDeg: s.LonDeg, ElevationM: s.ElevationM}
	finish(p, rows, s, obs)
	if err := p.err(); err != nil {
		return nil, err
	}
	return s, nil
}

// readLocation reads the LOCATION header: LOCATION, city, state, country, source, WMO number,
// latitude, longitude, time zone (hours from UTC), elevation (m).
func readLocation(p *problems, f []string, s *Series) {
	if !strings.EqualFold(strings.TrimSpace(f[0]), "LOCATION") {
		p.add(1, "LOCATION", "line 1 must be the LOCATION header, found %q", clip(f[0]))
		return
	}
	if len(f) < 10 {
		p.add(1, "LOCATION", "has %d fields, want 10 (…, latitude, longitude, time zone, elevation)", len(f))
		return
	}
	fields := [...]struct {
		idx  int
		name string
		dst  *float64
		lim  limit
	}{
		// Ranges from the EPW data dictionary, except the time zone: it allows −12..+12, but
		// zones reach +14 (Pacific/Kiritimati).
		{6, "Latitude", &s.LatDeg, limit{-90, 90, "degrees"}},
		{7, "Longitude", &s.LonDeg, limit{-180, 180, "degrees"}},
		{8, "TimeZone", &s.TZOffsetHours, limit{-12, 14, "hours"}},
		{9, "Elevation", &s.ElevationM, limit{-1000, 9999.9, "m"}},
	}
	ok := true
	for _, c := range fields {
		v, good := parseNum(p, 1, c.name, f[c.idx])
		if !good || !c.lim.check(p, 1, c.name, v) {
			ok = false
			continue
		}
		*c.dst = v
	}
	s.HasLocation = ok
}

// daysIn returns the number of days in month m of year y.
func daysIn(m, y int) int {
	return time.Date(y, time.Month(m)+1, 0, 0, 0, 0, 0, time.UTC).Day()
}
