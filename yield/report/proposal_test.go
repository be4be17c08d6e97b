package report

import (
	"bytes"
	"errors"
	"flag"
	"fmt"
	"image"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/shading"
	"sunstring/shading/sun"
)

var update = flag.Bool("update", false, "rewrite the golden chart images in testdata/")

// fixture is an invented two-face roof: a south face with a chimney and a garage face, a
// tree south-west; the numbers are made up but consistent (AC + losses = start).
func fixture(source string) *Proposal {
	s := &Summary{
		Site:    SiteInfo{Name: "Test house", Latitude: 47.05, Longitude: 15.43, Timezone: "Europe/Vienna"},
		Modules: 6, DCkWp: 2.4,
		Climate:       ClimateInfo{Source: source, AnnualGHIkWhM2: 1225},
		AnnualACkWh:   2345.6,
		SpecificYield: 977.3, PerformanceRatio: 0.78,
		MonthlyACkWh:    [12]float64{60, 100, 180, 250, 300, 310, 320, 280, 210, 150, 80, 105.6},
		MonthlyUnshaded: [12]float64{70, 110, 190, 260, 310, 320, 330, 290, 220, 160, 90, 110},
		Losses: []Loss{{"shade on the modules (irradiance)", 150, 5}, {"soiling", 60, 2}, {"inverter conversion", 90, 3.5},
			{"inverter clipping (AC limit)", 0, 0}},
		Layouts: []Layout{
			{Name: "searched 1", AnnualACkWh: 2345.6, ShadeLossPct: 4.1, Strings: [][]string{{"S.1.1", "S.1.2", "S.1.3"}, {"S.2.1", "S.2.2", "S.2.3"}}, Inputs: []int{1, 2}},
			{Name: "roof order", AnnualACkWh: 2301, ShadeLossPct: 5.9, BehindBestKWh: 44.6, Strings: [][]string{{"S.1.1", "S.1.2", "S.1.3", "S.2.1", "S.2.2", "S.2.3"}}, Inputs: []int{1}},
		},
		Faces:    []Face{{ID: "S", PitchDeg: 35, AspectDeg: 180, PlanAreaM2: 40, SlopedAreaM2: 48.8, Modules: 6, KWp: 2.4}},
		Warnings: []string{"test warning"},
		Checks: []Check{{Severity: "info", Subject: "searched 1, input 1", Unit: "V", Value: 124.6, Limit: 600,
			Message: "3 modules in series: 124.6 V open circuit at -16 °C (inverter maximum 600 V)"}},
		Alternatives: []Alternative{{Name: "module-level converters", AnnualACkWh: 2400, DifferenceKWh: 54.4, Note: "a converter on every module"}},
		Cautions:     Cautions,
		Models:       []string{"sun: Reda & Andreas (2004)"},
	}
	pl := &Plan{
		Faces:  []Shape{{ID: "S", Ring: [][2]float64{{0, 0}, {8, 0}, {8, 5}, {0, 5}, {0, 0}}}},
		Blocks: []Shape{{ID: "chimney", Ring: [][2]float64{{6.5, 3.5}, {7.2, 3.5}, {7.2, 4.2}, {6.5, 4.2}, {6.5, 3.5}}}},
		Trees:  []TreeMark{{ID: "oak", X: -3, Y: -4, CrownRadiusM: 2.5}},
	}
	for r := 0; r < 2; r++ {
		for c := 0; c < 3; c++ {
			x, y := 0.5+float64(c)*1.15, 0.5+float64(r)*1.75
			pl.Modules = append(pl.Modules, PlanModule{ID: fmt.Sprintf("S.%d.%d", r+1, c+1),
				Corners:      [4][2]float64{{x, y}, {x + 1.13, y}, {x + 1.13, y + 1.72}, {x, y + 1.72}},
				ShadeLossPct: float64(1 + 5*r + 3*c)})
		}
	}
	pl.Strings, pl.Inputs = [][]int{{0, 1, 2}, {5, 4, 3}}, []int{1, 2}
	for _, m := range pl.Modules {
		s.ModuleResults = append(s.ModuleResults, ModuleResult{ID: m.ID, Face: "S", AnnualPOAkWhM2: 1300, ShadeLossPct: m.ShadeLossPct})
	}
	el := make([]float64, 360)
	for i := 200; i < 240; i++ {
		el[i] = 25 // a tree standing south-west, 25° high
	}
	sp := &SunPath{Observer: sun.Observer{LatDeg: 47.05, LonDeg: 15.43}, Zone: time.FixedZone("CET", 3600), Year: 2025,
		Outlines: []shading.Outline{{ID: "oak", Kind: "tree", ElevationDeg: el}}, AzStepDeg: 1, Module: "S.2.3", ShadeLossPct: 12}
	return &Proposal{Summary: s, Plan: pl, SunPath: sp,
		Equipment: Equipment{ModulePowerW: 400, ModuleLengthM: 1.72, ModuleWidthM: 1.13, CellsSeries: 120, BypassDiodes: 3,
			InverterACW: 3000, InverterInputs: 2, InverterMaxDCV: 600, MPPTMinV: 90, MPPTMaxV: 560}}
}

// pageTitles are the headings every full proposal carries, one page each (after the first).
var pageTitles = []string{"Roof plan and strings", "Sun path and obstructions", "Monthly energy",
	"Losses from irradiation to AC energy", "String layouts compared", "Wiring checks and cautions", "Assumptions, uncertainty and safety"}

var mediaBox = regexp.MustCompile(`/MediaBox \[0 0 ([0-9.]+) ([0-9.]+)\]`)

func TestProposalPDF(t *testing.T) {
	tests := []struct {
		name         string
		paper        string
		source       string
		wantW, wantH float64 // page size, pt: ISO 216 A4 is 210 × 297 mm; ANSI Letter 8.5 × 11 in
		loud         bool
	}{
		{"a4 default", "", "file", 595.28, 841.89, false},
		{"letter", "letter", "monthly", 612, 792, false},
		{"indicative climate", "a4", "indicative", 595.28, 841.89, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			pr := fixture(tc.source)
			pr.Paper = tc.paper
			b, err := pr.PDF()
			if err != nil {
				t.Fatal(err)
			}
			// Structure without any tool: one page object per page; the proposal has an
			// overview and one page per section, none of them overflowing in this fixture.
			pages := regexp.MustCompile(`/Type /Page\b[^s]`).FindAll(b, -1)
			if len(pages) != 1+len(pageTitles) {
				t.Errorf("%d page objects, want %d (overview + sections)", len(pages), 1+len(pageTitles))
			}
			m := mediaBox.FindSubmatch(b)
			if m == nil {
				t.Fatal("no MediaBox in the PDF")
			}
			w, _ := strconv.ParseFloat(string(m[1]), 64)
			h, _ := strconv.ParseFloat(string(m[2]), 64)
			if !scalar.EqualWithinAbs(w, tc.wantW, 0.5) || !scalar.EqualWithinAbs(h, tc.wantH, 0.5) {
				t.Errorf("page %.2f × %.2f pt, want %.2f × %.2f ± 0.5 (paper %q)", w, h, tc.wantW, tc.wantH, tc.paper)
			}
			txt := pdfText(t, b)
			if txt == "" {
				return
			}
			for _, title := range pageTitles {
				if !strings.Contains(txt, title) {
					t.Errorf("no page titled %q", title)
				}
			}
			// The key figures are the summary's, formatted for people.
			for _, want := range []string{"2,346", "977", "2.40", "124.6 V", "licensed installer"} {
				if !strings.Contains(txt, want) {
					t.Errorf("key figure %q missing from the text", want)
				}
			}
			if got := strings.Contains(txt, "INDICATIVE ONLY"); got != tc.loud {
				t.Errorf("indicative warning shown = %v, want %v (climate source %q)", got, tc.loud, tc.source)
			}
		})
	}
}

// pdfText extracts the text with pdftotext, or skips the text checks when it is absent.
func pdfText(t *testing.T, b []byte) string {
	t.Helper()
	if _, err := exec.LookPath("pdftotext"); err != nil {
		t.Log("pdftotext not installed (poppler-utils): text checks skipped, structure checked")
		return ""
	}
	f := filepath.Join(t.TempDir(), "p.pdf")
	if err := os.WriteFile(f, b, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command("pdftotext", "-layout", f, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext: %v", err)
	}
	return string(out)
}

func TestProposalDeterministic(t *testing.T) {
	a, err := fixture("file").PDF()
	if err != nil {
		t.Fatal(err)
	}
	b, err := fixture("file").PDF()
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a, b) {
		t.Errorf("two renders of the same proposal differ (%d and %d bytes): dates or map order leak in", len(a), len(b))
	}
}

func TestProposalPaperRejected(t *testing.T) {
	pr := fixture("file")
	pr.Paper = "a3"
	if _, err := pr.PDF(); !errors.Is(err, ErrPaper) {
		t.Errorf("paper a3: error %v, want ErrPaper", err)
	}
}

// TestChartsGolden renders every chart of the fixture and compares it with its golden PNG:
// same size, and a mean absolute difference per channel under 2 % of full scale (anti-aliasing
// and font hinting move edges by a pixel; a missing bar or outline moves far more).
func TestChartsGolden(t *testing.T) {
	for _, c := range fixture("file").Charts() {
		t.Run(c.Name, func(t *testing.T) {
			b, err := Render(c.Plot, c.W, c.H, PNG)
			if err != nil {
				t.Fatal(err)
			}
			golden := filepath.Join("testdata", c.Name+".png")
			if *update {
				if err := os.MkdirAll("testdata", 0o755); err != nil {
					t.Fatal(err)
				}
				if err := os.WriteFile(golden, b, 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(golden)
			if err != nil {
				t.Fatalf("%v (run go test -update to create it)", err)
			}
			gi, wi := decodePNG(t, b), decodePNG(t, want)
			if gi.Bounds() != wi.Bounds() {
				t.Fatalf("size %v, golden %v", gi.Bounds(), wi.Bounds())
			}
			if d := meanDiff(gi, wi); d > 0.02 {
				t.Errorf("mean difference %.4f of full scale, want ≤ 0.02", d)
			}
			// Not empty: at least 2 % of the picture is neither white nor near-white.
			if ink := inkShare(gi); ink < 0.02 {
				t.Errorf("ink share %.4f, want ≥ 0.02: the chart looks empty", ink)
			}
		})
	}
}

func decodePNG(t *testing.T, b []byte) image.Image {
	t.Helper()
	img, err := png.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	return img
}

func meanDiff(a, b image.Image) float64 {
	var sum float64
	r := a.Bounds()
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			r1, g1, b1, _ := a.At(x, y).RGBA()
			r2, g2, b2, _ := b.At(x, y).RGBA()
			sum += math.Abs(float64(r1)-float64(r2)) + math.Abs(float64(g1)-float64(g2)) + math.Abs(float64(b1)-float64(b2))
		}
	}
	return sum / (3 * 65535 * float64(r.Dx()*r.Dy()))
}

func inkShare(img image.Image) float64 {
	n := 0
	r := img.Bounds()
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			cr, cg, cb, _ := img.At(x, y).RGBA()
			if cr < 0xf000 || cg < 0xf000 || cb < 0xf000 {
				n++
			}
		}
	}
	return float64(n) / float64(r.Dx()*r.Dy())
}
