package weather

import (
	"os"
	"strings"
	"testing"
	"time"

	"sunstring/shading/sun"

	"gonum.org/v1/gonum/floats/scalar"
)

// sunCosAt returns cos Z at the sunlit midpoint of record i, by the package's own rule.
func sunCosAt(t *testing.T, s *Series, i int) float64 {
	t.Helper()
	ends := []time.Time{s.Records[i].End}
	return sunOver(ends, s.Interval, sun.Observer{LatDeg: s.LatDeg, LonDeg: s.LonDeg, ElevationM: s.ElevationM})[0].cosZ
}

func TestReadCSVSamples(t *testing.T) {
	cases := []struct {
		file     string
		n        int
		lat      float64
		tz       float64
		i        int     // a record to check
		ghi      float64 // as written in the file
		split    bool    // DNI/DHI computed
		firstEnd time.Time
	}{
		{"sample.csv", 24, 47.07, 2, 12, 800, false, time.Date(2025, 5, 31, 23, 0, 0, 0, time.UTC)},
		{"ghi_only.csv", 24, -33.9, 2, 12, 900, true, time.Date(2025, 1, 14, 23, 0, 0, 0, time.UTC)},
	}
	for _, c := range cases {
		t.Run(c.file, func(t *testing.T) {
			f, err := os.Open("testdata/" + c.file)
			if err != nil {
				t.Fatal(err)
			}
			defer f.Close()
			s, err := ReadCSV(f, c.file)
			if err != nil {
				t.Fatal(err)
			}
			if len(s.Records) != c.n || !s.Records[0].End.Equal(c.firstEnd) {
				t.Fatalf("%d records from %v, want %d from %v", len(s.Records), s.Records[0].End, c.n, c.firstEnd)
			}
			if !s.HasLocation || !scalar.EqualWithinAbs(s.LatDeg, c.lat, 1e-12) || !scalar.EqualWithinAbs(s.TZOffsetHours, c.tz, 1e-12) {
				t.Errorf("location %v %g, zone %g; want %g, zone %g (from the comment lines and stamps)", s.HasLocation, s.LatDeg, s.TZOffsetHours, c.lat, c.tz)
			}
			r := s.Records[c.i]
			if !scalar.EqualWithinAbs(r.GHI, c.ghi, 1e-12) {
				t.Errorf("GHI = %g, want %g as written", r.GHI, c.ghi)
			}
			if c.split {
				cos := sunCosAt(t, s, c.i)
				// 1e-3 W/m²: sun.AtEach agrees with sun.At to 1e-4° (its doc), which moves cos Z by ~2e-6.
				if !scalar.EqualWithinAbs(r.DNI*cos+r.DHI, r.GHI, 1e-3) || r.DNI <= 0 || r.DHI <= 0 {
					t.Errorf("split DNI %g, DHI %g (cos Z %g) does not close on GHI %g", r.DNI, r.DHI, cos, r.GHI)
				}
			}
		})
	}
}

func TestReadCSVBad(t *testing.T) {
	start := "2025-03-01T01:00:00+01:00"
	with := func(i int, row string) string {
		return csvDoc(start, 6, func(j int, st string) string {
			if j == i {
				return strings.ReplaceAll(row, "$T", st)
			}
			return csvPlain(j, st)
		})
	}
	cases := []struct {
		name string
		text string
		want []string
	}{
		{"ghi too high", with(2, "$T,2500,200,50,10,2"), []string{`bad.csv:7: field "ghi_w_m2": value 2500 outside 0..1500 W/m²`}},
		{"bad time", with(0, "2025-03-01 01:00,100,200,50,10,2"), []string{`bad.csv:5: field "time": "2025-03-01 01:00" is not an RFC 3339 time`}},
		{"no offset", with(0, "2025-03-01T01:00:00,100,200,50,10,2"), []string{`bad.csv:5: field "time"`}},
		{"cold", with(1, "$T,0,0,0,-80,2"), []string{`bad.csv:6: field "air_temp_c": value -80 outside -70..70 °C`}},
		{"wind", with(1, "$T,0,0,0,5,-1"), []string{`bad.csv:6: field "wind_m_s": value -1 outside 0..40 m/s`}},
		{"short row", with(3, "$T,100,200"), []string{`bad.csv:8: row has 3 fields, the header 6`}},
		{"duplicate", with(3, "2025-03-01T03:00:00+01:00,100,200,50,10,2"), []string{`bad.csv:8: field "time": duplicate of line 7`}},
		{"unordered", with(3, "2025-03-01T01:00:00+01:00,100,200,50,10,2"), []string{`bad.csv:8: field "time": 2025-03-01T00:00:00Z is before line 7`}},
		{"gap", with(3, "2025-03-01T07:00:00+01:00,100,200,50,10,2"), []string{`bad.csv:8: field "time": gap: 3 hours missing after line 7`}},
		{"off grid", with(3, "2025-03-01T04:30:00+01:00,100,200,50,10,2"), []string{`bad.csv:8: field "time": 2025-03-01T03:30:00Z is 1h30m0s after line 7`}},
		{"missing column", "time,ghi_w_m2\n2025-03-01T01:00:00Z,0\n", []string{`bad.csv:1: field "air_temp_c": required column missing`}},
		{"one of dni and dhi", "# latitude_deg: 1\n# longitude_deg: 2\ntime,ghi_w_m2,dni_w_m2,air_temp_c\n", []string{`bad.csv:3: field "dni_w_m2": dni_w_m2 and dhi_w_m2 come together`}},
		{"no split without location", "time,ghi_w_m2,air_temp_c\n2025-03-01T01:00:00Z,0,1\n", []string{`bad.csv:1: field "dni_w_m2": no dni_w_m2 and dhi_w_m2 columns and no location`}},
		{"bad latitude comment", "# latitude_deg: 95\n# longitude_deg: 2\ntime,ghi_w_m2,air_temp_c\n2025-03-01T01:00:00Z,0,1\n", []string{`bad.csv:1: field "latitude_deg": value 95 outside -90..90 degrees`}},
		{"comments only", "# nothing\n", []string{`bad.csv:1: no header row`}},
		{"header only", "time,ghi_w_m2,dni_w_m2,dhi_w_m2,air_temp_c\n", []string{`bad.csv:1: no data rows`}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			s, err := ReadCSV(strings.NewReader(c.text), "bad.csv")
			wantBadInput(t, s, err, c.want)
		})
	}
}

func TestReadCSVDaylightSaving(t *testing.T) {
	// Central European clocks go forward on 2025-03-30 at 02:00 +01:00 (EU rule: last Sunday of
	// March, 01:00 UTC): 02:00+01:00 is followed by 04:00+02:00, one hour later.
	text := "# latitude_deg: 47\n# longitude_deg: 15\ntime,ghi_w_m2,dni_w_m2,dhi_w_m2,air_temp_c\n" +
		"2025-03-30T01:00:00+01:00,0,0,0,2\n2025-03-30T02:00:00+01:00,0,0,0,2\n2025-03-30T04:00:00+02:00,0,0,0,2\n"
	s, err := ReadCSV(strings.NewReader(text), "dst.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Records) != 3 || !scalar.EqualWithinAbs(s.TZOffsetHours, 1, 1e-12) {
		t.Errorf("records %d, zone %g; want 3 and the standard offset +1", len(s.Records), s.TZOffsetHours)
	}
	if !scalar.EqualWithinAbs(s.Records[0].WindMS, DefaultWindMS, 0) {
		t.Errorf("wind %g, want the default %g m/s when the column is absent", s.Records[0].WindMS, DefaultWindMS)
	}
}

func TestReadCSVAtSplitsAtSite(t *testing.T) {
	text := "time,ghi_w_m2,air_temp_c\n2025-06-21T13:00:00+02:00,700,25\n"
	site := Site{LatDeg: 47, LonDeg: 15}
	s, err := ReadCSVAt(strings.NewReader(text), "at.csv", site)
	if err != nil {
		t.Fatal(err)
	}
	r := s.Records[0]
	cos := sunOver([]time.Time{r.End}, time.Hour, sun.Observer{LatDeg: 47, LonDeg: 15})[0].cosZ
	// 1e-3 W/m²: sun.AtEach agrees with sun.At to 1e-4°.
	if !scalar.EqualWithinAbs(r.DNI*cos+r.DHI, 700, 1e-3) || s.HasLocation {
		t.Errorf("DNI %g, DHI %g, cos %g, has location %v: want closure on 700 W/m² and no file location", r.DNI, r.DHI, cos, s.HasLocation)
	}
}
