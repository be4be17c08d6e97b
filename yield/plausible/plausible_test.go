package plausible

import (
	"strings"
	"testing"
	"time"
	_ "time/tzdata" // zones in tests must not depend on the machine

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/yield/finding"
)

// want is what a check must find: nothing (code ""), or one finding of this code and
// severity whose subject and message hold the fragments.
type want struct {
	code  string
	sev   finding.Severity
	frags []string
}

func (w want) check(t *testing.T, got finding.List) {
	t.Helper()
	if w.code == "" {
		if len(got) != 0 {
			t.Errorf("unexpected findings %v", got)
		}
		return
	}
	if len(got) != 1 {
		t.Fatalf("findings %v, want one %s", got, w.code)
	}
	f := got[0]
	if f.Code != w.code || f.Severity != w.sev {
		t.Errorf("finding %s %s, want %s %s", f.Severity, f.Code, w.sev, w.code)
	}
	for _, fr := range w.frags {
		if !strings.Contains(f.String(), fr) {
			t.Errorf("%q lacks %q", f.String(), fr)
		}
	}
}

func TestModule(t *testing.T) {
	tests := []struct {
		name               string
		powerW, lenM, widM float64
		effPct, tol        float64
		want               want
	}{
		// Hand calculations of P / (A · 1000 W/m²).
		{"the example's 410 W module", 410, 1.72, 1.134, 21.0196, 1e-3, want{}},
		{"410 W on 0.3 × 0.2 m", 410, 0.3, 0.2, 683.333, 1e-3, want{"module_efficiency", finding.Fail, []string{"site.yaml: module", "683.3 %", "33.7 %", "length_m"}}},
		{"600 W on a 410 W frame", 600, 1.72, 1.134, 30.7618, 1e-3, want{"module_efficiency", finding.Warning, []string{"30.8 %", "above the 25 %"}}},
		{"250 W on 2 × 1.3 m", 250, 2, 1.3, 9.6154, 1e-3, want{"module_efficiency", finding.Warning, []string{"9.6 %", "below the 10 %"}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			eff, got := Module("site.yaml: module", tc.powerW, tc.lenM, tc.widM)
			if !scalar.EqualWithinAbs(eff, tc.effPct, tc.tol) {
				t.Errorf("efficiency %.4f %%, want %.4f", eff, tc.effPct)
			}
			tc.want.check(t, got)
		})
	}
}

func TestDCAC(t *testing.T) {
	tests := []struct {
		name       string
		dcW, acW   float64
		ratio, tol float64
		want       want
	}{
		{"the example: 22 × 410 W on 6 kW", 22 * 410, 6000, 1.5033, 1e-4, want{"dc_ac_ratio", finding.Warning, []string{"ratio of 1.503, above 1.5"}}},
		{"balanced", 6000, 6000, 1, 0, want{}},
		{"9 kWp on 3 kW", 9000, 3000, 3, 0, want{"dc_ac_ratio", finding.Warning, []string{"inverter.ac_power_w", "9.0 kWp", "3 kW", "3.00", "larger inverter"}}},
		{"ac_power_w 1", 9000, 1, 9000, 0, want{"dc_ac_ratio", finding.Fail, []string{"9000.0", "watts, not kilowatts"}}},
		{"2 kWp on 6 kW", 2000, 6000, 0.3333, 1e-4, want{"dc_ac_ratio", finding.Warning, []string{"0.33", "smaller inverter"}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r, got := DCAC("site.yaml: inverter.ac_power_w", tc.dcW, tc.acW)
			if !scalar.EqualWithinAbs(r, tc.ratio, tc.tol) {
				t.Errorf("ratio %.4f, want %.4f", r, tc.ratio)
			}
			tc.want.check(t, got)
		})
	}
}

func TestResult(t *testing.T) {
	// The case of 9 kWp on a 3 kW inverter: 32 % clipped, performance ratio 0.49.
	got := Result("layout searched-1", 32, 0.49)
	if len(got) != 2 || got[0].Code != "clipping" || got[1].Code != "performance_ratio" || got.Worst() != finding.Warning {
		t.Fatalf("findings %v, want a clipping and a performance-ratio warning", got)
	}
	if len(Result("x", 1.2, 0.81)) != 0 {
		t.Error("a sound result flagged")
	}
}

func TestZone(t *testing.T) {
	tests := []struct {
		zone     string
		lat, lon float64
		want     want
	}{
		// Standard offsets (IANA tz database) against longitude/15°; coordinates of the
		// cities rounded (common knowledge).
		{"Europe/Vienna", 47.05, 15.43, want{}},      // UTC+1 at 15° E: 0 h apart
		{"Europe/Madrid", 40.4, -3.7, want{}},        // UTC+1 at 3.7° W: 1.2 h apart (common practice)
		{"Asia/Urumqi", 43.8, 87.6, want{}},          // UTC+6 at 87.6° E: 0.2 h apart
		{"Asia/Shanghai", 43.8, 87.6, want{}},        // UTC+8 used in western China: 2.2 h apart
		{"Pacific/Kiritimati", 1.87, -157.4, want{}}, // UTC+14 at 157.4° W: 0.49 h once wrapped to a day
		{"Africa/Johannesburg", -26.2, 18.4, want{}}, // UTC+2 at 18.4° E: 0.8 h apart
		{"America/New_York", 40.7, -74.0, want{}},    // UTC−5 at 74° W: 0.07 h apart
		{"Europe/Vienna", 47.05, -74.0, want{"timezone_far", finding.Warning, []string{"timezone", "Europe/Vienna", "-5.9 hours"}}},
		{"Europe/Vienna", 15.43, 47.05, want{"coordinates_swapped", finding.Warning, []string{"roof.geojson", "swapped", "longitude 15.4300"}}},
		{"America/New_York", -74.0, 40.7, want{"coordinates_swapped", finding.Warning, []string{"swapped"}}},
		// Where latitude and longitude are alike, the zone cannot tell.
		{"Asia/Tehran", 35.7, 51.4, want{}},
	}
	for _, tc := range tests {
		t.Run(tc.zone, func(t *testing.T) {
			z, err := time.LoadLocation(tc.zone)
			if err != nil {
				t.Fatal(err)
			}
			tc.want.check(t, Zone("roof.geojson", "site.yaml: timezone", z, tc.lat, tc.lon))
		})
	}
}

func TestPoorFaces(t *testing.T) {
	faces := []FaceIrradiation{
		{ID: "S", Subject: `roof.geojson: feature 0 (id "S")`, KWhM2: 1100, Modules: 12},
		{ID: "N", Subject: `roof.geojson: feature 1 (id "N")`, KWhM2: 605, Modules: 9},
		{ID: "E", Subject: `roof.geojson: feature 2 (id "E")`, KWhM2: 900, Modules: 4},
		{ID: "G", Subject: `roof.geojson: feature 3 (id "G")`, KWhM2: 300, Modules: 0},
	}
	// N: 605 / 1100 = 55 % of the best, 45 % less; E: 82 %, kept; G: no modules, nothing to say.
	want{"poor_face", finding.Warning, []string{`id "N"`, "605 kWh/m²", "45 % less", `face "S" (1100`, "its 9 modules earn", "keep_empty"}}.check(t, PoorFaces(faces))
	// One module on the poor face: the singular, never "module(s)".
	faces[1].Modules = 1
	want{"poor_face", finding.Warning, []string{"its 1 module earns about 45 % less"}}.check(t, PoorFaces(faces))
	if f := PoorFaces(faces); len(f) == 1 && strings.Contains(f[0].String(), "(s)") {
		t.Errorf("%q holds \"(s)\"", f[0].String())
	}
	if PoorFaces(nil) != nil {
		t.Error("findings without faces")
	}
}
