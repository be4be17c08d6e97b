package weather

import (
	"errors"
	"strings"
	"testing"
	"time"
)

// hourly returns a series of n hourly records whose first interval starts at start.
func hourly(start time.Time, n int, offsetH float64) *Series {
	s := &Series{Interval: time.Hour, TZOffsetHours: offsetH, Records: make([]Record, n)}
	for i := range s.Records {
		s.Records[i].End = start.Add(time.Duration(i+1) * time.Hour).UTC()
	}
	return s
}

func TestCheckYear(t *testing.T) {
	cet := time.FixedZone("", 3600)
	jan2025 := time.Date(2025, 1, 1, 0, 0, 0, 0, cet)
	jan2024 := time.Date(2024, 1, 1, 0, 0, 0, 0, cet)
	tests := []struct {
		name string
		s    *Series
		want []string // fragments of the message; none for a whole year
	}{
		// Calendar facts: 365 × 24 = 8760 hours, 366 × 24 = 8784.
		{"common year", hourly(jan2025, 8760, 1), nil},
		{"leap year", hourly(jan2024, 8784, 1), nil},
		{"a year from March across a 29 February", hourly(time.Date(2023, 3, 1, 0, 0, 0, 0, cet), 8784, 1), nil},
		{"a year from July of a common year", hourly(time.Date(2025, 7, 1, 0, 0, 0, 0, cet), 8760, 1), nil},
		{"ten hours too many", hourly(jan2025, 8770, 1),
			[]string{"w.csv: ", "8770 hourly records", "8760", "8784 for a leap year", "remove the 10 hours"}},
		{"8784 in a common year", hourly(jan2025, 8784, 1),
			[]string{"8784 hourly records", "1 January 2025 has 8760 hours", "leap year stamped"}},
		{"a leap year short of 29 February", hourly(jan2024, 8760, 1),
			[]string{"8760 hourly records", "has 8784 hours", "24 hours are missing"}},
		{"a week", hourly(jan2025, 168, 1), []string{"168 hourly records", "8592 hours are missing"}},
		{"empty", &Series{Interval: time.Hour}, []string{"no weather records"}},
		{"half-hourly", &Series{Interval: 30 * time.Minute, Records: make([]Record, 17520)}, []string{"every 30m0s", "hourly"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			err := tc.s.CheckYear("w.csv")
			if len(tc.want) == 0 {
				if err != nil {
					t.Fatalf("unexpected error %v", err)
				}
				return
			}
			var ie *InputError
			if !errors.As(err, &ie) || !ie.BadInput() {
				t.Fatalf("error %v, want an *InputError", err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("message %q lacks %q", err, w)
				}
			}
		})
	}
}

func TestReadCSVWarnsAboutPartialYear(t *testing.T) {
	// 8784 rows from 1 January 2025: one day more than that year has.
	s, err := ReadCSV(strings.NewReader(csvDoc("2025-01-01T01:00:00+01:00", 8784, csvPlain)), "w.csv")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(strings.Join(s.Warnings, "\n"), "not one whole year") {
		t.Errorf("warnings %q lack the partial-year note", s.Warnings)
	}
}
