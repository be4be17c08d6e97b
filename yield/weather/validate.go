package weather

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"sunstring/shading/sun"
)

// limit is the range a value in a weather file may take.
type limit struct {
	lo, hi float64
	unit   string
}

// Ranges accepted from files. Irradiance: up to 1500 W/m², above the extraterrestrial
// 1413 W/m² at perihelion (Spencer 1971 with 1367 W/m²), so only impossible values are refused.
// Temperature and wind: the limits of the EPW data dictionary (EnergyPlus Auxiliary Programs,
// "EnergyPlus Weather File (EPW) Data Dictionary": dry bulb > −70 and < 70 °C, wind speed
// 0..40 m/s).
var (
	limIrradiance = limit{0, 1500, "W/m²"}
	limTemp       = limit{-70, 70, "°C"}
	limWind       = limit{0, 40, "m/s"}
)

// DefaultWindMS is the wind speed assumed where the data has none: 1 m/s, the usual reference
// wind of module temperature models (common practice).
const DefaultWindMS = 1.0

// check adds a problem when v is outside l and reports whether v is acceptable.
func (l limit) check(p *problems, line int, field string, v float64) bool {
	if v < l.lo || v > l.hi {
		p.add(line, field, "value %s outside %g..%g %s", fmtNum(v), l.lo, l.hi, l.unit)
		return false
	}
	return true
}

// parseNum parses a decimal number, refusing NaN and infinities, which strconv accepts.
func parseNum(p *problems, line int, field, s string) (float64, bool) {
	s = strings.TrimSpace(s)
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		p.add(line, field, "%q is not a number", clip(s))
		return 0, false
	}
	return v, true
}

func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// clip shortens user text quoted in messages so a garbage line does not flood the terminal.
func clip(s string) string {
	const n = 40
	if len(s) <= n {
		return s
	}
	return s[:n] + "…"
}

// row is a parsed record with the line it came from and which values the file lacked.
type row struct {
	line               int
	rec                Record
	missBeam, missTemp bool // DNI or DHI, air temperature
	missWind           bool
}

// checkSequence adds a problem for every row whose stamp is not exactly interval after the
// previous one: duplicates, rows out of order and gaps.
func checkSequence(p *problems, rows []row, interval time.Duration, field string) {
	for i := 1; i < len(rows); i++ {
		prev, cur := rows[i-1], rows[i]
		d := cur.rec.End.Sub(prev.rec.End)
		switch {
		case d == interval:
		case d == 0:
			p.add(cur.line, field, "duplicate of line %d (%s)", prev.line, cur.rec.End.Format(time.RFC3339))
		case d < 0:
			p.add(cur.line, field, "%s is before line %d (%s); rows must be in time order",
				cur.rec.End.Format(time.RFC3339), prev.line, prev.rec.End.Format(time.RFC3339))
		case d%interval == 0:
			p.add(cur.line, field, "gap: %d hours missing after line %d (%s); rows must be hourly without gaps",
				int(d/interval)-1, prev.line, prev.rec.End.Format(time.RFC3339))
		default:
			p.add(cur.line, field, "%s is %s after line %d; rows must be exactly one hour apart",
				cur.rec.End.Format(time.RFC3339), d, prev.line)
		}
	}
}

// fillMissing replaces missing values by linear interpolation between the nearest present
// neighbours (the nearest one at the ends) and returns how many it filled. It reports false
// when no value is present at all.
func fillMissing(rows []row, miss func(*row) bool, val func(*row) *float64) (int, bool) {
	n, last := 0, -1
	for i := range rows {
		if miss(&rows[i]) {
			continue
		}
		v := *val(&rows[i])
		switch {
		case last < 0:
			for j := 0; j < i; j++ {
				*val(&rows[j]) = v
			}
			n += i
		case i-last > 1:
			lv := *val(&rows[last])
			for j := last + 1; j < i; j++ {
				f := float64(j-last) / float64(i-last)
				*val(&rows[j]) = lv + f*(v-lv)
			}
			n += i - last - 1
		}
		last = i
	}
	if last < 0 {
		return 0, false
	}
	for j := last + 1; j < len(rows); j++ {
		*val(&rows[j]) = *val(&rows[last])
		n++
	}
	return n, true
}

// finish turns validated rows into a Series: fills missing temperature and wind, splits GHI
// where beam values are missing, and notes partial years.
func finish(p *problems, rows []row, s *Series, obs *sun.Observer) {
	if n, ok := fillMissing(rows, func(r *row) bool { return r.missTemp }, func(r *row) *float64 { return &r.rec.AirTempC }); !ok {
		p.add(0, "air temperature", "no value present in any row")
	} else if n > 0 {
		s.Warnings = append(s.Warnings, fmt.Sprintf("%d missing air temperatures filled by linear interpolation between neighbouring hours", n))
	}
	if n, ok := fillMissing(rows, func(r *row) bool { return r.missWind }, func(r *row) *float64 { return &r.rec.WindMS }); !ok {
		for i := range rows {
			rows[i].rec.WindMS = DefaultWindMS
		}
		s.Warnings = append(s.Warnings, fmt.Sprintf("no wind speeds: %g m/s assumed throughout", DefaultWindMS))
	} else if n > 0 {
		s.Warnings = append(s.Warnings, fmt.Sprintf("%d missing wind speeds filled by linear interpolation between neighbouring hours", n))
	}
	s.Records = make([]Record, len(rows))
	for i := range rows {
		s.Records[i] = rows[i].rec
	}
	nBeam := 0
	for _, r := range rows {
		if r.missBeam {
			nBeam++
		}
	}
	if nBeam > 0 && obs != nil {
		ends := make([]time.Time, len(rows))
		for i := range rows {
			ends[i] = rows[i].rec.End
		}
		suns := sunOver(ends, s.Interval, *obs)
		for i, r := range rows {
			if r.missBeam {
				s.Records[i].DNI, s.Records[i].DHI = splitGHI(r.rec.GHI, suns[i], obs.ElevationM)
			}
		}
		s.Warnings = append(s.Warnings, fmt.Sprintf("%d hours without direct and diffuse values: split from GHI with the Erbs et al. (1982) correlation", nBeam))
	}
	if n := len(s.Records); n > 0 {
		start := s.Records[0].End.Add(-s.Interval).In(fixedZone(s.TZOffsetHours))
		if n != OneYearRecords(start) {
			s.Warnings = append(s.Warnings, fmt.Sprintf("the data covers %d hours (%s to %s), not one whole year; annual figures cover this span only",
				n, s.Records[0].End.Format(time.RFC3339), s.Records[n-1].End.Format(time.RFC3339)))
		}
	}
}
