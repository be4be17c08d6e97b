package cli

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/yield/weather"
)

// TestSurveyWithWeatherFile runs the example with a CSV weather year (written from a
// synthetic year, so the totals are known) given by --weather: the survey uses the file,
// reports the source "file" and the file's annual GHI.
func TestSurveyWithWeatherFile(t *testing.T) {
	zone, _ := time.LoadLocation("Europe/Vienna")
	// Invented monthly values (kWh/m², °C), not the example's, so that the file is seen to win.
	ghi := [12]float64{30, 50, 90, 125, 150, 160, 165, 140, 100, 65, 35, 25}
	temp := [12]float64{0, 2, 6, 11, 16, 19, 21, 20, 16, 11, 5, 1}
	ws, err := weather.FromMonthly(weather.Site{LatDeg: 47.05, LonDeg: 15.43, Zone: zone}, ghi, temp)
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	b.WriteString("# latitude_deg: 47.05\n# longitude_deg: 15.43\ntime,ghi_w_m2,dni_w_m2,dhi_w_m2,air_temp_c,wind_m_s\n")
	total := 0.0
	for _, r := range ws.Records {
		fmt.Fprintf(&b, "%s,%.3f,%.3f,%.3f,%.2f,%.2f\n", r.End.Format(time.RFC3339), r.GHI, r.DNI, r.DHI, r.AirTempC, r.WindMS)
		total += r.GHI / 1000
	}
	dir := t.TempDir()
	wf := filepath.Join(dir, "year.csv")
	if err := os.WriteFile(wf, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	if _, errs, code := run(t, "survey", exampleSite, "-o", out, "--weather", wf); code != 0 {
		t.Fatalf("exit %d: %s", code, errs)
	}
	raw, err := os.ReadFile(filepath.Join(out, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	var s struct {
		Climate struct {
			Source string  `json:"source"`
			GHI    float64 `json:"annual_ghi_kwh_m2"`
		} `json:"climate"`
	}
	if err := json.Unmarshal(raw, &s); err != nil {
		t.Fatal(err)
	}
	// The file's own total, written with three decimals a record (rounding below 0.01 kWh/m²).
	if s.Climate.Source != "file" || !scalar.EqualWithinAbs(s.Climate.GHI, total, 0.1) {
		t.Errorf("climate %+v, want source file and %.1f kWh/m² (the CSV's total)", s.Climate, total)
	}
}
