package survey_test

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"sunstring/yield/finding"
	"sunstring/yield/survey"
)

// gableMap returns an invented gable house at 47.05° N, 15.43° E: faces "S" and "N" of
// 10 × 4 m in plan, pitch 35°, eaves at 6 m, and a 0.6 m chimney on the south face whose
// height_m is chimneyM. swap writes every coordinate latitude first, as a common mistake.
func gableMap(chimneyM float64, swap bool) string { return gableMapAt(47.05, 15.43, chimneyM, swap) }

// gableMapAt is gableMap's house at latitude lat0 and longitude lon0.
func gableMapAt(lat0, lon0, chimneyM float64, swap bool) string {
	mLat := 1 / 111195.0                      // degrees a metre northward (mean sphere, good to 0.5 %)
	mLon := mLat / math.Cos(lat0*math.Pi/180) // degrees a metre eastward
	ring := func(pts ...[2]float64) string {
		var b strings.Builder
		b.WriteString("[[")
		for i, p := range append(pts, pts[0]) {
			if i > 0 {
				b.WriteByte(',')
			}
			lon, lat := lon0+p[0]*mLon, lat0+p[1]*mLat
			if swap {
				lon, lat = lat, lon
			}
			fmt.Fprintf(&b, "[%.8f,%.8f]", lon, lat)
		}
		b.WriteString("]]")
		return b.String()
	}
	feat := func(geom, props string) string {
		return `{"type":"Feature","geometry":{"type":"Polygon","coordinates":` + geom + `},"properties":` + props + `}`
	}
	return `{"type":"FeatureCollection","features":[` +
		feat(ring([2]float64{0, 0}, [2]float64{10, 0}, [2]float64{10, 4}, [2]float64{0, 4}),
			`{"kind":"roof","id":"S","pitch_deg":35,"aspect_deg":180,"eave_height_m":6}`) + "," +
		feat(ring([2]float64{0, 4}, [2]float64{10, 4}, [2]float64{10, 8}, [2]float64{0, 8}),
			`{"kind":"roof","id":"N","pitch_deg":35,"aspect_deg":0,"eave_height_m":6}`) + "," +
		feat(ring([2]float64{6, 2.5}, [2]float64{6.6, 2.5}, [2]float64{6.6, 3.1}, [2]float64{6, 3.1}),
			fmt.Sprintf(`{"kind":"block","id":"C1","height_m":%g}`, chimneyM)) + `]}`
}

func preflight(t *testing.T, cfg *survey.Config, roof string) (*survey.Project, *survey.Preflight) {
	t.Helper()
	read := func(path, what string) ([]byte, error) {
		if path == cfg.Path(cfg.Map) {
			return []byte(roof), nil
		}
		return nil, notFound{errors.New(path + ": no such " + what)}
	}
	p, err := survey.Load(cfg, read)
	if err != nil {
		t.Fatalf("Load: %v", err)
	}
	pf, err := p.Preflight()
	if err != nil {
		t.Fatalf("Preflight: %v", err)
	}
	return p, pf
}

func codes(l finding.List) map[string]finding.Finding {
	out := map[string]finding.Finding{}
	for _, f := range l {
		out[f.Code] = f
	}
	return out
}

func TestPreflightFindings(t *testing.T) {
	monthly := func(cfg *survey.Config) {
		cfg.Climate.MonthlyGHI = []float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29}
		cfg.Climate.MonthlyT = []float64{-1, 1, 5, 10, 15, 18, 20, 19.6, 15, 10, 4, 0}
	}
	tests := []struct {
		name    string
		chimney float64
		swap    bool
		edit    func(*survey.Config)
		want    map[string][]string // code → fragments
		absent  []string
	}{
		{"chimney above the roof, north face wired in", 1.2, false, monthly, map[string][]string{
			// The roof under the chimney, which stands 2.5 to 3.1 m up the slope from the eave:
			// 6 + 2.5·tan 35° = 7.75 m to 6 + 3.1·tan 35° = 8.17 m; 8.17 + 1.2 = 9.37 m.
			"block_below_roof": {"roof.geojson", `id "C1"`, "height_m", `roof face "S"`, "7.75 to 8.17 m", "height_m: 9.37"},
			// At 47° N the north face at 35° gets about 60 % of the south face (common practice).
			"poor_face": {`id "N"`, `less than face "S"`, "keep_empty"},
		}, []string{"coordinates_swapped"}},
		{"chimney above the ground", 8.5, false, monthly, nil, []string{"block_below_roof", "coordinates_swapped"}},
		{"latitude and longitude swapped", 8.5, true, monthly, map[string][]string{
			"coordinates_swapped": {"roof.geojson", "swapped", "longitude first"},
		}, nil},
		// An invented site at 47.05° N, 46.05° E (Europe/Volgograd, UTC+3, fits 46.05° E within
		// 0.1 h) written latitude first: read as 46.05° N, 47.05° E the zone fits as well (3.1 h),
		// but both faces run across their aspects only when read the other way round.
		{"swapped, latitude and longitude 1° apart", 8.5, true, func(cfg *survey.Config) {
			monthly(cfg)
			cfg.Timezone = "Europe/Volgograd"
		}, map[string][]string{
			"coordinates_swapped": {"roof.geojson", `roof faces "S", "N" agree with their aspect_deg`, "however close latitude (46.050", "longitude first"},
		}, nil},
		{"drawn right, latitude and longitude 1° apart", 8.5, false, func(cfg *survey.Config) {
			monthly(cfg)
			cfg.Timezone = "Europe/Volgograd"
		}, nil, []string{"coordinates_swapped", "timezone_far"}},
		{"9 kWp on 3 kW", 8.5, false, func(cfg *survey.Config) { monthly(cfg); cfg.Inverter.ACPowerW = 3000 }, map[string][]string{
			"dc_ac_ratio": {"site.yaml: inverter.ac_power_w", "DC/AC ratio"},
		}, nil},
		// One input of one string: at most 14 modules in series (600 V over 37.4 V·(1 + 0.27 %/K
		// × 35 K) = 40.9 V a module at −10 °C), 5.74 kWp on 4.5 kW = 1.28; the placed modules
		// alone (more than 17) would read above 1.5.
		{"modules beyond the inverter's strings", 8.5, false, func(cfg *survey.Config) {
			monthly(cfg)
			cfg.Inverter.Inputs, cfg.Inverter.ACPowerW = 1, 4500
		}, nil, []string{"dc_ac_ratio"}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			cfg := validConfig(t)
			tc.edit(cfg)
			if errs := cfg.Validate(); len(errs) > 0 {
				t.Fatal(errs)
			}
			roof := gableMap(tc.chimney, tc.swap)
			if cfg.Timezone == "Europe/Volgograd" {
				roof = gableMapAt(47.05, 46.05, tc.chimney, tc.swap)
			}
			_, pf := preflight(t, cfg, roof)
			got := codes(pf.Findings)
			// One message per problem: the zone and the faces never both report a swap.
			n := 0
			for _, f := range pf.Findings {
				if f.Code == "coordinates_swapped" {
					n++
				}
			}
			if n > 1 {
				t.Errorf("%d coordinates_swapped findings, want at most one: %v", n, pf.Findings)
			}
			for code, frags := range tc.want {
				f, ok := got[code]
				if !ok {
					t.Errorf("no %s among %v", code, pf.Findings)
					continue
				}
				if f.Severity != finding.Warning {
					t.Errorf("%s is %s, want warning", code, f.Severity)
				}
				for _, fr := range frags {
					if !strings.Contains(f.String(), fr) {
						t.Errorf("%q lacks %q", f.String(), fr)
					}
				}
			}
			for _, code := range tc.absent {
				if f, ok := got[code]; ok {
					t.Errorf("unexpected %v", f)
				}
			}
		})
	}
}

func TestPreflightFaceIrradiation(t *testing.T) {
	cfg := validConfig(t)
	cfg.Climate.MonthlyGHI = []float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29}
	cfg.Climate.MonthlyT = []float64{-1, 1, 5, 10, 15, 18, 20, 19.6, 15, 10, 4, 0}
	p, pf := preflight(t, cfg, gableMap(8.5, false))
	if len(pf.FaceKWhM2) != len(p.Site.Faces) || len(p.Site.Faces) != 2 {
		t.Fatalf("face irradiation %v for %d faces", pf.FaceKWhM2, len(p.Site.Faces))
	}
	s, n := pf.FaceKWhM2[0], pf.FaceKWhM2[1]
	// A south face at 35° and 47° N receives 10–20 % more than the horizontal's 1225
	// kWh/m², a north face 45–70 % of the south face (common practice).
	if s < 1.1*1225 || s > 1.2*1225 || n/s < 0.45 || n/s > 0.7 {
		t.Errorf("south %.0f, north %.0f kWh/m²", s, n)
	}
	b, _ := json.Marshal(pf.Findings)
	if !strings.Contains(string(b), `"severity":"warning"`) {
		t.Errorf("findings JSON %s lacks a severity word", b)
	}
}
