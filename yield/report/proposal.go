package report

import (
	"fmt"
	"math"
	"sort"
	"strings"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"sunstring/shading"
)

// The documents' file names: the proposal for the homeowner, the technical sheet for the
// installer and the surveyor's file.
const (
	ProposalFile  = "proposal.pdf"
	TechnicalFile = "technical-sheet.pdf"
)

// Proposal is everything the two documents show: the survey's summary, the equipment, the
// roof plan and the sun path of the most shaded connected module, and whom it is for.
type Proposal struct {
	Summary   *Summary
	Equipment Equipment
	Plan      *Plan
	// SunPath is the sun-path chart's input; nil leaves the chart out.
	SunPath *SunPath
	// Paper is "a4" (the default when empty) or "letter".
	Paper string
	Cover Cover
	// Date stamps the documents' metadata (the survey's date); zero: the cover's date, else
	// 1 January 2000.
	Date time.Time

	pdfCharts map[string][]byte // the charts as the documents place them, drawn once
}

// Equipment is the module and inverter as the site file gives them.
type Equipment struct {
	ModulePowerW           float64 // at STC
	ModuleLengthM          float64
	ModuleWidthM           float64
	CellsSeries            int  // as the datasheet counts them
	HalfCut                bool // two halves in parallel: CellsSeries/2 in series
	BypassDiodes           int
	Inverters              int     // identical inverters; zero means one
	InverterACW            float64 // each
	InverterInputs         int     // each
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

// fillPlan copies each plan module's face, sunlight and shade from the summary's module
// results, so that the drawings show summary.json's figures.
func (pr *Proposal) fillPlan() {
	if pr.Plan == nil {
		return
	}
	byID := map[string]ModuleResult{}
	for _, m := range pr.Summary.ModuleResults {
		byID[m.ID] = m
	}
	for i := range pr.Plan.Modules {
		m := &pr.Plan.Modules[i]
		r, ok := byID[m.ID]
		if !ok {
			continue
		}
		m.Face, m.SunKWhM2, m.ShadeLossPct = r.Face, r.AnnualPOAkWhM2, r.ShadeLossPct
		m.UnshadedKWhM2 = r.AnnualPOAkWhM2
		if r.ShadeLossPct < 100 {
			m.UnshadedKWhM2 = r.AnnualPOAkWhM2 / (1 - r.ShadeLossPct/100)
		}
	}
}

// Charts returns the report's charts in the order the documents show them. Charts whose
// input is missing (no modules, no layout, no sun path) are left out.
func (pr *Proposal) Charts() []Chart {
	pr.fillPlan()
	s := pr.Summary
	var cs []Chart
	wide := 16 * vg.Centimeter
	if pr.Plan != nil && len(pr.Plan.Modules) > 0 {
		w, h := planPictureW, planPictureH
		cs = append(cs, Chart{"plan", PlanChart(pr.Plan, w, h), w, h})
		if len(pr.Plan.Strings) > 0 {
			cs = append(cs, Chart{"strings", StringsChart(pr.Plan, w, h), w, h})
		}
	}
	if pr.SunPath != nil {
		cs = append(cs, Chart{"sunpath", SunPathChart(pr.SunPath), wide, 10 * vg.Centimeter})
	}
	note := ""
	if s.Climate.Source == "indicative" {
		note = "INDICATIVE: clear-sky year, no climate data"
	}
	cs = append(cs, Chart{"monthly", MonthlyChart(&s.MonthlyACkWh, &s.MonthlyUnshaded, note), wide, 8 * vg.Centimeter})
	if len(s.Losses) > 0 {
		h := vg.Length(math.Min(14, 3+0.55*float64(len(s.Losses)+len(GroupLosses(s.Losses))))) * vg.Centimeter
		cs = append(cs, Chart{"losses", LossChart(s.AnnualACkWh, s.Losses), wide, h})
	}
	if len(s.Layouts) > 0 {
		h := vg.Length(math.Min(16, 9+1.0*float64(len(s.Layouts)))) * vg.Centimeter
		cs = append(cs, Chart{"layouts", LayoutAdviceChart(s, pr.Plan), wide, h})
	}
	return cs
}

// connectedOn counts, per face id, the modules the chosen layout connects; without a
// layout every placed module counts.
func connectedOn(s *Summary) map[string]int {
	out := map[string]int{}
	for _, m := range s.ModuleResults {
		if m.String != "" || len(s.Layouts) == 0 {
			out[m.Face]++
		}
	}
	return out
}

// placed is the number of modules placed on the roof.
func placed(s *Summary) int {
	n := 0
	for _, f := range s.Faces {
		n += f.Modules
	}
	if n == 0 {
		n = len(s.ModuleResults)
	}
	return n
}

// ModulesText says how many modules are connected, and placed when that differs ("22
// modules", "26 connected of 45 placed").
func ModulesText(s *Summary) string {
	p := placed(s)
	if p == s.Modules || p == 0 {
		return Count(s.Modules, "module", "modules")
	}
	return fmt.Sprintf("%d connected of %d placed", s.Modules, p)
}

// sizeText is the system size's unit line: the modules, and with several inverters their
// number and AC power together.
func sizeText(s *Summary) string {
	if s.Inverters > 1 {
		return fmt.Sprintf("%s on %d inverters, %s kW AC", ModulesText(s), s.Inverters, Thousands(s.ACkW, 0))
	}
	return ModulesText(s)
}

// mostShaded returns the connected modules (all, without a layout), most shaded first;
// ties keep the module order.
func mostShaded(s *Summary) []ModuleResult {
	var ms []ModuleResult
	for _, m := range s.ModuleResults {
		if m.String != "" || len(s.Layouts) == 0 {
			ms = append(ms, m)
		}
	}
	sort.SliceStable(ms, func(i, j int) bool { return ms[i].ShadeLossPct > ms[j].ShadeLossPct })
	return ms
}

// ShadeSentence is the shade figure in one sentence, and its split in the same words as
// summary.json's shade parts and the breakdown's shade steps.
func ShadeSentence(s *Summary) string {
	if s.Shade == nil {
		if len(s.Layouts) > 0 {
			return fmt.Sprintf("Shade costs %s of the year's energy.", Pct(s.Layouts[0].ShadeLossPct))
		}
		return ""
	}
	sh := s.Shade
	t := fmt.Sprintf("Shade costs %s of the year's energy (%s kWh)", Pct(sh.LostPct), Thousands(sh.LostKWh, 0))
	var parts []string
	for _, p := range sh.Parts {
		parts = append(parts, fmt.Sprintf("%s %s", Pct(p.Pct), p.Cause))
	}
	if len(parts) > 0 {
		t += ": " + strings.Join(parts, ", ")
	}
	return t + "."
}

// PDF renders the proposal for the homeowner: the key figures, the plan and the monthly
// yield on the first page, then the months and the shade, the wiring, and what the
// estimate rests on with the cautions. The same proposal gives the same bytes.
func (pr *Proposal) PDF() ([]byte, error) {
	d, err := pr.newDoc("Solar PV proposal")
	if err != nil {
		return nil, err
	}
	charts, err := pr.renderCharts()
	if err != nil {
		return nil, err
	}
	s := pr.Summary
	pr.cover(d, "SOLAR PV PROPOSAL")
	shade := "–"
	shadeUnit := "of the year's energy"
	switch {
	case s.Shade != nil:
		shade = Pct(s.Shade.LostPct)
		shadeUnit = Thousands(s.Shade.LostKWh, 0) + " kWh a year"
	case len(s.Layouts) > 0:
		shade = Pct(s.Layouts[0].ShadeLossPct)
	}
	d.figures([]figure{
		{"Energy a year", Thousands(s.AnnualACkWh, 0), "kWh of AC"},
		{"System size", Thousands(s.DCkWp, 2) + " kWp", sizeText(s)},
		{"Per kWp", Thousands(s.SpecificYield, 0), "kWh a year per kWp"},
		{"Shade costs", shade, shadeUnit},
	})
	lo, hi, _ := Uncertainty(s.Climate.Source)
	d.small(fmt.Sprintf("In a typical year the system should give between %s and %s kWh (±%g to %g %%, see the last page).",
		Thousands(s.AnnualACkWh*(1-hi/100), 0), Thousands(s.AnnualACkWh*(1+hi/100), 0), lo, hi))
	d.Ln(1)
	if charts["plan"] != nil {
		d.image("plan", charts["plan"], 0.86)
	}
	d.image("monthly", charts["monthly"], 0.86)

	pr.monthsAndShade(d, charts)
	pr.wiring(d, charts)
	pr.plainAssumptions(d)
	return d.finish()
}

// monthsAndShade is the homeowner's page on the months and on where the shade comes from.
func (pr *Proposal) monthsAndShade(d *pdfDoc, charts map[string][]byte) {
	s := pr.Summary
	d.heading("Your energy month by month", "What the system should deliver each month, beside what the same modules would give if nothing cast a shadow on them.")
	var rows [][]string
	var tot, totU float64
	for i := range 12 {
		a, u := s.MonthlyACkWh[i], s.MonthlyUnshaded[i]
		tot += a
		totU += u
		rows = append(rows, []string{MonthNames[i], Thousands(a, 0), Thousands(u, 0), lossPct(a, u)})
	}
	rows = append(rows, []string{tableHead + "Year", Thousands(s.AnnualACkWh, 0), Thousands(totU*s.AnnualACkWh/math.Max(tot, 1e-9), 0), lossPct(tot, totU)})
	d.table([]string{"Month", "Energy (kWh)", "Without shade (kWh)", "Lost to shade"}, rows, []float64{0.25, 0.25, 0.25, 0.25}, "LRRR")

	d.section("Where the shade comes from", "")
	if t := ShadeSentence(s); t != "" {
		d.para(t)
	}
	ms := mostShaded(s)
	if len(ms) > 0 && ms[0].ShadeLossPct >= 0.5 {
		var worst []string
		for _, m := range ms[:min(3, len(ms))] {
			worst = append(worst, fmt.Sprintf("%s (%s of its light)", m.ID, Pct(m.ShadeLossPct)))
		}
		where := "; the module ids are written on the roof plan."
		if pr.Plan != nil && !modulesLabelled(pr.Plan, planPictureW, planPictureH) {
			// Modules drawn too small for their ids: the plan numbers rows and columns.
			where = "; their ids read face.row.column, and the roof plan numbers the rows beside each face and the columns below it."
		}
		d.para("The modules that lose most are " + strings.Join(worst, ", ") + where)
	}
	if charts["sunpath"] != nil {
		sp := pr.SunPath
		d.para(fmt.Sprintf("The picture shows the sky as seen from module %s: the sun's track on the 21st of each month, and in grey what stands in the way, named where the names fit. Where a track runs through grey, that module is in shade at that time of day and year.%s",
			sp.Module, obstaclesText(sp)))
		d.image("sunpath", charts["sunpath"], 0.92)
	}
}

// obstaclesText names what shades the module of the sun-path chart, kind by kind in the
// order and words of the chart's legend, roof faces included (a higher roof or a neighbouring
// face is as much in the sun's way as a chimney), each with its highest point seen from the
// module; then what rises above the module's horizon without ever standing in the sun's way.
// Without the shading's word on what blocks (Shaders nil) it names what rises above the
// horizon, roof faces left out, since the module's own face rises behind it.
func obstaclesText(sp *SunPath) string {
	peak := map[[2]string]float64{}
	for _, o := range sp.Outlines {
		p := 0.0
		for _, e := range o.ElevationDeg {
			p = math.Max(p, e)
		}
		peak[[2]string{o.Kind, o.ID}] = p
	}
	up := func(kind, id string) string {
		if p := peak[[2]string{kind, id}]; p >= 1 {
			return fmt.Sprintf(" (up to %s°)", Thousands(p, 0))
		}
		return ""
	}
	if sp.Shaders == nil {
		return risingText(sp, peak, up)
	}
	var groups []string
	shades := map[[2]string]bool{}
	for _, kind := range obstacleOrder {
		var bs []shading.Blocker
		for _, b := range sp.Shaders {
			if b.Kind == kind {
				bs = append(bs, b)
				shades[[2]string{b.Kind, b.ID}] = true
			}
		}
		if len(bs) == 0 {
			continue
		}
		sort.SliceStable(bs, func(i, j int) bool {
			return peak[[2]string{kind, bs[i].ID}] > peak[[2]string{kind, bs[j].ID}]
		})
		label := strings.ToUpper(obstacleName[kind][:1]) + obstacleName[kind][1:]
		if kind == "horizon" {
			if p := peak[[2]string{kind, ""}]; p >= 1 {
				label += fmt.Sprintf(": up to %s°", Thousands(p, 0))
			}
			groups = append(groups, label)
			continue
		}
		var ids []string
		for _, b := range bs {
			ids = append(ids, Printable(b.ID)+up(kind, b.ID))
		}
		groups = append(groups, label+": "+strings.Join(ids, ", "))
	}
	var out string
	if len(groups) > 0 {
		out = " What shades it during the year, kind by kind as in the legend. " + strings.Join(groups, ". ") + "."
	}
	var idle []string
	for _, o := range sp.Outlines {
		if o.Kind == "face" || o.Kind == "horizon" || shades[[2]string{o.Kind, o.ID}] {
			continue
		}
		if u := up(o.Kind, o.ID); u != "" {
			idle = append(idle, Printable(o.ID)+u)
		}
	}
	if len(idle) > 0 {
		out += " Above its horizon but never in the sun's way: " + strings.Join(idle, ", ") + "."
	}
	return out
}

// risingText is obstaclesText without the shading's word: what rises above the horizon,
// highest first, roof faces left out.
func risingText(sp *SunPath, peak map[[2]string]float64, up func(kind, id string) string) string {
	type ob struct {
		id   string
		peak float64
	}
	var obs []ob
	for _, o := range sp.Outlines {
		if p := peak[[2]string{o.Kind, o.ID}]; p >= 1 && o.Kind != "face" {
			obs = append(obs, ob{o.ID, p})
		}
	}
	if len(obs) == 0 {
		return ""
	}
	sort.SliceStable(obs, func(i, j int) bool { return obs[i].peak > obs[j].peak })
	var ts []string
	for _, o := range obs {
		name := o.id
		if name == "" {
			name = "the far horizon"
		}
		ts = append(ts, fmt.Sprintf("%s (up to %s°)", name, Thousands(o.peak, 0)))
	}
	return " Seen from there: " + strings.Join(ts, ", ") + "."
}

// wiring is the homeowner's page with the chosen wiring in one picture.
func (pr *Proposal) wiring(d *pdfDoc, charts map[string][]byte) {
	s := pr.Summary
	if len(s.Layouts) == 0 {
		return
	}
	l := s.Layouts[0]
	d.heading("How the modules are wired", fmt.Sprintf("The modules are joined in %s: each colour is one string, numbered in the order the cable runs.%s",
		Count(len(l.Strings), "string", "strings"), stringsText(l, s.Inverters)))
	// The paragraphs under the chart, written first so that the chart leaves them room.
	var under []string
	switch {
	case s.LayoutAdvice != nil && s.LayoutAdvice.Reason != "":
		under = append(under, "Why this wiring: "+s.LayoutAdvice.Reason)
	case len(s.Layouts) > 1:
		under = append(under, fmt.Sprintf("Of the %d wirings compared this one gives the most energy, %s kWh a year more than the next.", len(s.Layouts),
			Thousands(s.Layouts[1].BehindBestKWh, 0)))
	}
	// Module-level converters in one sentence: on every module, and on the few that need
	// them when the survey evaluated that too.
	var conv []string
	for _, a := range s.Alternatives {
		if len(a.ConvertersOn) == 0 && !strings.Contains(a.Name, "converter") {
			continue
		}
		on := "each module"
		if n := len(a.ConvertersOn); n > 0 && n < s.Modules {
			on = fmt.Sprintf("only the %s that shade holds back most", Count(n, "module", "modules"))
		}
		conv = append(conv, fmt.Sprintf("behind %s, %s kWh a year", on, signed(a.DifferenceKWh)))
	}
	if len(conv) > 0 {
		under = append(under, "Small electronic converters on the modules would change the year's energy: "+strings.Join(conv, "; ")+
			". The installer's technical sheet compares these and the other options.")
	}
	if charts["strings"] != nil {
		below := 0.0
		for _, p := range under {
			below += d.paraHeight(p)
		}
		d.imageAbove("strings", charts["strings"], 0.92, below)
	}
	for _, p := range under {
		d.para(p)
	}
}

// stringsText lists the strings of a layout in plain words.
func stringsText(l Layout, inverters int) string {
	var parts []string
	for i, st := range l.Strings {
		in := ""
		if i < len(l.Inputs) && inverters > 1 {
			in = fmt.Sprintf(" on inverter %d, input %d", inverterOf(l, i), l.Inputs[i])
		} else if i < len(l.Inputs) {
			in = fmt.Sprintf(" on inverter input %d", l.Inputs[i])
		}
		parts = append(parts, fmt.Sprintf("string %d has %s%s", i+1, Count(len(st), "module", "modules"), in))
	}
	if len(parts) == 0 {
		return ""
	}
	return " " + strings.ToUpper(parts[0][:1]) + strings.Join(parts, "; ")[1:] + "."
}

// signed prints an energy difference with its sign.
func signed(kwh float64) string {
	t := Thousands(kwh, 0)
	if kwh > 0 && t != "0" {
		t = "+" + t
	}
	return t
}

// plainAssumptions is the homeowner's last page: what the estimate rests on, how sure it
// is, the notes and the cautions, once.
func (pr *Proposal) plainAssumptions(d *pdfDoc) {
	s := pr.Summary
	d.heading("What this estimate rests on", "")
	if s.Climate.Source == "indicative" {
		d.indicative("the figures in this proposal")
	}
	d.bullets([]string{
		"The weather: " + climateText(s.Climate) + fmt.Sprintf(", %s kWh of sunlight per m² a year on flat ground.", Thousands(s.Climate.AnnualGHIkWhM2, 0)),
		"Your roof and what stands around it: as drawn and measured by the surveyor; the shade is only as right as that drawing.",
		"The modules and the inverter: as their data sheets give them.",
		"Dirt on the modules, cable losses and the inverter's downtime: usual allowances, listed in the technical sheet.",
	})
	if len(s.Overrides) > 0 {
		var set []string
		for _, o := range s.Overrides {
			set = append(set, fmt.Sprintf("%s = %s (%s)", o.Key, o.Value, o.Source))
		}
		d.bullets([]string{"Settings given outside the site file, which this estimate used: " + strings.Join(set, "; ") + "."})
	}
	d.sub("How sure the figure is")
	lo, hi, basis := Uncertainty(s.Climate.Source)
	d.para(fmt.Sprintf("The yearly energy of %s kWh is expected within ±%g to %g %%: between %s and %s kWh in a typical year. The figure rests on %s. A single year can fall outside this range.",
		Thousands(s.AnnualACkWh, 0), lo, hi, Thousands(s.AnnualACkWh*(1-hi/100), 0), Thousands(s.AnnualACkWh*(1+hi/100), 0), basis))
	// The warnings are the surveyor's to-dos, worded for the site file and the map (keys,
	// feature ids, what to measure): the homeowner learns that they exist, the installer's
	// sheet lists them.
	if len(s.Warnings) > 0 {
		d.sub("Please note")
		d.para(fmt.Sprintf("The surveyor has %s on this estimate, listed in the installer's technical sheet; the figures may change once they are settled.",
			Count(len(s.Warnings), "open point", "open points")))
	}
	d.sub("Safety")
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

// compass names the nearest of the 8 compass points of an azimuth.
func compass(az float64) string {
	names := []string{"N", "NE", "E", "SE", "S", "SW", "W", "NW"}
	return names[int(math.Mod(math.Round(az/45)+8, 8))]
}
