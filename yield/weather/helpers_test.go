package weather

import (
	"fmt"
	"strings"
	"time"
)

// epwRow is one data row for generated EPW texts; the numbers in tests are invented.
type epwRow struct {
	y, m, d, h          int
	tempC, ghi, dni, dh float64
	wind                float64
}

// epwHeader is an invented station near 47° N, 15° E, zone UTC+1, 360 m.
const epwHeader = `LOCATION,Testville,ST,XXX,invented,000000,47.07,15.44,1.0,360.0
DESIGN CONDITIONS,0
TYPICAL/EXTREME PERIODS,0
GROUND TEMPERATURES,0
HOLIDAYS/DAYLIGHT SAVINGS,No,0,0,0
COMMENTS 1,invented
COMMENTS 2,
DATA PERIODS,1,1,Data,Sunday, 1/ 1,12/31
`

// epwLine formats a row with all 35 fields; fields not read carry plausible fillers.
func epwLine(r epwRow) string {
	return fmt.Sprintf("%d,%d,%d,%d,60,?9?9?9?9E0?9?9?9,%g,-5.0,80,97000,0,1415,250,%g,%g,%g,999900,999900,999900,9999,180,%g,5,5,9999,99999,9,999999999,10,0.1,0,88,0.2,0.0,1.0",
		r.y, r.m, r.d, r.h, r.tempC, r.ghi, r.dni, r.dh, r.wind)
}

// epwDays returns rows for n whole days from the date given, with a bell of global
// radiation around local noon; year labels follow the calendar.
func epwDays(y, m, d, n int) []epwRow {
	var rows []epwRow
	t := time.Date(y, time.Month(m), d, 0, 0, 0, 0, time.UTC)
	for range n {
		for h := 1; h <= 24; h++ {
			g := 0.0
			if h >= 9 && h <= 16 {
				g = 200
			}
			rows = append(rows, epwRow{t.Year(), int(t.Month()), t.Day(), h, 3, g, 300, g * 0.5, 2})
		}
		t = t.AddDate(0, 0, 1)
	}
	return rows
}

func epwDoc(rows []epwRow) string {
	var b strings.Builder
	b.WriteString(epwHeader)
	for _, r := range rows {
		b.WriteString(epwLine(r))
		b.WriteByte('\n')
	}
	return b.String()
}

// csvDoc returns an hourly CSV text with a location, starting at the given RFC 3339 end stamp.
func csvDoc(first string, n int, row func(i int, stamp string) string) string {
	var b strings.Builder
	b.WriteString("# invented\n# latitude_deg: 47.07\n# longitude_deg: 15.44\ntime,ghi_w_m2,dni_w_m2,dhi_w_m2,air_temp_c,wind_m_s\n")
	t, err := time.Parse(time.RFC3339, first)
	if err != nil {
		panic(err)
	}
	for i := range n {
		st := t.Add(time.Duration(i) * time.Hour).Format(time.RFC3339)
		b.WriteString(row(i, st))
		b.WriteByte('\n')
	}
	return b.String()
}

func csvPlain(i int, stamp string) string {
	return stamp + ",100,200,50,10,2"
}
