package weather

import (
	"bufio"
	"fmt"
	"io"
	"slices"
	"strings"
	"time"

	"sunstring/shading/sun"
)

// CSV column names. See the package documentation for the format.
const (
	colTime = "time"
	colGHI  = "ghi_w_m2"
	colDNI  = "dni_w_m2"
	colDHI  = "dhi_w_m2"
	colTemp = "air_temp_c"
	colWind = "wind_m_s"

	metaLat  = "latitude_deg"
	metaLon  = "longitude_deg"
	metaElev = "elevation_m"
)

var knownColumns = []string{colTime, colGHI, colDNI, colDHI, colTemp, colWind}

// ReadCSV reads hourly weather in the CSV format described in the package documentation; name
// is used in messages. A file without dni_w_m2 and dhi_w_m2 must give its location in
// comment lines, since splitting GHI needs the sun; otherwise use ReadCSVAt.
func ReadCSV(r io.Reader, name string) (*Series, error) {
	return readCSV(r, name, nil)
}

// ReadCSVAt is ReadCSV for a file read for site: when the file lacks dni_w_m2 and dhi_w_m2,
// GHI is split with the sun at site. The series' own location still comes only from the file.
func ReadCSVAt(r io.Reader, name string, site Site) (*Series, error) {
	return readCSV(r, name, &site)
}

func readCSV(r io.Reader, name string, site *Site) (*Series, error) {
	p := &problems{name: name}
	s := &Series{Interval: time.Hour, Source: SourceFile}
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 4096), maxLineBytes)
	col := map[string]int{}
	var header []string
	headerLine := 0
	var meta = map[string]float64{}
	var rows []row
	minOffset, haveOffset := 0, false
	line := 0
	for sc.Scan() {
		line++
		text := strings.TrimRight(sc.Text(), "\r")
		if line == 1 {
			text = strings.TrimPrefix(text, "\ufeff")
		}
		trimmed := strings.TrimSpace(text)
		if trimmed == "" {
			continue
		}
		if strings.HasPrefix(trimmed, "#") {
			if headerLine == 0 {
				readMeta(p, line, trimmed[1:], meta)
			}
			continue
		}
		f := strings.Split(text, ",")
		for i := range f {
			f[i] = strings.TrimSpace(f[i])
		}
		if headerLine == 0 {
			headerLine = line
			header = f
			for i, c := range f {
				if _, dup := col[c]; dup {
					p.add(line, c, "column appears twice")
					continue
				}
				col[c] = i
			}
			for _, c := range []string{colTime, colGHI, colTemp} {
				if _, ok := col[c]; !ok {
					p.add(line, c, "required column missing; the header needs %s, %s and %s", colTime, colGHI, colTemp)
				}
			}
			_, hasDNI := col[colDNI]
			_, hasDHI := col[colDHI]
			if hasDNI != hasDHI {
				p.add(line, colDNI, "%s and %s come together or not at all", colDNI, colDHI)
			}
			var unknown []string
			for _, c := range f {
				if !slices.Contains(knownColumns, c) {
					unknown = append(unknown, fmt.Sprintf("%q", clip(c)))
				}
			}
			if len(unknown) > 0 {
				s.Warnings = append(s.Warnings, fmt.Sprintf("columns not used: %s", strings.Join(unknown, ", ")))
			}
			if p.count() > 0 {
				return nil, p.err() // without the right columns every row would fail the same way
			}
			continue
		}
		if len(f) != len(header) {
			p.add(line, "", "row has %d fields, the header %d", len(f), len(header))
			continue
		}
		rw := row{line: line}
		ok := true
		ts := f[col[colTime]]
		t, err := time.Parse(time.RFC3339, ts)
		if err != nil {
			p.add(line, colTime, "%q is not an RFC 3339 time with offset (e.g. 2025-06-01T13:00:00+02:00)", clip(ts))
			ok = false
		} else {
			_, off := t.Zone()
			if !haveOffset || off < minOffset {
				minOffset, haveOffset = off, true
			}
			rw.rec.End = t.UTC()
		}
		num := func(c string, lim limit, dst *float64) {
			v, good := parseNum(p, line, c, f[col[c]])
			if !good || !lim.check(p, line, c, v) {
				ok = false
				return
			}
			*dst = v
		}
		num(colGHI, limIrradiance, &rw.rec.GHI)
		num(colTemp, limTemp, &rw.rec.AirTempC)
		if _, has := col[colDNI]; has {
			num(colDNI, limIrradiance, &rw.rec.DNI)
			num(colDHI, limIrradiance, &rw.rec.DHI)
		} else {
			rw.missBeam = true
		}
		if _, has := col[colWind]; has {
			num(colWind, limWind, &rw.rec.WindMS)
		} else {
			rw.rec.WindMS = DefaultWindMS
		}
		if ok {
			rows = append(rows, rw)
		}
	}
	if err := sc.Err(); err != nil {
		p.add(line+1, "", "cannot read: %v", err)
	}
	if headerLine == 0 && p.count() == 0 {
		p.add(line, "", "no header row; the first line that is not a comment names the columns")
	} else if len(rows) == 0 && p.count() == 0 {
		p.add(line, "", "no data rows")
	}
	lat, hasLat := meta[metaLat]
	lon, hasLon := meta[metaLon]
	if hasLat != hasLon {
		p.add(0, metaLat, "comment lines give one of %s and %s; give both or neither", metaLat, metaLon)
	}
	if hasLat && hasLon {
		s.HasLocation, s.LatDeg, s.LonDeg, s.ElevationM = true, lat, lon, meta[metaElev]
	}
	s.TZOffsetHours = float64(minOffset) / 3600
	var obs *sun.Observer
	switch {
	case site != nil:
		obs = &sun.Observer{LatDeg: site.LatDeg, LonDeg: site.LonDeg, ElevationM: site.ElevationM}
	case s.HasLocation:
		obs = &sun.Observer{LatDeg: s.LatDeg, LonDeg: s.LonDeg, ElevationM: s.ElevationM}
	}
	if _, has := col[colDNI]; !has && obs == nil && headerLine > 0 {
		p.add(headerLine, colDNI, "no %s and %s columns and no location: add the columns, or comment lines \"# %s: …\" and \"# %s: …\" so GHI can be split",
			colDNI, colDHI, metaLat, metaLon)
	}
	checkSequence(p, rows, s.Interval, colTime)
	if p.count() > 0 {
		return nil, p.err()
	}
	finish(p, rows, s, obs)
	if err := p.err(); err != nil {
		return nil, err
	}
	return s, nil
}

// readMeta reads a "key: value" comment before the header; other comments are free text.
func readMeta(p *problems, line int, text string, meta map[string]float64) {
	k, v, found := strings.Cut(text, ":")
	if !found {
		return
	}
	k = strings.TrimSpace(k)
	lims := map[string]limit{
		metaLat:  {-90, 90, "degrees"},
		metaLon:  {-180, 180, "degrees"},
		metaElev: {-1000, 9000, "m"},
	}
	lim, known := lims[k]
	if !known {
		return
	}
	x, ok := parseNum(p, line, k, v)
	if ok && lim.check(p, line, k, x) {
		meta[k] = x
	}
}
