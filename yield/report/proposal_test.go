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
	"gonum.org/v1/plot/vg"

	"sunstring/shading"
	"sunstring/shading/sun"
	"sunstring/yield/finding"
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
		Losses: []Loss{
			{"light reaching the modules", "shade: less light on the modules", 150, 5},
			{"light reaching the modules", "dirt on the glass (soiling)", 60, 2},
			{"the modules themselves", "shade: bypass diodes in partly shaded modules", 20, 0.8},
			{"strings and cables", "shade: shaded modules holding back their strings", 30, 1.2},
			{"the inverter", "conversion to AC", 90, 3.5},
			{"the inverter", "held at the inverter's AC power", 0.4, 0},
		},
		Shade: &ShadeSplit{LostKWh: 160, LostPct: 6.4, Parts: []ShadePart{
			{"less light on the modules", 120, 4.8}, {"shaded modules holding back their strings", 24, 0.96},
			{"bypass diodes in partly shaded modules", 16, 0.64}}},
		Layouts: []Layout{
			{Name: "searched 1", AnnualACkWh: 2345.6, ShadeLossPct: 4.1, Strings: [][]string{{"S.1.1", "S.1.2", "S.1.3"}, {"S.2.1", "S.2.2", "S.2.3"}}, Inputs: []int{1, 2}},
			{Name: "roof order", AnnualACkWh: 2301, ShadeLossPct: 5.9, BehindBestKWh: 44.6, Strings: [][]string{{"S.1.1", "S.1.2", "S.1.3", "S.2.1", "S.2.2", "S.2.3"}}, Inputs: []int{1}},
		},
		Faces:    []Face{{ID: "S", PitchDeg: 35, AspectDeg: 180, PlanAreaM2: 40, SlopedAreaM2: 48.8, Modules: 7, KWp: 2.8}},
		Warnings: []finding.Finding{{Severity: finding.Warning, Code: "test", Message: "test warning"}},
		Checks: []Check{{Severity: "info", Subject: "searched 1, input 1", Unit: "V", Value: 124.6, Limit: 600,
			Message: "3 modules in series: 124.6 V open circuit at -16 °C (inverter maximum 600 V)"}},
		Alternatives: []Alternative{{Name: "module-level converters", AnnualACkWh: 2400, DifferenceKWh: 54.4, Note: "a converter on every module"}},
		Cautions:     Cautions,
		Models:       []string{"sun: Reda & Andreas (2004)"},
	}
	pl := &Plan{
		Faces: []Shape{{ID: "S", Ring: [][2]float64{{0, 0}, {8, 0}, {8, 5}, {0, 5}, {0, 0}}}},
		Blocks: []Shape{{ID: "chimney", Ring: [][2]float64{{6.5, 3.5}, {7.2, 3.5}, {7.2, 4.2}, {6.5, 4.2}, {6.5, 3.5}}},
			// a neighbour's house south-west, drawn whole; a tower 70 m away, left out
			{ID: "neighbour", Ring: [][2]float64{{-12, -12}, {-6, -12}, {-6, -7}, {-12, -7}, {-12, -12}}},
			{ID: "tower", Ring: [][2]float64{{70, 0}, {72, 0}, {72, 2}, {70, 2}, {70, 0}}}},
		Avoids: []Shape{{ID: "vent", Ring: [][2]float64{{5.3, 0.6}, {6, 0.6}, {6, 1.3}, {5.3, 1.3}, {5.3, 0.6}}}},
		Trees:  []TreeMark{{ID: "oak", X: -3, Y: -4, CrownRadiusM: 2.5}},
	}
	for r := 0; r < 2; r++ {
		for c := 0; c < 3+r; c++ {
			x, y := 0.5+float64(c)*1.15, 0.5+float64(r)*1.75
			pl.Modules = append(pl.Modules, PlanModule{ID: fmt.Sprintf("S.%d.%d", r+1, c+1),
				Corners:      [4][2]float64{{x, y}, {x + 1.13, y}, {x + 1.13, y + 1.72}, {x, y + 1.72}},
				ShadeLossPct: float64(1 + 5*r + 3*c)})
		}
	}
	pl.Strings, pl.Inputs = [][]int{{0, 1, 2}, {5, 4, 3}}, []int{1, 2}
	// S.2.4 is placed but not connected.
	strOf := map[string]string{"S.1.1": "1.1", "S.1.2": "1.1", "S.1.3": "1.1", "S.2.1": "2.1", "S.2.2": "2.1", "S.2.3": "2.1"}
	for _, m := range pl.Modules {
		s.ModuleResults = append(s.ModuleResults, ModuleResult{ID: m.ID, Face: "S", AnnualPOAkWhM2: 1300 * (1 - m.ShadeLossPct/100),
			ShadeLossPct: m.ShadeLossPct, String: strOf[m.ID]})
	}
	el := make([]float64, 360)
	for i := 200; i < 240; i++ {
		el[i] = 25 // a tree standing south-west, 25° high
	}
	sp := &SunPath{Observer: sun.Observer{LatDeg: 47.05, LonDeg: 15.43}, Zone: time.FixedZone("CET", 3600), Year: 2025,
		Outlines: []shading.Outline{{ID: "oak", Kind: "tree", ElevationDeg: el}}, AzStepDeg: 1, Module: "S.2.3", ShadeLossPct: 12}
	return &Proposal{Summary: s, Plan: pl, SunPath: sp,
		Cover: Cover{Customer: "Ms Example", Address: "1 Sample Lane", PreparedBy: "A. Surveyor", Date: "2026-05-05", ValidUntil: "2026-06-30"},
		Equipment: Equipment{ModulePowerW: 400, ModuleLengthM: 1.72, ModuleWidthM: 1.13, CellsSeries: 120, BypassDiodes: 3,
			InverterACW: 3000, InverterInputs: 2, InverterMaxDCV: 600, MPPTMinV: 90, MPPTMaxV: 560}}
}

// The headings of the two documents, one page each after the first (the tests look for
// them in the text).
var (
	proposalTitles  = []string{"Your energy month by month", "Where the shade comes from", "How the modules are wired", "What this estimate rests on"}
	technicalTitles = []string{"String checks", "Roof plan and strings", "String layouts compared", "Loss breakdown", "Shade", "Models, data and uncertainty"}
)

var mediaBox = regexp.MustCompile(`/MediaBox \[0 0 ([0-9.]+) ([0-9.]+)\]`)

func TestDocumentsPDF(t *testing.T) {
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
		for _, doc := range []struct {
			name   string
			render func(*Proposal) ([]byte, error)
			titles []string
			// figures the document must show, formatted for people
			want, not []string
		}{
			{"proposal", (*Proposal).PDF, proposalTitles,
				[]string{"2,346", "977", "2.40 kWp", "6.4 %", "licensed installer", "less light on the modules", "For Ms Example", "valid until 2026-06-30", "1 open point"},
				// the installer's part stays out of the homeowner's document, the surveyor's
				// warnings (worded for the site file) with it
				[]string{"124.6 V", "open circuit", "hill-climbing", "Reda & Andreas", "test warning"}},
			{"technical sheet", (*Proposal).TechnicalPDF, technicalTitles,
				[]string{"2,346", "124.6 V", "licensed installer", "module-level converters", "Reda & Andreas", "shaded modules holding back their strings", "conversion to AC", "The inverter", "test warning"},
				nil},
		} {
			t.Run(tc.name+"/"+doc.name, func(t *testing.T) {
				pr := fixture(tc.source)
				pr.Paper = tc.paper
				b, err := doc.render(pr)
				if err != nil {
					t.Fatal(err)
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
				// The survey date stamps the metadata (PDF date format, ISO 32000-1 §7.9.4).
				if !bytes.Contains(b, []byte("D:20260505")) {
					t.Errorf("no creation date of 5 May 2026 in the metadata")
				}
				txt := pdfText(t, b)
				for _, title := range doc.titles {
					if !strings.Contains(txt, title) {
						t.Errorf("no page titled %q", title)
					}
				}
				for _, want := range doc.want {
					if !strings.Contains(txt, want) {
						t.Errorf("%q missing from the text", want)
					}
				}
				for _, not := range doc.not {
					if strings.Contains(txt, not) {
						t.Errorf("%q in the text: it belongs in the other document", not)
					}
				}
				// The cautions once: their first sentence appears exactly once.
				if n := strings.Count(strings.Join(strings.Fields(txt), " "), "This is an estimate, not a design"); n != 1 {
					t.Errorf("the cautions appear %d times, want once", n)
				}
				if got := strings.Contains(txt, "INDICATIVE ONLY"); got != tc.loud {
					t.Errorf("indicative warning shown = %v, want %v (climate source %q)", got, tc.loud, tc.source)
				}
				for _, bad := range []string{"(s)", "1 modules", "..", "−0 kWh"} {
					if strings.Contains(txt, bad) {
						t.Errorf("the text holds %q", bad)
					}
				}
			})
		}
	}
}

// TestChartNamesInAnyScript: a name in a script the main typeface lacks, or with an emoji,
// reaches the charts as it is drawn (Printable), and the documents do not fail.
func TestChartNamesInAnyScript(t *testing.T) {
	tests := []struct {
		name, in, want string
	}{
		{"latin with accents", "Müller-Łódź", "Müller-Łódź"},
		{"cjk", "太陽の家", "太陽の家"},
		{"emoji with a variation selector", "Haus ☀️", "Haus ☀"},
		{"emoji outside the basic plane with a skin tone", "ok 👍🏽!", "ok 👍!"},
		{"private use, in no typeface", "a\ue000b", "a□b"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := Printable(tc.in); got != tc.want {
				t.Errorf("Printable(%q) = %q, want %q", tc.in, got, tc.want)
			}
			pr := fixture("file")
			pr.Summary.Site.Name = tc.in
			pr.Cover.Customer = tc.in
			pr.Plan.Faces[0].ID = tc.in
			for _, doc := range []func(*Proposal) ([]byte, error){(*Proposal).PDF, (*Proposal).TechnicalPDF} {
				if _, err := doc(pr); err != nil {
					t.Errorf("%v", err)
				}
			}
		})
	}
}

// pdfText extracts the text with pdftotext. CI installs it (.ci/run) and must not pass
// without the text checks; elsewhere a missing pdftotext leaves only the structure checked.
func pdfText(t *testing.T, b []byte) string {
	t.Helper()
	if _, err := exec.LookPath("pdftotext"); err != nil {
		if os.Getenv("CI") != "" {
			t.Fatal("pdftotext (poppler-utils) is missing on CI: the documents' text would go unchecked")
		}
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

func TestDocumentsDeterministic(t *testing.T) {
	for _, doc := range []func(*Proposal) ([]byte, error){(*Proposal).PDF, (*Proposal).TechnicalPDF} {
		a, err := doc(fixture("file"))
		if err != nil {
			t.Fatal(err)
		}
		b, err := doc(fixture("file"))
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a, b) {
			t.Errorf("two renders of the same document differ (%d and %d bytes): dates or map order leak in", len(a), len(b))
		}
	}
}

func TestProposalPaperRejected(t *testing.T) {
	pr := fixture("file")
	pr.Paper = "a3"
	if _, err := pr.PDF(); !errors.Is(err, ErrPaper) {
		t.Errorf("paper a3: error %v, want ErrPaper", err)
	}
	if _, err := pr.TechnicalPDF(); !errors.Is(err, ErrPaper) {
		t.Errorf("paper a3, technical sheet: error %v, want ErrPaper", err)
	}
}

// Golden images are compared pixel by pixel: a pixel differs when a channel moves by more
// than goldenLevel of full scale, and a chart fails when more than goldenShare of its pixels
// differ. Anti-aliasing and hinting move a few edge pixels at most; a bar of the monthly
// chart halved moves about 0.7 % of them (TestGoldenCatchesAHalvedBar).
const (
	goldenLevel = 24.0 / 255
	goldenShare = 0.0005
)

// TestChartsGolden renders every chart of the fixture and compares it with its golden PNG.
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
			if d := differing(gi, wi); d > goldenShare {
				t.Errorf("%.4f %% of the pixels differ from the golden image, want ≤ %.4f %%", 100*d, 100*goldenShare)
			}
			// Not empty: at least 2 % of the picture is neither white nor near-white.
			if ink := inkShare(gi); ink < 0.02 {
				t.Errorf("ink share %.4f, want ≥ 0.02: the chart looks empty", ink)
			}
		})
	}
}

// TestGoldenCatchesAHalvedBar: the comparison tells a monthly chart with one month's bar
// halved from the chart as it was.
func TestGoldenCatchesAHalvedBar(t *testing.T) {
	s := fixture("file").Summary
	render := func(ac [12]float64) image.Image {
		b, err := Render(MonthlyChart(&ac, &s.MonthlyUnshaded, ""), 16*vg.Centimeter, 8*vg.Centimeter, PNG)
		if err != nil {
			t.Fatal(err)
		}
		return decodePNG(t, b)
	}
	a := render(s.MonthlyACkWh)
	if d := differing(a, render(s.MonthlyACkWh)); d != 0 {
		t.Errorf("the same chart twice: %.4f %% of the pixels differ, want none", 100*d)
	}
	halved := s.MonthlyACkWh
	halved[4] /= 2
	d := differing(a, render(halved))
	t.Logf("May halved: %.3f %% of the pixels differ", 100*d)
	if d <= goldenShare {
		t.Errorf("May's bar halved: %.4f %% of the pixels differ, not above the tolerance %.4f %%", 100*d, 100*goldenShare)
	}
}

// differing is the share of pixels of which some channel differs by more than goldenLevel.
func differing(a, b image.Image) float64 {
	n := 0
	r := a.Bounds()
	lim := goldenLevel * 65535
	for y := r.Min.Y; y < r.Max.Y; y++ {
		for x := r.Min.X; x < r.Max.X; x++ {
			r1, g1, b1, _ := a.At(x, y).RGBA()
			r2, g2, b2, _ := b.At(x, y).RGBA()
			if math.Abs(float64(r1)-float64(r2)) > lim || math.Abs(float64(g1)-float64(g2)) > lim || math.Abs(float64(b1)-float64(b2)) > lim {
				n++
			}
		}
	}
	return float64(n) / float64(r.Dx()*r.Dy())
}

func decodePNG(t *testing.T, b []byte) image.Image {
	t.Helper()
	img, err := png.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	return img
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

// TestPlanLabelsFallBackToRowsAndColumns: when a far obstacle shrinks the modules below a
// readable label, the plan numbers rows and columns at the faces' edges instead, and says so.
func TestPlanLabelsFallBackToRowsAndColumns(t *testing.T) {
	tests := []struct {
		name  string
		treeX float64 // a tree this far east of the roof, m
		want  string
	}{
		{"near obstacles: labels on the modules", -3, "row.column of the face"},
		{"an obstacle 35 m away: rows and columns", 40, "rows numbered beside each face"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			pr := fixture("file")
			pr.Plan.Trees = []TreeMark{{ID: "far", X: tc.treeX, Y: -20, CrownRadiusM: 3}}
			pr.fillPlan()
			p := PlanChart(pr.Plan, 16*vg.Centimeter, 13*vg.Centimeter)
			if !strings.Contains(p.Title.Text, tc.want) {
				t.Errorf("title %q, want it to say %q", p.Title.Text, tc.want)
			}
			if _, err := Render(p, 16*vg.Centimeter, 13*vg.Centimeter, PNG); err != nil {
				t.Fatal(err)
			}
		})
	}
}

// TestLongLayoutNameWraps: a layout name longer than its column wraps inside it instead of
// running over the next columns (pdftotext then runs the two together, "3 + 3over"), and a
// one-input inverter reads "1 MPPT input".
func TestLongLayoutNameWraps(t *testing.T) {
	pr := fixture("file")
	pr.Summary.Layouts[0].Name = "strings of 3 and 3, shaded modules spread over one input's strings, strings in parallel"
	pr.Equipment.InverterInputs = 1
	pr.Equipment.BypassDiodes = 1
	b, err := pr.TechnicalPDF()
	if err != nil {
		t.Fatal(err)
	}
	txt := pdfText(t, b)
	if !regexp.MustCompile(`(?m)^ *1 strings of 3 and 3,.* 3 ?\+ ?3 +2,346`).MatchString(txt) {
		t.Errorf("the strings column \"3 + 3\" is run together with the layout's name")
	}
	for _, want := range []string{"1 MPPT input,", "1 bypass diode\n"} {
		if !strings.Contains(txt, want) {
			t.Errorf("%q missing from the technical sheet", want)
		}
	}
	for _, bad := range []string{"1 MPPT inputs", "1 bypass diodes"} {
		if strings.Contains(txt, bad) {
			t.Errorf("the technical sheet holds %q", bad)
		}
	}
}

// TestFaceLabelSpots: on a hipped roof of 12 × 9 m the four faces' labels sit apart — the
// west and east faces at their top corners, the north face at the middle of its top edge,
// the south face (whose top is the ridge, under the north face) below its eave — and a
// gable's two faces each above the middle of their own top edge.
func TestFaceLabelSpots(t *testing.T) {
	type spot struct {
		x, y  float64
		below bool
	}
	tests := []struct {
		name  string
		faces []Shape
		want  []spot
	}{
		{"hipped", []Shape{
			{ID: "S", Ring: [][2]float64{{0, 0}, {12, 0}, {7.5, 4.5}, {4.5, 4.5}, {0, 0}}},
			{ID: "W", Ring: [][2]float64{{0, 0}, {4.5, 4.5}, {0, 9}, {0, 0}}},
			{ID: "E", Ring: [][2]float64{{12, 0}, {12, 9}, {7.5, 4.5}, {12, 0}}},
			{ID: "N", Ring: [][2]float64{{0, 9}, {4.5, 4.5}, {7.5, 4.5}, {12, 9}, {0, 9}}},
		}, []spot{{6, 0, true}, {0, 9, false}, {12, 9, false}, {6, 9, false}}},
		{"gable, ridge north-south", []Shape{
			{ID: "E", Ring: [][2]float64{{0, 0}, {4, 0}, {4, 6.5}, {0, 6.5}, {0, 0}}},
			{ID: "W", Ring: [][2]float64{{-4, 0}, {0, 0}, {0, 6.5}, {-4, 6.5}, {-4, 0}}},
		}, []spot{{2, 6.5, false}, {-2, 6.5, false}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := faceLabelSpots(tc.faces)
			for i, w := range tc.want {
				g := got[i]
				// exact geometry: the spots are vertices or midpoints of the rings above
				if !scalar.EqualWithinAbs(g.at.X, w.x, 1e-9) || !scalar.EqualWithinAbs(g.at.Y, w.y, 1e-9) || g.below != w.below {
					t.Errorf("face %s: label at (%.2f, %.2f) below=%v, want (%.2f, %.2f) below=%v",
						tc.faces[i].ID, g.at.X, g.at.Y, g.below, w.x, w.y, w.below)
				}
			}
		})
	}
}

// TestObstaclesText: the sun-path caption names every kind that shades the module, roof faces
// included, in the legend's order and words, each object with its highest point; what rises
// above the horizon without ever being in the sun's way comes after; without the shading's
// word the caption names what rises, faces left out (the module's own face rises behind it).
func TestObstaclesText(t *testing.T) {
	rise := func(peak float64) []float64 {
		el := make([]float64, 360)
		for i := 100; i < 120; i++ {
			el[i] = peak
		}
		return el
	}
	outlines := []shading.Outline{
		{Kind: "horizon", ElevationDeg: rise(4)},
		{ID: "own", Kind: "face", ElevationDeg: rise(35)},
		{ID: "W", Kind: "face", ElevationDeg: rise(30)},
		{ID: "chimney", Kind: "block", ElevationDeg: rise(12)},
		{ID: "oak", Kind: "tree", ElevationDeg: rise(25)},
		{ID: "birch", Kind: "tree", ElevationDeg: rise(9)},
	}
	tests := []struct {
		name      string
		shaders   []shading.Blocker
		want, not []string
	}{
		{"a roof face among what shades",
			[]shading.Blocker{{Kind: "horizon", Steps: 40}, {ID: "W", Kind: "face", Steps: 120}, {ID: "chimney", Kind: "block", Steps: 30}, {ID: "oak", Kind: "tree", Steps: 200}, {ID: "birch", Kind: "tree", Steps: 5}},
			[]string{"Far horizon: up to 4°. Roof: W (up to 30°). Chimney, dormer, building: chimney (up to 12°). Tree: oak (up to 25°), birch (up to 9°)."},
			[]string{"own", "never in the sun's way"}},
		{"a tree that never shades",
			[]shading.Blocker{{ID: "W", Kind: "face", Steps: 120}},
			[]string{"Roof: W (up to 30°).", "Above its horizon but never in the sun's way: chimney (up to 12°), oak (up to 25°), birch (up to 9°)."},
			[]string{"own", "Tree:"}},
		{"nothing shades", []shading.Blocker{},
			[]string{"never in the sun's way: chimney"}, []string{"What shades it", "own", " W "}},
		{"not known", nil,
			[]string{"Seen from there: oak (up to 25°), chimney (up to 12°), birch (up to 9°), the far horizon (up to 4°)."}, []string{"own", "W ("}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := obstaclesText(&SunPath{Outlines: outlines, AzStepDeg: 1, Shaders: tc.shaders})
			for _, w := range tc.want {
				if !strings.Contains(got, w) {
					t.Errorf("caption %q lacks %q", got, w)
				}
			}
			for _, n := range tc.not {
				if strings.Contains(got, n) {
					t.Errorf("caption %q holds %q", got, n)
				}
			}
		})
	}
}
