package weather

import (
	"errors"
	"os"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"
)

func TestReadEPWSample(t *testing.T) {
	f, err := os.Open("testdata/sample.epw")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	s, err := ReadEPW(f, "sample.epw")
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Records) != 48 {
		t.Fatalf("records = %d, want 48 (two invented days)", len(s.Records))
	}
	// The sample is labelled 2019-01-31 and 2021-02-01: a typical-year file, mapped onto 2025.
	// Hour 1 of 31 January at UTC+1 ends at 00:00 UTC.
	if want := time.Date(TypicalYear, 1, 31, 0, 0, 0, 0, time.UTC); !s.Records[0].End.Equal(want) {
		t.Errorf("first end = %v, want %v", s.Records[0].End, want)
	}
	if !hasWarning(s.Warnings, "typical-year file") {
		t.Errorf("warnings %q lack the typical-year note", s.Warnings)
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		// Values as written in testdata/sample.epw, LOCATION line and row 12 (hour 12 of 31 January).
		{"latitude", s.LatDeg, 47.07},
		{"longitude", s.LonDeg, 15.44},
		{"zone", s.TZOffsetHours, 1},
		{"elevation", s.ElevationM, 360},
		{"ghi hour 12", s.Records[11].GHI, 295},
		{"dhi hour 12", s.Records[11].DHI, 133},
		{"wind", s.Records[11].WindMS, 2.5},
	} {
		if !scalar.EqualWithinAbs(c.got, c.want, 1e-9) {
			t.Errorf("%s = %g, want %g (parsed exactly)", c.name, c.got, c.want)
		}
	}
}

func hasWarning(ws []string, sub string) bool {
	for _, w := range ws {
		if strings.Contains(w, sub) {
			return true
		}
	}
	return false
}

func TestReadEPWBad(t *testing.T) {
	base := epwDays(2019, 3, 1, 2) // one calendar year: no mapping
	mut := func(f func([]epwRow) []epwRow) string {
		rows := append([]epwRow(nil), base...)
		return epwDoc(f(rows))
	}
	cases := []struct {
		name string
		text string
		want []string // substrings of the error, each naming line and field
	}{
		{"ghi too high", mut(func(r []epwRow) []epwRow { r[2].ghi = 2500; return r }),
			[]string{`bad.epw:11: field "Global Horizontal Radiation": value 2500 outside 0..1500 W/m²`}},
		{"ghi missing", mut(func(r []epwRow) []epwRow { r[0].ghi = 9999; return r }),
			[]string{`bad.epw:9: field "Global Horizontal Radiation": missing (9999)`}},
		{"negative dni", mut(func(r []epwRow) []epwRow { r[5].dni = -3; return r }),
			[]string{`bad.epw:14: field "Direct Normal Radiation": value -3 outside 0..1500 W/m²`}},
		{"hour 25", mut(func(r []epwRow) []epwRow { r[3].h = 25; return r }),
			[]string{`bad.epw:12: field "Hour": value 25 outside 1..24`}},
		{"hot", mut(func(r []epwRow) []epwRow { r[1].tempC = 75; return r }),
			[]string{`bad.epw:10: field "Dry Bulb Temperature": value 75 outside -70..70 °C`}},
		{"duplicate", mut(func(r []epwRow) []epwRow { r[4] = r[3]; return r }),
			[]string{`bad.epw:13: field "Month/Day/Hour": duplicate of line 12`}},
		{"unordered", mut(func(r []epwRow) []epwRow { r[4], r[5] = r[5], r[4]; return r }),
			[]string{`bad.epw:14: field "Month/Day/Hour": 2019-03-01T04:00:00Z is before line 13`}},
		{"gap", mut(func(r []epwRow) []epwRow { return append(r[:10], r[13:]...) }),
			[]string{`bad.epw:19: field "Month/Day/Hour": gap: 3 hours missing after line 18`}},
		{"april 31", mut(func(r []epwRow) []epwRow { r[0].m, r[0].d = 4, 31; return r }),
			[]string{`bad.epw:9: field "Day": value 31: month 4 has 30 days`}},
		{"feb 29 in a common year", epwDoc(epwDays(2019, 2, 28, 1)[:1]) + epwLine(epwRow{2019, 2, 29, 1, 0, 0, 0, 0, 1}) + "\n",
			[]string{`bad.epw:10: field "Day": 29 February in 2019, which is not a leap year`}},
		{"short row", strings.Replace(mut(func(r []epwRow) []epwRow { return r }), ",180,2,5,5", "", 1),
			[]string{`bad.epw:9: row has 31 fields, want 35`}},
		{"not a number", strings.Replace(epwDoc(base[:2]), "2019,3,1,2,60,?9?9?9?9E0?9?9?9,3,", "2019,3,1,2,60,?9?9?9?9E0?9?9?9,NaN,", 1),
			[]string{`bad.epw:10: field "Dry Bulb Temperature": "NaN" is not a number`}},
		{"latitude", strings.Replace(epwDoc(base), "47.07,15.44", "147.07,15.44", 1),
			[]string{`bad.epw:1: field "Latitude": value 147.07 outside -90..90 degrees`}},
		{"sub-hourly", strings.Replace(epwDoc(base), "DATA PERIODS,1,1,", "DATA PERIODS,1,4,", 1),
			[]string{`bad.epw:8: field "Number of Records per Hour": "4": only hourly files`}},
		{"no header", "2019,3,1,1\n", []string{`bad.epw:1: field "LOCATION": line 1 must be the LOCATION header`}},
		{"empty", "", []string{`bad.epw: file has 0 lines`}},
		{"headers only", epwHeader, []string{`bad.epw:8: no data rows`}},
		{"two problems listed together", mut(func(r []epwRow) []epwRow { r[0].ghi = 1600; r[1].wind = 41; return r }),
			[]string{`bad.epw:9: field "Global Horizontal Radiation": value 1600`, `bad.epw:10: field "Wind Speed": value 41 outside 0..40 m/s`}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := ReadEPW(strings.NewReader(c.text), "bad.epw")
			wantBadInput(t, s, err, c.want)
		})
	}
}

func TestReadEPWCalendar(t *testing.T) {
	cases := []struct {
		name      string
		rows      []epwRow
		wantN     int
		wantWarn  string
		firstEnd  time.Time
		wantYears int
	}{
		// 2024 is a leap year (Gregorian rule): a file of that one year keeps 29 February.
		{"leap year kept", epwDays(2024, 2, 28, 3), 72, "", time.Date(2024, 2, 28, 0, 0, 0, 0, time.UTC), 0},
		// Typical-year file: February from 2012 (leap), March from 2015; 29 February dropped.
		{"typical drops 29 February", append(epwDays(2012, 2, 28, 2), epwDays(2015, 3, 1, 1)...), 48,
			"29 February dropped", time.Date(TypicalYear, 2, 28, 0, 0, 0, 0, time.UTC), 0},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := ReadEPW(strings.NewReader(epwDoc(c.rows)), "cal.epw")
			if err != nil {
				t.Fatal(err)
			}
			if len(s.Records) != c.wantN {
				t.Errorf("records = %d, want %d", len(s.Records), c.wantN)
			}
			if c.wantWarn != "" && !hasWarning(s.Warnings, c.wantWarn) {
				t.Errorf("warnings %q lack %q", s.Warnings, c.wantWarn)
			}
			if !s.Records[0].End.Equal(c.firstEnd) {
				t.Errorf("first end %v, want %v (hour 1 at UTC+1 ends at 00:00 UTC)", s.Records[0].End, c.firstEnd)
			}
		})
	}
}

func TestReadEPWFills(t *testing.T) {
	rows := epwDays(2019, 6, 1, 1)
	rows[3].tempC, rows[4].tempC = 99.9, 99.9 // missing; neighbours 3 °C and 9 °C
	rows[5].tempC = 9
	rows[12].dni = 9999 // missing beam at local noon: split from GHI
	rows[20].wind = 999
	s, err := ReadEPW(strings.NewReader(epwDoc(rows)), "fill.epw")
	if err != nil {
		t.Fatal(err)
	}
	r := s.Records
	cos := sunCosAt(t, s, 12)
	for _, c := range []struct {
		name      string
		got, want float64
		tol       float64
		why       string
	}{
		{"temp 1/3", r[3].AirTempC, 5, 1e-9, "linear interpolation 3 → 9 °C over three steps"},
		{"temp 2/3", r[4].AirTempC, 7, 1e-9, "linear interpolation"},
		{"wind", r[20].WindMS, 2, 1e-9, "neighbours are 2 m/s"},
		{"closure", r[12].DNI*cos + r[12].DHI, r[12].GHI, 1e-3, "the Erbs split keeps DNI·cos Z + DHI = GHI; 1e-3 for sun.AtEach vs sun.At (1e-4°)"},
	} {
		if !scalar.EqualWithinAbs(c.got, c.want, c.tol) {
			t.Errorf("%s = %g, want %g ± %g (%s)", c.name, c.got, c.want, c.tol, c.why)
		}
	}
	for _, w := range []string{"2 missing air temperatures", "1 missing wind", "split from GHI"} {
		if !hasWarning(s.Warnings, w) {
			t.Errorf("warnings %q lack %q", s.Warnings, w)
		}
	}
}

func TestInputErrorCap(t *testing.T) {
	rows := epwDays(2019, 3, 1, 2)
	for i := range 30 {
		rows[i].ghi = 2000
	}
	_, err := ReadEPW(strings.NewReader(epwDoc(rows)), "many.epw")
	var ie *InputError
	if !errors.As(err, &ie) {
		t.Fatalf("err = %v, want *InputError", err)
	}
	// 30 problems: maxProblems (20) listed, the other 10 counted.
	if len(ie.Problems) != maxProblems || ie.More != 10 {
		t.Errorf("listed %d, more %d; want %d and 10", len(ie.Problems), ie.More, maxProblems)
	}
	if !strings.HasSuffix(err.Error(), "many.epw: and 10 more problems") {
		t.Errorf("error does not end with the count of the rest:\n%s", err)
	}
}

// wantBadInput asserts that a reader refused its input with an *InputError marked as bad
// input whose message holds every fragment of want (line, field, rule).
func wantBadInput(t *testing.T, s *Series, err error, want []string) {
	t.Helper()
	if err == nil {
		t.Fatalf("accepted: %d records", len(s.Records))
	}
	var ie *InputError
	if !errors.As(err, &ie) || !ie.BadInput() {
		t.Fatalf("error %v is not a bad-input error", err)
	}
	for _, w := range want {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("error\n%s\nlacks\n%s", err, w)
		}
	}
}
