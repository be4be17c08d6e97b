package report

import (
	"fmt"
	"strings"
)

// TechnicalPDF renders the technical sheet for the installer and the surveyor's file: the
// system, the string voltage and current checks with leakage, the drawings with every id,
// the layouts compared, the alternatives, the loss breakdown in full, the shade, and the
// models with their published sources. The same proposal gives the same bytes.
func (pr *Proposal) TechnicalPDF() ([]byte, error) {
	d, err := pr.newDoc("Technical sheet")
	if err != nil {
		return nil, err
	}
	charts, err := pr.renderCharts()
	if err != nil {
		return nil, err
	}
	pr.cover(d, "TECHNICAL SHEET")
	pr.system(d)
	pr.checks(d)
	if charts["plan"] != nil {
		labels := "the drawings write row.column on each module and the face's id beside it."
		if !modulesLabelled(pr.Plan, planPictureW, planPictureH) {
			labels = "the modules are drawn too small for their row.column, so the drawings number the rows beside each face and the columns below it, and write the face's id beside it."
		}
		d.heading("Roof plan and strings", "Module ids are <face>.<row>.<column>: row 1 at the eave, column 1 at the left seen from below the eave; "+labels+" The first drawing colours each module by the sunlight it gets in a year, with the share lost to shade; the second shows the chosen strings in wiring order. Chimneys, trees and other objects are named beside them where the names fit, else numbered, the legend naming each number.")
		// Both drawings on one page.
		d.image("plan", charts["plan"], 0.74)
		if charts["strings"] != nil {
			d.image("strings", charts["strings"], 0.74)
		}
	}
	pr.layouts(d, charts)
	pr.alternatives(d)
	pr.losses(d, charts)
	pr.shade(d, charts)
	pr.models(d)
	return d.finish()
}

// system is the sheet's table of the site and the equipment.
func (pr *Proposal) system(d *pdfDoc) {
	s := pr.Summary
	e := pr.Equipment
	d.sub("Site and system")
	rows := [][2]string{
		{"Location", latLon(s.Site.Latitude, s.Site.Longitude) + ", time zone " + s.Site.Timezone},
		{"Climate", fmt.Sprintf("%s; %s kWh/m² global horizontal irradiation per year", climateText(s.Climate), Thousands(s.Climate.AnnualGHIkWhM2, 0))},
		{"Modules", fmt.Sprintf("%s × %s W (%s kWp), %s m × %s m, %s, %s", ModulesText(s), Thousands(e.ModulePowerW, 0),
			Thousands(s.DCkWp, 2), Thousands(e.ModuleLengthM, 2), Thousands(e.ModuleWidthM, 2), cellsText(e), Count(e.BypassDiodes, "bypass diode", "bypass diodes"))},
		{"Inverter", inverterText(e)},
		{"Yield", fmt.Sprintf("%s kWh AC a year; specific yield %s kWh/kWp; performance ratio %s (IEC 61724-1, over the connected modules)",
			Thousands(s.AnnualACkWh, 0), Thousands(s.SpecificYield, 0), Thousands(s.PerformanceRatio, 2))},
	}
	if len(s.Layouts) > 0 {
		l := s.Layouts[0]
		rows = append(rows, [2]string{"Chosen layout", fmt.Sprintf("%s: %s of %s modules", l.Name, Count(len(l.Strings), "string", "strings"), stringLengths(l.Strings))})
	}
	d.keyValues(rows)
	if len(s.Faces) > 0 {
		on := connectedOn(s)
		var fr [][]string
		for _, f := range s.Faces {
			fr = append(fr, []string{f.ID, Thousands(f.PitchDeg, 0) + "°", Thousands(f.AspectDeg, 0) + "° " + compass(f.AspectDeg),
				Thousands(f.SlopedAreaM2, 1) + " m²", Thousands(f.AnnualPOAkWhM2, 0), fmt.Sprint(f.Modules), fmt.Sprint(on[f.ID]), Thousands(f.KWp, 2) + " kWp"})
		}
		d.table([]string{"Face", "Pitch", "Facing", "Area (sloped)", "kWh/m² a year", "Placed", "Connected", "Placed power"}, fr,
			[]float64{0.09, 0.09, 0.13, 0.14, 0.15, 0.1, 0.13, 0.17}, "LRRRRRRR")
	}
	if len(s.Warnings) > 0 {
		d.sub("Please note")
		d.bullets(Lines(s.Warnings))
	}
}

// checks lists the string voltage and current checks and the leakage estimate, then the
// cautions (once in this document).
func (pr *Proposal) checks(d *pdfDoc) {
	s := pr.Summary
	d.heading("String checks", "The chosen layout's strings against the inverter's and the module's limits at the coldest and hottest temperatures given for the site, and the leakage estimate. These are checks for planning; the installer designs the wiring to local codes.")
	if len(s.Checks) > 0 {
		// A list, not a table: each check is a sentence with its own numbers and limit.
		var items []string
		for _, c := range s.Checks {
			sev := ""
			if c.Severity != "info" {
				sev = strings.ToUpper(c.Severity) + ": "
			}
			item := fmt.Sprintf("%s%s: %s", sev, c.Subject, strings.TrimSuffix(c.Message, "."))
			if c.Detail != "" {
				// The installer-facing detail: where the limit comes from, what is assumed.
				item += ". " + strings.TrimSuffix(c.Detail, ".")
			}
			items = append(items, item)
		}
		d.bullets(items)
	} else {
		d.para("No electrical checks were made for this report.")
	}
	d.sub("Cautions")
	d.bullets(s.Cautions)
}

// layouts compares the ranked layouts.
func (pr *Proposal) layouts(d *pdfDoc, charts map[string][]byte) {
	s := pr.Summary
	if len(s.Layouts) == 0 {
		return
	}
	d.heading("String layouts compared", "The string layouts evaluated on this roof, best first. Every layout uses the same modules and the same year; they differ in how shade on one module holds back the others in its string.")
	if charts["layouts"] != nil {
		d.image("layouts", charts["layouts"], 1)
	}
	eq := s.EquivalenceMarginPct > 0
	var rows [][]string
	for i, l := range s.Layouts {
		r := []string{fmt.Sprint(i + 1), l.Name, stringLengths(l.Strings), Thousands(l.AnnualACkWh, 0), Pct(l.ShadeLossPct), Thousands(l.BehindBestKWh, 0), Thousands(l.CableM, 1)}
		if eq {
			r = append(r, yesNo(l.EquivalentToBest))
		}
		rows = append(rows, r)
	}
	head := []string{"Rank", "Layout", "Modules per string", "AC (kWh)", "Shade loss", "Behind (kWh)", "Cable (m)"}
	widths := []float64{0.07, 0.3, 0.17, 0.12, 0.12, 0.12, 0.1}
	align := "RLLRRRR"
	if eq {
		head = append(head, "Equivalent")
		widths = []float64{0.06, 0.26, 0.15, 0.1, 0.1, 0.12, 0.09, 0.12}
		align += "L"
	}
	d.table(head, rows, widths, align)
	d.small("Shade loss: the share of the layout's year without shade that it loses with shade, electrical effects included. Behind: kWh a year behind the best layout. Cable: extra string cable beyond what neighbouring modules' leads reach.")
	if eq {
		d.small(fmt.Sprintf("Equivalent: within %s of the best layout's energy, closer than the model tells layouts apart.", Pct(s.EquivalenceMarginPct)))
	}
	if a := s.LayoutAdvice; a != nil {
		d.sub("Advice")
		t := a.Reason
		if a.Chosen != "" {
			t = fmt.Sprintf("Wire %q. %s", a.Chosen, a.Reason)
		}
		d.para(t)
	}
	for i, l := range s.Layouts {
		if l.Note != "" {
			d.small(fmt.Sprintf("%d. %s: %s", i+1, l.Name, sentence(l.Note)))
		}
		d.small(fmt.Sprintf("   strings: %s", stringsIDs(l, s.Inverters)))
	}
}

// stringsIDs lists a layout's strings as module ids with their inputs (and inverters, when
// there are several).
func stringsIDs(l Layout, inverters int) string {
	var parts []string
	for i, st := range l.Strings {
		in := ""
		if i < len(l.Inputs) {
			in = fmt.Sprintf(" (%s)", InputLabel(inverters, inverterOf(l, i), l.Inputs[i]))
		}
		parts = append(parts, fmt.Sprintf("%d%s: %s", i+1, in, strings.Join(st, " ")))
	}
	return strings.Join(parts, "; ")
}

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

// sentence ends s with one full stop.
func sentence(s string) string {
	s = strings.TrimSpace(s)
	for strings.HasSuffix(s, ".") {
		s = strings.TrimSuffix(s, ".")
	}
	return s + "."
}

// alternatives runs the chosen strings another way: the tracker and module-level
// electronics.
func (pr *Proposal) alternatives(d *pdfDoc) {
	s := pr.Summary
	if len(s.Alternatives) == 0 {
		return
	}
	d.sub("The chosen strings run another way")
	var rows [][]string
	for _, a := range s.Alternatives {
		rows = append(rows, []string{a.Name, Thousands(a.AnnualACkWh, 0), signed(a.DifferenceKWh)})
	}
	d.table([]string{"Alternative", "AC energy (kWh)", "Against the estimate (kWh)"}, rows, []float64{0.5, 0.25, 0.25}, "LRR")
	for _, a := range s.Alternatives {
		t := a.Name + ": " + sentence(a.Note)
		// Which modules get one, unless it is all of them or the note already names them.
		if n := len(a.ConvertersOn); n > 0 && n < s.Modules && !strings.Contains(a.Note, a.ConvertersOn[0]) {
			t += fmt.Sprintf(" Converters on %s: %s.", Count(n, "module", "modules"), strings.Join(a.ConvertersOn, ", "))
		}
		d.small(t)
	}
}

// losses is the breakdown in full, by group.
func (pr *Proposal) losses(d *pdfDoc, charts map[string][]byte) {
	s := pr.Summary
	if len(s.Losses) == 0 {
		return
	}
	d.heading("Loss breakdown", "From the energy the connected modules would make at their rated (STC) efficiency in the sunlight that reaches their plane without shade, to the AC energy delivered, grouped by where the energy goes. Each step's percentage is of the energy reaching that step; the steps marked \"shade:\" are the three parts of the shade loss.")
	if charts["losses"] != nil {
		d.image("losses", charts["losses"], 1)
	}
	start := StartKWh(s.AnnualACkWh, s.Losses)
	rows := [][]string{{tableHead + "at rated efficiency, without shade", Thousands(start, 0), "", ""}}
	for _, g := range GroupLosses(s.Losses) {
		gp := 0.0
		if start > 0 {
			gp = 100 * g.KWh / start
		}
		rows = append(rows, []string{tableHead + capital(g.Name), "−" + Thousands(g.KWh, 0), "", Pct(gp)})
		for _, l := range g.Steps {
			lost := Thousands(l.KWh, 0)
			if lost != "0" && !strings.HasPrefix(lost, "-") {
				lost = "−" + lost
			}
			rows = append(rows, []string{"   " + l.Step, lost, Pct(l.Pct), ""})
		}
	}
	rows = append(rows, []string{tableHead + "AC energy delivered", Thousands(s.AnnualACkWh, 0), "", Pct(100 * s.AnnualACkWh / max(start, 1e-9))})
	d.table([]string{"Step", "kWh a year", "% of what reaches it", "% of the start"}, rows, []float64{0.52, 0.14, 0.19, 0.15}, "LRRR")
	if t := ShadeSentence(s); t != "" {
		d.small(t + " The split apportions the AC energy lost to shade (the same strings without shade, less with it) to the three shade steps above.")
	}
}

func capital(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// shade is the sheet's page on the shade: the split, the sun path and the most shaded
// modules.
func (pr *Proposal) shade(d *pdfDoc, charts map[string][]byte) {
	s := pr.Summary
	d.heading("Shade", ShadeSentence(s))
	if charts["sunpath"] != nil {
		sp := pr.SunPath
		d.para(fmt.Sprintf("Sun path on the 21st of each month seen from module %s, the most shaded connected module; grey areas are what stands above the horizon from there, named.%s", sp.Module, obstaclesText(sp)))
		d.image("sunpath", charts["sunpath"], 1)
	}
	ms := mostShaded(s)
	if len(ms) > 10 {
		ms = ms[:10]
	}
	var rows [][]string
	for _, m := range ms {
		rows = append(rows, []string{m.ID, m.String, Thousands(m.AnnualPOAkWhM2, 0), Pct(m.ShadeLossPct), Pct(m.BeamShadeLossPct), Pct(m.SkyViewPct)})
	}
	d.sub("Most shaded connected modules")
	d.table([]string{"Module", "String", "Irradiation (kWh/m²)", "Light lost", "Direct sun lost", "Sky seen"}, rows,
		[]float64{0.13, 0.1, 0.21, 0.16, 0.2, 0.2}, "LLRRRR")
	d.small("Light lost: the share of the module's plane-of-array irradiation (direct, sky and ground) that shade takes. Direct sun lost: the share of the direct beam alone. Sky seen: the share of the sky dome the module sees. The energy a module loses can exceed its light lost: a partly shaded module's bypass diodes and its string's current pass the loss on.")
}

// models lists the models with their published names and sources, the data and the
// uncertainty.
func (pr *Proposal) models(d *pdfDoc) {
	s := pr.Summary
	d.heading("Models, data and uncertainty", "")
	if s.Climate.Source == "indicative" {
		d.indicative("the figures")
	}
	d.sub("Models")
	d.bullets(s.Models)
	d.sub("Data")
	d.bullets([]string{
		"Climate: " + climateText(s.Climate) + fmt.Sprintf(", %s kWh/m² per year on the horizontal.", Thousands(s.Climate.AnnualGHIkWhM2, 0)),
		"Roof, obstructions and trees: the surveyor's drawing of the site; heights as measured or estimated on site.",
		"Module and inverter: the data sheets as entered in the site file.",
	})
	d.sub("Uncertainty")
	lo, hi, basis := Uncertainty(s.Climate.Source)
	d.para(fmt.Sprintf("The annual AC energy of %s kWh is expected within ±%g to %g %%, between %s and %s kWh in a typical year. This rests on %s. The shading rests on the drawing being right.",
		Thousands(s.AnnualACkWh, 0), lo, hi, Thousands(s.AnnualACkWh*(1-hi/100), 0), Thousands(s.AnnualACkWh*(1+hi/100), 0), basis))
}

// indicative prints the warning that the figures rest on a cloudless year, naming which
// figures (the document's words).
func (d *pdfDoc) indicative(figures string) {
	d.SetFont(fontName, "B", bodyPt)
	d.colour(Warn)
	d.multi(lineMM, "INDICATIVE ONLY: no climate data was given; "+figures+" assume a cloudless year and over-state what the system will deliver.", false)
	d.Ln(2)
}

// inverterOf returns the inverter (1-based) of string i of l: the first when l does not say.
func inverterOf(l Layout, i int) int {
	if i < len(l.Inverters) {
		return l.Inverters[i]
	}
	return 1
}

// inverterText describes the inverter, or the inverters and their AC power together.
func inverterText(e Equipment) string {
	t := fmt.Sprintf("%s W AC, %s, %s to %s V MPPT window, %s V DC maximum", Thousands(e.InverterACW, 0), Count(e.InverterInputs, "MPPT input", "MPPT inputs"),
		Thousands(e.MPPTMinV, 0), Thousands(e.MPPTMaxV, 0), Thousands(e.InverterMaxDCV, 0))
	if e.Inverters > 1 {
		t = fmt.Sprintf("%d inverters, %s W AC together; each %s", e.Inverters, Thousands(float64(e.Inverters)*e.InverterACW, 0), t)
	}
	return t
}
