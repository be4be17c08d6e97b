package report

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"strings"
	"time"

	"codeberg.org/go-fonts/liberation/liberationsansbold"
	"codeberg.org/go-fonts/liberation/liberationsansregular"
	"codeberg.org/go-pdf/fpdf"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
)

// Proposal is everything the customer proposal shows: the survey's summary, the equipment,
// the roof plan and the sun path of the most shaded module.
type Proposal struct {
	Summary   *Summary
	Equipment Equipment
	Plan      *Plan
	// SunPath is the sun-path chart's input; nil leaves the chart out.
	SunPath *SunPath
	// Paper is "a4" (the default when empty) or "letter".
	Paper string
}

// Equipment is the module and inverter as the site file gives them.
type Equipment struct {
	ModulePowerW           float64 // at STC
	ModuleLengthM          float64
	ModuleWidthM           float64
	CellsSeries            int  // as the datasheet counts them
	HalfCut                bool // two halves in parallel: CellsSeries/2 in series
	BypassDiodes           int
	InverterACW            float64
	InverterInputs         int
	InverterMaxDCV         float64
	MPPTMinV, MPPTMaxV     float64
	InverterEfficiencyNote string // e.g. "97 % (flat)"; may be empty
}

// Chart is one named chart of the report and the size it is drawn at.
type Chart struct {
	Name string // file name without extension: "monthly", "plan", …
	Plot *plot.Plot
	W, H vg.Length
}

// ErrPaper is returned for a paper size other than a4 or letter.
var ErrPaper = errors.New("report: paper must be a4 or letter")

// Charts returns the report's charts in the order the proposal shows them. Charts whose
// input is missing (no modules, no layout, no sun path) are left out.
func (pr *Proposal) Charts() []Chart {
	s := pr.Summary
	var cs []Chart
	wide := 16 * vg.Centimeter
	if pr.Plan != nil && len(pr.Plan.Modules) > 0 {
		h := 10.5 * vg.Centimeter
		cs = append(cs, Chart{"plan", PlanChart(pr.Plan, wide, h), wide, h})
		if len(pr.Plan.Strings) > 0 {
			cs = append(cs, Chart{"strings", StringsChart(pr.Plan, wide, h), wide, h})
		}
	}
	if pr.SunPath != nil {
		cs = append(cs, Chart{"sunpath", SunPathChart(pr.SunPath), wide, 10 * vg.Centimeter})
	}
	note := ""
	if s.Climate.Source == "indicative" {
		note = "INDICATIVE: clear-sky year, no climate data"
	}
	cs = append(cs, Chart{"monthly", MonthlyChart(&s.MonthlyACkWh, &s.MonthlyUnshaded, note), wide, 9 * vg.Centimeter})
	if len(s.Losses) > 0 {
		cs = append(cs, Chart{"losses", LossChart(s.AnnualACkWh, s.Losses), wide, 10 * vg.Centimeter})
	}
	if len(s.Layouts) > 0 {
		h := vg.Length(math.Min(12, 4+1.1*float64(len(s.Layouts)))) * vg.Centimeter
		cs = append(cs, Chart{"layouts", LayoutChart(s.Layouts), wide, h})
	}
	return cs
}

// fixedDate stamps the PDF so that two runs on the same input give the same bytes.
var fixedDate = time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)

// page geometry and type sizes, millimetres and points.
const (
	margin   = 18.0
	bodyPt   = 10.0
	smallPt  = 8.0
	h1Pt     = 22.0
	h2Pt     = 15.0
	lineMM   = 5.0
	fontName = "Sans"
)

// pdfDoc wraps fpdf with the proposal's type hierarchy.
type pdfDoc struct {
	*fpdf.Fpdf
	w, h float64 // page, mm
	site string
}

func rgb(c interface{ RGBA() (r, g, b, a uint32) }) (int, int, int) {
	r, g, b, _ := c.RGBA()
	return int(r >> 8), int(g >> 8), int(b >> 8)
}

func (d *pdfDoc) colour(c interface{ RGBA() (r, g, b, a uint32) }) {
	d.SetTextColor(rgb(c))
}

func (d *pdfDoc) contentW() float64 { return d.w - 2*margin }

// heading starts a page with its title (the titles are what the tests look for).
func (d *pdfDoc) heading(title, lead string) {
	d.AddPage()
	d.SetFont(fontName, "B", h2Pt)
	d.colour(Accent)
	d.CellFormat(0, 9, title, "", 1, "L", false, 0, "")
	d.SetDrawColor(rgb(Accent))
	d.SetLineWidth(0.6)
	y := d.GetY()
	d.Line(margin, y, margin+24, y)
	d.Ln(3)
	if lead != "" {
		d.para(lead)
		d.Ln(1)
	}
}

func (d *pdfDoc) para(s string) {
	d.SetFont(fontName, "", bodyPt)
	d.colour(Ink)
	d.MultiCell(0, lineMM, s, "", "L", false)
}

func (d *pdfDoc) small(s string) {
	d.SetFont(fontName, "", smallPt)
	d.colour(Ink)
	d.MultiCell(0, 4, s, "", "L", false)
}

func (d *pdfDoc) sub(s string) {
	d.Ln(2)
	d.SetFont(fontName, "B", 11)
	d.colour(Ink)
	d.CellFormat(0, 7, s, "", 1, "L", false, 0, "")
}

func (d *pdfDoc) bullets(items []string) {
	for _, it := range items {
		d.SetFont(fontName, "", bodyPt)
		d.colour(Accent)
		d.CellFormat(5, lineMM, "•", "", 0, "L", false, 0, "")
		d.colour(Ink)
		d.MultiCell(0, lineMM, it, "", "L", false)
		d.Ln(0.8)
	}
}

// table draws a header row and rows; widths are fractions of the content width; align per
// column ("L" or "R").
func (d *pdfDoc) table(head []string, rows [][]string, widths []float64, align string) {
	cw := d.contentW()
	d.SetFont(fontName, "B", smallPt+0.5)
	d.colour(Ink)
	d.SetFillColor(rgb(faceFill))
	for i, h := range head {
		d.CellFormat(widths[i]*cw, 6, h, "B", 0, string(align[i]), true, 0, "")
	}
	d.Ln(-1)
	d.SetFont(fontName, "", smallPt+0.5)
	d.SetDrawColor(rgb(Muted))
	d.SetLineWidth(0.2)
	for _, r := range rows {
		if d.GetY() > d.h-margin-12 {
			d.AddPage()
		}
		for i, c := range r {
			d.CellFormat(widths[i]*cw, 5.5, c, "B", 0, string(align[i]), false, 0, "")
		}
		d.Ln(-1)
	}
	d.Ln(2)
}

// image places a PNG across the content width, keeping its proportions.
func (d *pdfDoc) image(name string, png []byte, wFrac float64) {
	opt := fpdf.ImageOptions{ImageType: "PNG"}
	info := d.RegisterImageOptionsReader(name, opt, bytes.NewReader(png))
	if info == nil {
		return
	}
	w := d.contentW() * wFrac
	h := w * info.Height() / info.Width()
	// A picture that nearly fits the rest of the page is shrunk rather than pushed to a page
	// of its own (two plan drawings share a Letter page this way).
	if avail := d.h - margin - 8 - d.GetY(); h > avail {
		if avail >= 0.75*h {
			w, h = w*avail/h, avail
		} else {
			d.AddPage()
		}
	}
	d.ImageOptions(name, margin+(d.contentW()-w)/2, d.GetY(), w, h, false, opt, 0, "")
	d.SetY(d.GetY() + h + 3)
}

// PDF renders the customer proposal. The same proposal gives the same bytes.
func (pr *Proposal) PDF() ([]byte, error) {
	s := pr.Summary
	size := "A4"
	switch strings.ToLower(pr.Paper) {
	case "", "a4":
	case "letter":
		size = "Letter"
	default:
		return nil, fmt.Errorf("%w, not %q", ErrPaper, pr.Paper)
	}
	f := fpdf.New("P", "mm", size, "")
	w, h := f.GetPageSize()
	d := &pdfDoc{Fpdf: f, w: w, h: h, site: s.Site.Name}
	f.SetCreationDate(fixedDate)
	f.SetModificationDate(fixedDate)
	f.SetCatalogSort(true)
	f.SetCompression(true)
	f.SetMargins(margin, margin, margin)
	f.SetAutoPageBreak(true, margin+4)
	f.AddUTF8FontFromBytes(fontName, "", liberationsansregular.TTF)
	f.AddUTF8FontFromBytes(fontName, "B", liberationsansbold.TTF)
	f.SetTitle("Solar PV proposal: "+s.Site.Name, true)
	f.SetCreator("sunstring", true)
	f.SetProducer("sunstring", true)
	f.AliasNbPages("{nb}")
	f.SetFooterFunc(func() {
		f.SetY(-margin + 4)
		f.SetFont(fontName, "", 7.5)
		d.colour(Muted)
		f.SetTextColor(0x6b, 0x73, 0x78)
		f.CellFormat(0, 4, fmt.Sprintf("%s · an estimate, not a design", s.Site.Name), "", 0, "L", false, 0, "")
		f.CellFormat(0, 4, fmt.Sprintf("page %d of {nb}", f.PageNo()), "", 0, "R", false, 0, "")
	})

	charts := map[string][]byte{}
	for k, c := range pr.Charts() {
		// fpdf's catalog sort orders images by pixel width alone, and takes them from a map:
		// charts of equal width would land in a random order and the bytes would differ from
		// run to run. One pixel more per chart (invisible once placed) makes the order fixed.
		px := vg.Inch / chartDPI
		b, err := Render(c.Plot, c.W+vg.Length(k)*px, c.H, PNG)
		if err != nil {
			return nil, err
		}
		charts[c.Name] = b
	}

	pr.overview(d)
	if charts["plan"] != nil {
		d.heading("Roof plan and strings", "Each module is coloured by the share of its yearly sunlight lost to shade (numbers on the modules, in %). The second drawing shows how the modules of the chosen layout are wired: one colour per string, numbered in wiring order.")
		d.image("plan", charts["plan"], 0.92)
		if charts["strings"] != nil {
			d.image("strings", charts["strings"], 0.92)
		}
	}
	if charts["sunpath"] != nil {
		sp := pr.SunPath
		d.heading("Sun path and obstructions", fmt.Sprintf("The sun's track across the sky on the 21st of each month, seen from module %s, the module that loses most to shade. Grey areas are what stands above the horizon from there; where a track runs through grey, that module is shaded at that time of day and year.", sp.Module))
		d.image("sunpath", charts["sunpath"], 1)
		pr.shadeTable(d)
	}
	d.heading("Monthly energy", "Estimated AC energy per month for the chosen layout, beside what the same modules would give without any shade.")
	d.image("monthly", charts["monthly"], 1)
	var rows [][]string
	var tot, totU float64
	for i := range 12 {
		a, u := s.MonthlyACkWh[i], s.MonthlyUnshaded[i]
		tot += a
		totU += u
		rows = append(rows, []string{MonthNames[i], Thousands(a, 0), Thousands(u, 0), lossPct(a, u)})
	}
	rows = append(rows, []string{"Year", Thousands(s.AnnualACkWh, 0), Thousands(totU*s.AnnualACkWh/math.Max(tot, 1e-9), 0), lossPct(tot, totU)})
	d.table([]string{"Month", "AC energy (kWh)", "Without shade (kWh)", "Lost to shade"}, rows, []float64{0.25, 0.25, 0.25, 0.25}, "LRRR")

	if len(s.Losses) > 0 {
		d.heading("Losses from irradiation to AC energy", "Every step between the sunlight reaching the modules and the energy delivered to the house, for one year. Each percentage is of the energy entering that step.")
		if charts["losses"] != nil {
			d.image("losses", charts["losses"], 1)
		}
		start := StartKWh(s.AnnualACkWh, s.Losses)
		rows = [][]string{{"modules' irradiation at STC efficiency", Thousands(start, 0), ""}}
		for _, l := range s.Losses {
			lost := Thousands(l.KWh, 0)
			if lost != "0" {
				lost = "−" + lost
			}
			rows = append(rows, []string{l.Step, lost, Pct(l.Pct)})
		}
		rows = append(rows, []string{"AC energy", Thousands(s.AnnualACkWh, 0), ""})
		d.table([]string{"Step", "Energy (kWh per year)", "Loss"}, rows, []float64{0.6, 0.22, 0.18}, "LRR")
	}

	if len(s.Layouts) > 0 {
		d.heading("String layouts compared", "The string layouts evaluated on this roof, best first. Every layout uses the same modules and the same year; they differ in how shade on one module holds back the others in its string.")
		if charts["layouts"] != nil {
			d.image("layouts", charts["layouts"], 1)
		}
		rows = nil
		for i, l := range s.Layouts {
			rows = append(rows, []string{fmt.Sprint(i + 1), l.Name, stringLengths(l.Strings), Thousands(l.AnnualACkWh, 0),
				Pct(l.ShadeLossPct), Thousands(l.BehindBestKWh, 0)})
		}
		d.table([]string{"Rank", "Layout", "Strings (modules each)", "AC energy (kWh)", "Shade loss", "Behind best (kWh)"},
			rows, []float64{0.08, 0.27, 0.2, 0.16, 0.13, 0.16}, "RLLRRR")
		for i, l := range s.Layouts {
			if l.Note != "" {
				d.small(fmt.Sprintf("%d. %s: %s.", i+1, l.Name, l.Note))
			}
		}
	}

	pr.electrics(d)
	pr.assumptions(d)
	if err := f.Error(); err != nil {
		return nil, fmt.Errorf("report: pdf: %w", err)
	}
	var buf bytes.Buffer
	if err := f.Output(&buf); err != nil {
		return nil, fmt.Errorf("report: pdf: %w", err)
	}
	return buf.Bytes(), nil
}

// electrics is the page a surveyor checks before anyone wires anything: the string voltages at
// the temperature extremes, the currents, the leakage estimate, the tracker and module-level
// alternatives, and the cautions beside them.
func (pr *Proposal) electrics(d *pdfDoc) {
	s := pr.Summary
	d.heading("Wiring checks and cautions", "The chosen layout's strings against the inverter's limits at the coldest and hottest temperatures given for the site. These are checks for planning; the installer designs the wiring to local codes.")
	if len(s.Checks) > 0 {
		// A list, not a table: each check is a sentence with its own numbers and limit.
		var items []string
		for _, c := range s.Checks {
			sev := ""
			if c.Severity != "info" {
				sev = strings.ToUpper(c.Severity) + " — "
			}
			items = append(items, fmt.Sprintf("%s%s: %s", sev, c.Subject, c.Message))
		}
		d.bullets(items)
	} else {
		d.para("No electrical checks were made for this report.")
	}
	if len(s.Alternatives) > 0 {
		d.sub("The same strings run another way")
		var rows [][]string
		for _, a := range s.Alternatives {
			diff := Thousands(a.DifferenceKWh, 0)
			if a.DifferenceKWh > 0 {
				diff = "+" + diff
			}
			rows = append(rows, []string{a.Name, Thousands(a.AnnualACkWh, 0), diff})
		}
		d.table([]string{"Alternative", "AC energy (kWh)", "Against the estimate (kWh)"}, rows, []float64{0.5, 0.25, 0.25}, "LRR")
		for _, a := range s.Alternatives {
			d.small(a.Name + ": " + a.Note + ".")
		}
	}
	d.sub("Cautions")
	d.bullets(s.Cautions)
}

// cellsText describes the module's cells: half-cut modules have two halves in parallel.
func cellsText(e Equipment) string {
	if e.HalfCut {
		return fmt.Sprintf("%d half-cut cells (two halves of %d in series, in parallel)", e.CellsSeries, e.CellsSeries/2)
	}
	return fmt.Sprintf("%d cells in series", e.CellsSeries)
}

func lossPct(a, u float64) string {
	if u <= 0 {
		return "–"
	}
	return Pct(100 * (1 - a/u))
}

func stringLengths(ss [][]string) string {
	parts := make([]string, len(ss))
	for i, s := range ss {
		parts[i] = fmt.Sprint(len(s))
	}
	return strings.Join(parts, " + ")
}

func latLon(lat, lon float64) string {
	ns, ew := "N", "E"
	if lat < 0 {
		ns, lat = "S", -lat
	}
	if lon < 0 {
		ew, lon = "W", -lon
	}
	return fmt.Sprintf("%.4f° %s, %.4f° %s", lat, ns, lon, ew)
}

// climateText says in words where the weather came from.
func climateText(c ClimateInfo) string {
	switch c.Source {
	case "file":
		t := "hourly weather file"
		if c.File != "" {
			t += " (" + c.File + ")"
		}
		return t
	case "monthly":
		return "monthly totals from the site file, spread into a synthetic hourly year"
	default:
		return "INDICATIVE clear-sky year: no climate data was given"
	}
}

// Uncertainty returns the stated uncertainty range (± %, low and high) of the annual energy
// and what it rests on, by climate source.
func Uncertainty(source string) (lo, hi float64, basis string) {
	switch source {
	case "file":
		return 5, 8, "a measured or typical-year hourly weather file: year-to-year weather varies by about ±5 % and the models by a few % more (common practice for yield estimates, not a sourced figure)"
	case "monthly":
		return 8, 12, "monthly climate totals: the hours inside each month are synthetic, which adds to the spread of a weather file (common practice, not a sourced figure)"
	default:
		return 20, 40, "no climate data: a clear-sky year over-states the energy of any real year, typically by a fifth to two fifths depending on the local cloudiness (common practice, not a sourced figure)"
	}
}

func (pr *Proposal) overview(d *pdfDoc) {
	s := pr.Summary
	d.AddPage()
	d.SetFont(fontName, "", 9)
	d.colour(Accent)
	d.CellFormat(0, 5, "SOLAR PV PROPOSAL", "", 1, "L", false, 0, "")
	d.SetFont(fontName, "B", h1Pt)
	d.colour(Ink)
	d.MultiCell(0, 10, s.Site.Name, "", "L", false)
	d.Ln(2)
	if s.Climate.Source == "indicative" {
		d.SetFillColor(rgb(Warn))
		d.SetTextColor(255, 255, 255)
		d.SetFont(fontName, "B", 12)
		d.CellFormat(0, 8, "  INDICATIVE ONLY — NO CLIMATE DATA", "", 1, "L", true, 0, "")
		d.SetFont(fontName, "", bodyPt)
		d.MultiCell(0, lineMM, "This estimate uses a clear-sky year without clouds because no weather file or monthly values were given. Real yields are lower, often by a fifth or more. Do not base a purchase on these figures; ask for a survey with climate data.", "", "L", true)
		d.Ln(4)
	}
	// Key figures: four boxes across the page.
	type fig struct{ label, value, unit string }
	figs := []fig{
		{"Annual AC energy", Thousands(s.AnnualACkWh, 0), "kWh per year"},
		{"Specific yield", Thousands(s.SpecificYield, 0), "kWh/kWp per year"},
		{"System size", Thousands(s.DCkWp, 2), fmt.Sprintf("kWp, %d modules", s.Modules)},
		{"Performance ratio", Thousands(100*s.PerformanceRatio, 0), "%"},
	}
	cw := d.contentW()
	bw := (cw - 3*4) / 4
	y := d.GetY()
	for i, f := range figs {
		x := margin + float64(i)*(bw+4)
		d.SetFillColor(rgb(faceFill))
		d.Rect(x, y, bw, 26, "F")
		d.SetFillColor(rgb(Accent))
		d.Rect(x, y, 1.2, 26, "F")
		d.SetXY(x+4, y+3)
		d.SetFont(fontName, "", smallPt)
		d.colour(Ink)
		d.CellFormat(bw-6, 4, f.label, "", 2, "L", false, 0, "")
		d.SetX(x + 4)
		d.SetFont(fontName, "B", 18)
		d.colour(Accent)
		d.CellFormat(bw-6, 10, f.value, "", 2, "L", false, 0, "")
		d.SetX(x + 4)
		d.SetFont(fontName, "", smallPt)
		d.colour(Ink)
		d.CellFormat(bw-6, 4, f.unit, "", 2, "L", false, 0, "")
	}
	d.SetXY(margin, y+30)
	lo, hi, _ := Uncertainty(s.Climate.Source)
	d.small(fmt.Sprintf("Estimated for the chosen layout. The annual energy is expected within ±%g to %g %% of the figure above (see the assumptions page).", lo, hi))

	d.sub("Site and system")
	e := pr.Equipment
	rows := [][]string{
		{"Location", latLon(s.Site.Latitude, s.Site.Longitude) + ", time zone " + s.Site.Timezone},
		{"Climate", fmt.Sprintf("%s; %s kWh/m² global horizontal irradiation per year", climateText(s.Climate), Thousands(s.Climate.AnnualGHIkWhM2, 0))},
		{"Modules", fmt.Sprintf("%d × %s W (%s kWp), %s m × %s m, %s, %d bypass diodes", s.Modules, Thousands(e.ModulePowerW, 0),
			Thousands(s.DCkWp, 2), Thousands(e.ModuleLengthM, 2), Thousands(e.ModuleWidthM, 2), cellsText(e), e.BypassDiodes)},
		{"Inverter", fmt.Sprintf("%s W AC, %d MPPT inputs, %s to %s V MPPT window, %s V DC maximum", Thousands(e.InverterACW, 0), e.InverterInputs,
			Thousands(e.MPPTMinV, 0), Thousands(e.MPPTMaxV, 0), Thousands(e.InverterMaxDCV, 0))},
	}
	if len(s.Layouts) > 0 {
		l := s.Layouts[0]
		rows = append(rows, []string{"Chosen layout", fmt.Sprintf("%s: %d string(s) of %s modules, shade loss %s", l.Name, len(l.Strings), stringLengths(l.Strings), Pct(l.ShadeLossPct))})
	}
	d.SetFont(fontName, "", bodyPt)
	for _, r := range rows {
		d.SetFont(fontName, "B", 9)
		d.colour(Ink)
		yy := d.GetY()
		d.CellFormat(32, lineMM, r[0], "", 0, "L", false, 0, "")
		d.SetFont(fontName, "", 9)
		d.MultiCell(0, lineMM, r[1], "", "L", false)
		if d.GetY() < yy+lineMM {
			d.SetY(yy + lineMM)
		}
		d.Ln(1)
	}

	if len(s.Faces) > 0 {
		d.sub("Roof faces")
		var fr [][]string
		for _, f := range s.Faces {
			fr = append(fr, []string{f.ID, Thousands(f.PitchDeg, 0) + "°", Thousands(f.AspectDeg, 0) + "° " + compass(f.AspectDeg),
				Thousands(f.SlopedAreaM2, 1) + " m²", fmt.Sprint(f.Modules), Thousands(f.KWp, 2) + " kWp"})
		}
		d.table([]string{"Face", "Pitch", "Facing", "Area (sloped)", "Modules", "Power"}, fr,
			[]float64{0.14, 0.14, 0.2, 0.2, 0.14, 0.18}, "LRRRRR")
	}
	if len(s.Warnings) > 0 {
		d.sub("Please note")
		d.bullets(s.Warnings)
	}
}

// compass names the nearest of the 8 compass points of an azimuth.
func compass(az float64) string {
	names := []string{"N", "NE", "E", "SE", "S", "SW", "W", "NW"}
	return names[int(math.Mod(math.Round(az/45)+8, 8))]
}

func (pr *Proposal) shadeTable(d *pdfDoc) {
	s := pr.Summary
	idx := make([]int, len(s.ModuleResults))
	for i := range idx {
		idx[i] = i
	}
	// Most shaded first; ties keep the module order so the table is stable.
	for i := 1; i < len(idx); i++ {
		for j := i; j > 0 && s.ModuleResults[idx[j]].ShadeLossPct > s.ModuleResults[idx[j-1]].ShadeLossPct; j-- {
			idx[j], idx[j-1] = idx[j-1], idx[j]
		}
	}
	if len(idx) > 8 {
		idx = idx[:8]
	}
	var rows [][]string
	for _, i := range idx {
		m := s.ModuleResults[i]
		rows = append(rows, []string{m.ID, m.Face, Thousands(m.AnnualPOAkWhM2, 0), Pct(m.ShadeLossPct), Pct(m.BeamShadeLossPct), Pct(m.SkyViewPct)})
	}
	d.sub("Most shaded modules")
	d.table([]string{"Module", "Face", "Sunlight (kWh/m²/yr)", "Shade loss", "Direct-sun loss", "Sky seen"}, rows,
		[]float64{0.14, 0.1, 0.22, 0.16, 0.2, 0.18}, "LLRRRR")
}

func (pr *Proposal) assumptions(d *pdfDoc) {
	s := pr.Summary
	d.heading("Assumptions, uncertainty and safety", "")
	if s.Climate.Source == "indicative" {
		d.SetFont(fontName, "B", bodyPt)
		d.colour(Warn)
		d.MultiCell(0, lineMM, "INDICATIVE ONLY: no climate data was given; the figures in this proposal assume a cloudless year and over-state what the system will deliver.", "", "L", false)
		d.Ln(2)
	}
	d.sub("Data sources")
	d.bullets([]string{
		"Climate: " + climateText(s.Climate) + fmt.Sprintf(", %s kWh/m² per year on the horizontal.", Thousands(s.Climate.AnnualGHIkWhM2, 0)),
		"Roof, obstructions and trees: the surveyor's drawing of the site; heights as measured or estimated on site.",
		"Module and inverter: the data sheets as entered in the site file.",
	})
	d.sub("Models")
	d.bullets(s.Models)
	d.sub("Uncertainty of the estimate")
	lo, hi, basis := Uncertainty(s.Climate.Source)
	d.para(fmt.Sprintf("The annual AC energy of %s kWh is expected within ±%g to %g %%, that is between %s and %s kWh in a typical year. This rests on %s. A single year can fall outside this range; the shading rests on the drawing being right.",
		Thousands(s.AnnualACkWh, 0), lo, hi, Thousands(s.AnnualACkWh*(1-hi/100), 0), Thousands(s.AnnualACkWh*(1+hi/100), 0), basis))
	d.sub("Safety")
	d.bullets(s.Cautions)
}
