package cli

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/yield/report"
)

// TestSurveyReportFiles runs the example with every report option and checks the files
// against summary.json: the PDF's key figures, the charts, and the hourly CSV's totals.
func TestSurveyReportFiles(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "out")
	if _, errs, code := run(t, "survey", exampleSite, "-o", dir, "--hourly", "--svg", "--paper", "letter"); code != 0 {
		t.Fatalf("survey exit %d: %s", code, errs)
	}
	var s report.Summary
	js, err := os.ReadFile(filepath.Join(dir, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(js, &s); err != nil {
		t.Fatal(err)
	}
	charts := []string{"plan", "strings", "sunpath", "monthly", "losses", "layouts"}
	for _, c := range charts {
		for _, ext := range []string{".png", ".svg"} {
			st, err := os.Stat(filepath.Join(dir, c+ext))
			// A drawn chart is several kilobytes even as SVG (the smallest, layouts, is
			// about 4.7 kB); below 3 kB it has lost its data.
			if err != nil || st.Size() < 3000 {
				t.Errorf("%s%s: missing or nearly empty (%v)", c, ext, err)
			}
		}
	}
	for _, doc := range []string{"proposal.pdf", "technical-sheet.pdf"} {
		pdf, err := os.ReadFile(filepath.Join(dir, doc))
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(string(pdf), "/MediaBox [0 0 612.00 792.00]") {
			t.Errorf("%s is not Letter (612 × 792 pt, ANSI 8.5 × 11 in)", doc)
		}
		if _, err := exec.LookPath("pdftotext"); err != nil {
			t.Log("pdftotext not installed: the PDF's text is not checked")
			continue
		}
		out, err := exec.Command("pdftotext", filepath.Join(dir, doc), "-").Output()
		if err != nil {
			t.Fatal(err)
		}
		txt := strings.Join(strings.Fields(string(out)), " ")
		want := map[string]string{
			"annual AC energy": report.Thousands(s.AnnualACkWh, 0),
			"specific yield":   report.Thousands(s.SpecificYield, 0),
			// The example's most shaded module, G.1.1 on the garage, lies below the house's
			// south face S, which takes its afternoon sun from spring to autumn (sunpath.png):
			// the sun-path caption names that roof face among what shades it.
			"sun-path caption's roof face": "Roof: S (up to",
		}
		if s.Shade != nil {
			// The one shade figure, with the same words as summary.json's split.
			want["shade lost"] = report.Pct(s.Shade.LostPct)
			for _, p := range s.Shade.Parts {
				want["shade part: "+p.Cause] = p.Cause
			}
		}
		for name, w := range want {
			if !strings.Contains(txt, w) {
				t.Errorf("%s: %s %q (summary.json) not in the text", doc, name, w)
			}
		}
	}

	tests := []struct {
		name string
		col  string
		want float64
		tol  float64 // relative
		why  string
	}{
		// ac_w comes after the flat DC losses but before availability,
		// which the loss breakdown applies to the year; night consumption (a few kWh) is
		// left in the tolerance.
		{"AC energy", "ac_w", 1000 * (s.AnnualACkWh + lossKWh(s, "availability")), 0.003,
			"hourly AC power integrates to the annual AC energy before availability"},
		// GHI integrates to the climate's annual total, which summary.json reports from the
		// same records (rounded to 0.1 kWh/m²).
		{"GHI", "ghi_w_m2", s.Climate.AnnualGHIkWhM2 * 1000, 0.001, "hourly GHI integrates to the annual GHI"},
		// poa_w_m2 is the mean over the modules of the shaded plane-of-array irradiance, the
		// same quantity as module_results[].annual_poa_kwh_m2 (rounded to 0.1 kWh/m² each).
		{"POA", "poa_w_m2", 1000 * meanPOA(s), 0.001, "hourly POA integrates to the modules' mean annual POA"},
	}
	f, err := os.Open(filepath.Join(dir, "hourly.csv"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	// One row per weather record: a year of hours (8,760, or 8,784 in a leap year).
	if n := len(recs) - 1; n != 8760 && n != 8784 {
		t.Errorf("%d data rows, want one per hour of the year", n)
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			col := -1
			for i, h := range recs[0] {
				if h == tc.col {
					col = i
				}
			}
			if col < 0 {
				t.Fatalf("no column %q in %v", tc.col, recs[0])
			}
			sum := 0.0
			for _, r := range recs[1:] {
				v, err := strconv.ParseFloat(r[col], 64)
				if err != nil {
					t.Fatalf("%s: %q: %v", tc.col, r[col], err)
				}
				sum += v // one-hour records: W·h
			}
			if !scalar.EqualWithinRel(sum, tc.want, tc.tol) {
				t.Errorf("Σ %s = %.0f, want %.0f ± %.1f %%: %s", tc.col, sum, tc.want, 100*tc.tol, tc.why)
			}
		})
	}
}

// meanPOA is the mean annual plane-of-array irradiation of the modules, kWh/m².
func meanPOA(s report.Summary) float64 {
	sum := 0.0
	for _, m := range s.ModuleResults {
		sum += m.AnnualPOAkWhM2
	}
	return sum / float64(max(len(s.ModuleResults), 1))
}

// lossKWh sums the named steps of the loss breakdown.
func lossKWh(s report.Summary, steps ...string) float64 {
	sum := 0.0
	for _, l := range s.Losses {
		for _, st := range steps {
			if l.Step == st {
				sum += l.KWh
			}
		}
	}
	return sum
}
