package report

import (
	"slices"
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

func TestSunClassAndStart(t *testing.T) {
	classes := []struct {
		name  string
		share float64 // % of the roof's best module without shade
		want  int
	}{
		{"the best spot", 100, 0},
		{"on a bound stays in the upper class", 95, 0},
		{"just under the first bound", 94.99, 1},
		{"a north face", 60, 4},
	}
	for _, tc := range classes {
		t.Run(tc.name, func(t *testing.T) {
			if got := SunClass(tc.share); got != tc.want {
				t.Errorf("SunClass(%v) = %d, want %d", tc.share, got, tc.want)
			}
		})
	}
	// The breakdown starts from AC + all losses: 2,345.6 + 150 + 60 + 20 + 30 + 90 + 0.4 =
	// 2,696 kWh.
	if got := StartKWh(2345.6, fixture("file").Summary.Losses); !scalar.EqualWithinAbs(got, 2696, 1e-9) {
		t.Errorf("StartKWh = %v, want 2696 (sum of the fixture's rows)", got)
	}
}

func TestCount(t *testing.T) {
	tests := []struct {
		name string
		n    int
		want string
	}{
		{"none", 0, "0 modules"},
		{"one", 1, "1 module"},
		{"two", 2, "2 modules"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := Count(tc.n, "module", "modules"); got != tc.want {
				t.Errorf("Count(%d) = %q, want %q", tc.n, got, tc.want)
			}
		})
	}
}

// TestModulesText: the count says connected and placed when they differ, as the documents
// and the survey's terminal line give it.
func TestModulesText(t *testing.T) {
	tests := []struct {
		name              string
		connected, placed int
		want              string
	}{
		{"all connected", 22, 22, "22 modules"},
		{"one module", 1, 1, "1 module"},
		{"some left out", 26, 45, "26 connected of 45 placed"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := &Summary{Modules: tc.connected, Faces: []Face{{ID: "S", Modules: tc.placed}}}
			if got := ModulesText(s); got != tc.want {
				t.Errorf("ModulesText = %q, want %q", got, tc.want)
			}
		})
	}
}

// TestSunLegendShowsEveryClass: the plan's legend lists all five classes whichever are used,
// so the scale reads the same on every roof; the empty ones say so.
func TestSunLegendShowsEveryClass(t *testing.T) {
	// ref 1,000 kWh/m²: the bounds are 950, 900, 800 and 700 kWh/m² (SunBins × ref).
	tests := []struct {
		name string
		used []bool
		ref  float64
		want []string
	}{
		{"only the two best classes used", []bool{true, true, false, false, false}, 1000, []string{
			"950 or more", "900 to 950", "800 to 900 (no module)",
			"700 to 800 (no module)", "below 700 (no module)"}},
		{"a gap in the middle", []bool{true, false, true, false, true}, 1000, []string{
			"950 or more", "900 to 950 (no module)", "800 to 900",
			"700 to 800 (no module)", "below 700"}},
		{"no module: no scale", make([]bool, 5), 0, nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := sunLegend(tc.used, tc.ref)
			if !slices.Equal(got, tc.want) {
				t.Errorf("sunLegend = %q, want %q", got, tc.want)
			}
		})
	}
}
