package report

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"

	"sunstring/yield/finding"
)

// Summary is the summary.json document. Field names and meanings are the contract stated in
// README.md (Outputs, summary.json).
type Summary struct {
	Site    SiteInfo `json:"site"`
	Modules int      `json:"modules"`
	DCkWp   float64  `json:"dc_kwp"`
	// Inverters is how many inverters share the modules; ACkW their AC power together.
	Inverters        int         `json:"inverters"`
	ACkW             float64     `json:"ac_kw"`
	Climate          ClimateInfo `json:"climate"`
	AnnualACkWh      float64     `json:"annual_ac_kwh"`
	SpecificYield    float64     `json:"specific_yield_kwh_per_kwp"`
	PerformanceRatio float64     `json:"performance_ratio"`
	MonthlyACkWh     [12]float64 `json:"monthly_ac_kwh"`
	MonthlyUnshaded  [12]float64 `json:"monthly_ac_unshaded_kwh"`
	Losses           []Loss      `json:"losses"`
	// LossesStartKWh is where the loss breakdown starts: the layout's modules' unshaded
	// plane-of-array irradiation at their STC efficiency. It less every loss is AnnualACkWh.
	LossesStartKWh float64 `json:"losses_start_kwh"`
	// Shade is the share of the year's energy lost to shade and how it divides; absent
	// when no layout was evaluated.
	Shade   *ShadeSplit `json:"shade,omitempty"`
	Layouts []Layout    `json:"layouts"`
	// EquivalenceMarginPct is the margin within which a layout's annual energy counts as
	// equal to the best's; LayoutAdvice says which layout to wire and why. Both are absent
	// when the survey gives no advice.
	EquivalenceMarginPct float64        `json:"equivalence_margin_pct,omitempty"`
	LayoutAdvice         *LayoutAdvice  `json:"layout_advice,omitempty"`
	Alternatives         []Alternative  `json:"alternatives"`
	ModuleResults        []ModuleResult `json:"module_results"`
	Faces                []Face         `json:"faces"`
	Checks               []Check        `json:"checks"`
	// Warnings must be read before the proposal goes out; Notes are for the record. Each has
	// its severity, a stable code, where (file and feature or key) and what to do.
	Warnings []finding.Finding `json:"warnings"`
	Notes    []finding.Finding `json:"notes"`
	// Overrides are the settings that came from an environment variable or a flag instead
	// of the site file.
	Overrides []Override `json:"overrides"`
	Cautions  []string   `json:"cautions"`
	Models    []string   `json:"models"`

	// Surroundings lists the obstacles imported from the site file's surroundings files, each
	// with its source; absent without such files.
	Surroundings []Surrounding `json:"surroundings,omitempty"`
}

// SiteInfo names the site.
type SiteInfo struct {
	Name      string  `json:"name"`
	Latitude  float64 `json:"latitude"`
	Longitude float64 `json:"longitude"`
	Timezone  string  `json:"timezone"`
}

// ClimateInfo says which climate was used.
type ClimateInfo struct {
	Source         string  `json:"source"` // file | monthly | indicative
	AnnualGHIkWhM2 float64 `json:"annual_ghi_kwh_m2"`
	File           string  `json:"file,omitempty"`
}

// Loss is one step of the loss breakdown from plane-of-array irradiation to AC energy.
type Loss struct {
	Group string  `json:"group"` // where the energy goes: light reaching the modules, …
	Step  string  `json:"step"`
	KWh   float64 `json:"kwh"` // energy lost at this step (the first row: the starting amount)
	Pct   float64 `json:"pct"` // of the energy entering this step
}

// ShadeSplit is the share of the year's energy lost to shade (the chosen layout's AC
// energy against the same strings without shade) and, in Parts, how it divides: less light
// on the modules, shaded modules holding back their strings, bypass diodes in partly shaded
// modules. The parts add up to the whole.
type ShadeSplit struct {
	LostKWh float64     `json:"lost_kwh"`
	LostPct float64     `json:"lost_pct"` // of the year's energy without shade
	Parts   []ShadePart `json:"parts"`
}

// ShadePart is one cause of the shade loss: AC energy a year and percentage points of the
// year's energy without shade.
type ShadePart struct {
	Cause string  `json:"cause"`
	KWh   float64 `json:"kwh"`
	Pct   float64 `json:"pct"`
}

// LayoutAdvice is the layout to wire, in plain words.
type LayoutAdvice struct {
	// Chosen is the layout to wire: among those equivalent to the best, the one with the
	// fewest face crossings, then the least extra cable.
	Chosen string `json:"chosen"`
	// Reason says in plain words why, for a homeowner.
	Reason string `json:"reason"`
	// Equivalent names every layout equivalent to the best (the best included).
	Equivalent []string `json:"equivalent"`
	// Hardware says whether module-level converters or another inverter input would pay.
	Hardware string `json:"hardware,omitempty"`
	// LayoutsEvaluated is how many distinct layouts the search evaluated over the whole year;
	// LayoutsScreened how many it screened on every fourth step of the year to choose them;
	// SearchExhaustive whether every layout the inverter allows was evaluated.
	LayoutsEvaluated int  `json:"layouts_evaluated"`
	LayoutsScreened  int  `json:"layouts_screened"`
	SearchExhaustive bool `json:"search_exhaustive"`
}

// Layout is one ranked string layout.
type Layout struct {
	Name          string     `json:"name"`
	AnnualACkWh   float64    `json:"annual_ac_kwh"`
	ShadeLossPct  float64    `json:"shade_loss_pct"`
	BehindBestKWh float64    `json:"behind_best_kwh"`
	CableM        float64    `json:"cable_m"`
	Strings       [][]string `json:"strings"`
	Inputs        []int      `json:"inputs"` // inverter input (1-based) of each string
	// Inverters is the inverter (1-based) of each string: Inputs count each inverter's own.
	Inverters []int  `json:"inverters"`
	Note      string `json:"note,omitempty"`
	// EquivalentToBest reports whether the layout's energy lies within the equivalence
	// margin of the best's.
	EquivalentToBest bool `json:"equivalent_to_best"`
	// FaceCrossings counts the hops between two roof faces along the layout's strings.
	FaceCrossings int `json:"face_crossings"`
}

// Alternative is the best layout run another way, for comparison: a plain hill-climbing
// tracker instead of a global one, or a converter on every module.
type Alternative struct {
	Name          string  `json:"name"`
	AnnualACkWh   float64 `json:"annual_ac_kwh"`
	DifferenceKWh float64 `json:"difference_kwh"` // against the reported estimate
	Note          string  `json:"note"`
	// ConvertersOn lists the modules that get a module-level converter, when the
	// alternative uses them.
	ConvertersOn []string `json:"converters_on,omitempty"`
}

// ModuleResult is one module's annual irradiation and shade.
type ModuleResult struct {
	ID               string  `json:"id"`
	Face             string  `json:"face"`
	AnnualPOAkWhM2   float64 `json:"annual_poa_kwh_m2"`
	ShadeLossPct     float64 `json:"shade_loss_pct"`
	BeamShadeLossPct float64 `json:"beam_shade_loss_pct"`
	SolarAccessPct   float64 `json:"solar_access_pct"`
	SkyViewPct       float64 `json:"sky_view_pct"`
	String           string  `json:"string,omitempty"`
	// Inverter is the inverter (1-based) of String; absent when unconnected.
	Inverter int `json:"inverter,omitempty"`
}

// Face is one roof face's summary.
type Face struct {
	ID           string  `json:"id"`
	PitchDeg     float64 `json:"pitch_deg"`
	AspectDeg    float64 `json:"aspect_deg"`
	PlanAreaM2   float64 `json:"plan_area_m2"`
	SlopedAreaM2 float64 `json:"sloped_area_m2"`
	Modules      int     `json:"modules"`
	KWp          float64 `json:"kwp"`
	// AnnualPOAkWhM2 is the face's annual irradiation without shade, kWh/m², so that a poor
	// face shows as one next to the best.
	AnnualPOAkWhM2 float64 `json:"annual_poa_kwh_m2"`
}

// Surrounding is one imported obstacle: a building (a block) or a tree, its id in its source
// (an OpenStreetMap extract names elements "way/123", "node/45") and its top above ground.
type Surrounding struct {
	ID      string  `json:"id"`
	Kind    string  `json:"kind"`
	Source  string  `json:"source"`
	HeightM float64 `json:"height_m"`
}

// Check is one electrical check of the reported layout.
type Check struct {
	Severity string  `json:"severity"` // fail | warning | info (package finding's words)
	Subject  string  `json:"subject"`
	Message  string  `json:"message"`
	Value    float64 `json:"value"`
	Limit    float64 `json:"limit"`
	Unit     string  `json:"unit"`
	// Detail is for the installer: where a limit comes from, what an estimate assumes.
	Detail string `json:"detail,omitempty"`
}

// Cautions are shown wherever the tool gives a voltage, current or layout.
var Cautions = []string{
	"This is an estimate, not a design: local codes, the equipment's instructions and a licensed installer have the final word on every voltage, current, layout and fixing.",
	"PV modules make voltage whenever light falls on them; a string's DC voltage can be lethal and cannot be switched off at the modules. DC arcs do not extinguish themselves and can start fires: only qualified people may connect or disconnect DC circuits, and never under load.",
	"Working on roofs risks falls: use edge protection or fall arrest, never work alone, and keep off fragile roof areas and skylights.",
	"String voltages are checked at the coldest expected temperature given in the site file; a colder morning raises the open-circuit voltage further.",
	"Keep fire-service access paths and setbacks required locally; they may be wider than the setback used here.",
}

// JSON returns the document, indented, with numbers rounded for people (and stable across
// runs: the same inputs give the same bytes).
func (s *Summary) JSON() ([]byte, error) {
	c := *s
	if c.Warnings == nil {
		c.Warnings = []finding.Finding{}
	}
	if c.Notes == nil {
		c.Notes = []finding.Finding{}
	}
	if c.Overrides == nil {
		c.Overrides = []Override{}
	}
	if c.Checks == nil {
		c.Checks = []Check{}
	}
	if c.Layouts == nil {
		c.Layouts = []Layout{}
	}
	if c.Alternatives == nil {
		c.Alternatives = []Alternative{}
	}
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(roundAll(c)); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// Round rounds x to d decimals.
func Round(x float64, d int) float64 {
	p := math.Pow(10, float64(d))
	return math.Round(x*p) / p
}

func roundAll(s Summary) Summary {
	s.Site.Latitude, s.Site.Longitude = Round(s.Site.Latitude, 6), Round(s.Site.Longitude, 6) // 0.1 m
	s.DCkWp = Round(s.DCkWp, 3)
	s.Climate.AnnualGHIkWhM2 = Round(s.Climate.AnnualGHIkWhM2, 1)
	s.AnnualACkWh = Round(s.AnnualACkWh, 1)
	s.SpecificYield = Round(s.SpecificYield, 1)
	s.PerformanceRatio = Round(s.PerformanceRatio, 4)
	for i := range s.MonthlyACkWh {
		s.MonthlyACkWh[i] = Round(s.MonthlyACkWh[i], 1)
		s.MonthlyUnshaded[i] = Round(s.MonthlyUnshaded[i], 1)
	}
	s.LossesStartKWh = Round(s.LossesStartKWh, 1)
	if s.Shade != nil {
		sh := *s.Shade
		sh.LostKWh, sh.LostPct = Round(sh.LostKWh, 1), Round(sh.LostPct, 2)
		sh.Parts = append([]ShadePart(nil), sh.Parts...)
		for i := range sh.Parts {
			sh.Parts[i].KWh, sh.Parts[i].Pct = Round(sh.Parts[i].KWh, 1), Round(sh.Parts[i].Pct, 2)
		}
		s.Shade = &sh
	}
	s.EquivalenceMarginPct = Round(s.EquivalenceMarginPct, 2)
	s.Losses = append([]Loss(nil), s.Losses...)
	for i := range s.Losses {
		s.Losses[i].KWh = Round(s.Losses[i].KWh, 1)
		s.Losses[i].Pct = Round(s.Losses[i].Pct, 2)
	}
	s.Layouts = append([]Layout(nil), s.Layouts...)
	for i := range s.Layouts {
		l := &s.Layouts[i]
		l.AnnualACkWh = Round(l.AnnualACkWh, 1)
		l.ShadeLossPct = Round(l.ShadeLossPct, 2)
		l.BehindBestKWh = Round(l.BehindBestKWh, 1)
		l.CableM = Round(l.CableM, 1)
	}
	s.ModuleResults = append([]ModuleResult(nil), s.ModuleResults...)
	for i := range s.ModuleResults {
		m := &s.ModuleResults[i]
		m.AnnualPOAkWhM2 = Round(m.AnnualPOAkWhM2, 1)
		m.ShadeLossPct = Round(m.ShadeLossPct, 2)
		m.BeamShadeLossPct = Round(m.BeamShadeLossPct, 2)
		m.SolarAccessPct = Round(m.SolarAccessPct, 2)
		m.SkyViewPct = Round(m.SkyViewPct, 1)
	}
	s.Faces = append([]Face(nil), s.Faces...)
	for i := range s.Faces {
		f := &s.Faces[i]
		f.PitchDeg, f.AspectDeg = Round(f.PitchDeg, 1), Round(f.AspectDeg, 1)
		f.PlanAreaM2, f.SlopedAreaM2 = Round(f.PlanAreaM2, 2), Round(f.SlopedAreaM2, 2)
		f.KWp = Round(f.KWp, 3)
		f.AnnualPOAkWhM2 = Round(f.AnnualPOAkWhM2, 1)
	}
	s.Alternatives = append([]Alternative(nil), s.Alternatives...)
	for i := range s.Alternatives {
		s.Alternatives[i].AnnualACkWh = Round(s.Alternatives[i].AnnualACkWh, 1)
		s.Alternatives[i].DifferenceKWh = Round(s.Alternatives[i].DifferenceKWh, 1)
	}
	s.Checks = append([]Check(nil), s.Checks...)
	for i := range s.Checks {
		s.Checks[i].Value = Round(s.Checks[i].Value, 2)
		s.Checks[i].Limit = Round(s.Checks[i].Limit, 2)
	}
	return s
}

// Lines returns each finding's subject and message as one line, for lists in the proposal.
func Lines(fs []finding.Finding) []string {
	out := make([]string, len(fs))
	for i, f := range fs {
		out[i] = f.Message
		if f.Subject != "" {
			out[i] = f.Subject + ": " + f.Message
		}
	}
	return out
}

// Override is one setting that came from outside the site file.
type Override struct {
	Key    string `json:"key"`    // the site file's key, e.g. "inverter.ac_power_w"
	Value  string `json:"value"`  // as given
	Source string `json:"source"` // "environment variable SUNSTRING_…" or "flag --…"
}

// InputLabel names input in of inverter inv (both 1-based) as the documents print it: "input
// 2", or "inverter 1, input 2" when several inverters share the modules.
func InputLabel(inverters, inv, in int) string {
	if inverters > 1 {
		return fmt.Sprintf("inverter %d, input %d", inv, in)
	}
	return fmt.Sprintf("input %d", in)
}
