package report

import (
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

func TestThousands(t *testing.T) {
	tests := []struct {
		name string
		x    float64
		d    int
		want string
	}{
		{"small", 962.3, 0, "962"},
		{"thousands", 5523.3, 0, "5,523"},
		{"millions with decimals", 1234567.891, 2, "1,234,567.89"},
		{"negative", -12345, 0, "-12,345"},
		{"negative rounding to zero", -0.2, 0, "0"},
		{"exactly a thousand", 999.6, 0, "1,000"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := Thousands(tc.x, tc.d); got != tc.want {
				t.Errorf("Thousands(%v, %d) = %q, want %q", tc.x, tc.d, got, tc.want)
			}
		})
	}
}

func TestShadeClassAndStart(t *testing.T) {
	classes := []struct {
		name string
		pct  float64
		want int
	}{
		{"unshaded", 0, 0},
		{"just under the first bound", 1.99, 0},
		{"on a bound goes up", 5, 2},
		{"heavy", 35, 4},
	}
	for _, tc := range classes {
		t.Run(tc.name, func(t *testing.T) {
			if got := ShadeClass(tc.pct); got != tc.want {
				t.Errorf("ShadeClass(%v) = %d, want %d", tc.pct, got, tc.want)
			}
		})
	}
	// The waterfall starts from AC + all losses: 2,345.6 + 150 + 60 + 90 = 2,645.6 kWh.
	if got := StartKWh(2345.6, fixture("file").Summary.Losses); !scalar.EqualWithinAbs(got, 2645.6, 1e-9) {
		t.Errorf("StartKWh = %v, want 2645.6 (sum of the fixture's rows)", got)
	}
}
