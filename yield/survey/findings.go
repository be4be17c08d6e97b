package survey

import (
	"fmt"
	"slices"
	"strconv"
	"strings"
	"sunstring/yield"
	"sunstring/yield/finding"
	"sunstring/yield/irradiance"
	"sunstring/yield/layout"
	"sunstring/yield/plausible"
	"sunstring/yield/weather"
)

// loadFindings gathers what Load found: the map's own warnings, blocks hidden below their
// roof, the module fit's and the fill's notes, and the plausibility of the module, the
// inverter and the time zone.
func (p *Project) loadFindings(mapPath string, fitNotes, fillNotes []string) finding.List {
	cfg := p.Cfg
	var out finding.List
	for _, w := range cfg.Warnings {
		out = append(out, finding.Finding{Severity: finding.Warning, Code: "settings", Message: w})
	}
	for _, o := range cfg.Overrides {
		out = append(out, finding.Finding{Severity: finding.Info, Code: "override", Subject: o.Source,
			Message: fmt.Sprintf("%s = %s, instead of the site file's value", o.Key, o.Value)})
	}
	for _, w := range p.Site.Warnings {
		out = append(out, finding.Finding{Severity: finding.Warning, Code: "map", Message: w})
	}
	for _, n := range p.Site.Notes {
		out = append(out, finding.Finding{Severity: finding.Info, Code: "map_note", Message: n})
	}
	for _, pr := range p.Site.SunkBlocks() {
		pr.File = mapPath
		out = append(out, finding.Finding{Severity: finding.Warning, Code: "block_below_roof", Message: pr.String()})
	}
	for _, n := range fitNotes {
		out = append(out, finding.Finding{Severity: finding.Warning, Code: "module_fit", Subject: cfg.File + ": module", Message: n})
	}
	for _, n := range fillNotes {
		out = append(out, finding.Finding{Severity: finding.Warning, Code: "fill", Message: n})
	}
	m := cfg.Module
	_, fs := plausible.Module(cfg.File+": module (power_w, length_m, width_m)", m.PowerW, m.LengthM, m.WidthM)
	out = append(out, fs...)
	// With a module size that cannot be, the module count and so the DC/AC ratio mean nothing.
	if len(p.Modules) > 0 && fs.Worst() < finding.Fail {
		// The ratio is of what the inverter can take: modules beyond its inputs' strings stay
		// unconnected and add no DC power (said in their own warning).
		n := len(p.Modules)
		if b, err := layout.StringBounds(p.Datasheet, p.Inverter, layout.Limits{
			LowTempC: cfg.Climate.LowTempC, HighTempC: cfg.Climate.HighTempC, MaxSystemVoltage: cfg.Module.MaxSystemVoltage,
			Mounting: p.Mounting(),
		}); err == nil {
			n = min(n, p.inputs()*b.MaxParallel*b.MaxSeries)
		}
		_, fs = plausible.DCAC(cfg.File+": inverter.ac_power_w", float64(n)*m.PowerW, float64(p.Inverters())*cfg.Inverter.ACPowerW)
		out = append(out, fs...)
	}
	where := mapPath + " (the map's centre)"
	if cfg.Latitude != nil && cfg.Longitude != nil {
		where = cfg.File + ": latitude, longitude"
	}
	zone := plausible.Zone(where, cfg.File+": timezone", cfg.Zone, p.LatDeg, p.LonDeg)
	out = append(out, zone...)
	// The zone sees swapped coordinates only when latitude and longitude lie an hour of
	// longitude (15°) or more apart; the faces' outlines against their aspects see the
	// reflection that swapping makes of the drawing at any distance (geo.Site.SwapEvidence).
	if ids := p.Site.SwapEvidence(); len(ids) > 0 && !slices.ContainsFunc(zone, func(f finding.Finding) bool { return f.Code == "coordinates_swapped" }) {
		faces := fmt.Sprintf("roof face %q agrees with its", ids[0])
		if len(ids) > 1 {
			q := make([]string, len(ids))
			for i, id := range ids {
				q[i] = strconv.Quote(id)
			}
			faces = "roof faces " + strings.Join(q, ", ") + " agree with their"
		}
		out.Add(finding.Warning, "coordinates_swapped", mapPath,
			"latitude and longitude look swapped: %s aspect_deg and heights (an edge across the slope, one height along a shared ridge, hip or valley) only when every coordinate is read the other way round, east and north exchanged. Written latitude first, a drawing comes out mirrored (a tree south of the house stands west of it) and the rows of modules run the wrong way, however close latitude (%.4f) and longitude (%.4f) are. GeoJSON gives longitude first ([lon, lat]); swap the two numbers in every coordinate (and in the site file's latitude and longitude, if given)",
			faces, p.LatDeg, p.LonDeg)
	}
	return out
}

// Preflight is what both `check` and a survey examine before the year is simulated, so that
// `check` refuses whatever the survey would refuse.
type Preflight struct {
	Weather *weather.Series
	// FaceKWhM2 is each roof face's annual irradiation without shade (kWh/m²), in the order
	// of the map's faces.
	FaceKWhM2 []float64
	// Findings are Load's and the climate's and the faces', in the order found; Sorted puts
	// them worst first.
	Findings finding.List
}

// Preflight reads and checks the climate (the weather file, the monthly values or the
// indicative year), computes each face's irradiation without shade and compares the faces.
// Problems with the climate's input come back as errors (bad input); a Fail among the
// findings is left for the caller to turn into one (Findings.Err), after printing the rest.
func (p *Project) Preflight() (*Preflight, error) {
	ws, err := p.Weather()
	if err != nil {
		return nil, err
	}
	pf := &Preflight{Weather: ws, Findings: append(finding.List(nil), p.Findings...)}
	if ws.Source == weather.SourceIndicative {
		pf.Findings.Add(finding.Warning, "indicative_climate", p.Cfg.File+": climate", "%s", IndicativeWarning)
	}
	for _, w := range ws.Warnings {
		sev := finding.Warning
		if w == weather.SyntheticNote {
			sev = finding.Info
		}
		pf.Findings = append(pf.Findings, finding.Finding{Severity: sev, Code: "climate", Message: w})
	}
	sky, _ := irradiance.ParseSkyModel(strings.ToLower(p.Cfg.Model.Sky))
	planes := make([]yield.Plane, len(p.Site.Faces))
	for i, f := range p.Site.Faces {
		planes[i] = yield.Plane{TiltDeg: f.PitchDeg, AspectDeg: f.AspectDeg}
	}
	pf.FaceKWhM2 = yield.PlaneIrradiation(ws, p.Observer, p.Cfg.Zone, sky, p.Cfg.Climate.Albedo, planes)
	count := map[string]int{}
	for _, m := range p.Modules {
		count[m.Face]++
	}
	mapPath := p.Cfg.Path(p.Cfg.Map)
	var faces []plausible.FaceIrradiation
	for i, f := range p.Site.Faces {
		faces = append(faces, plausible.FaceIrradiation{ID: f.ID, Subject: faceSubject(mapPath, f.Index, f.ID), KWhM2: pf.FaceKWhM2[i], Modules: count[f.ID]})
	}
	pf.Findings = append(pf.Findings, plausible.PoorFaces(faces)...)
	return pf, nil
}

// faceSubject names a map feature as geo's messages do.
func faceSubject(mapPath string, index int, id string) string {
	return mapPath + ": feature " + itoa(index) + " (id " + quote(id) + ")"
}

func itoa(i int) string     { return strconv.Itoa(i) }
func quote(s string) string { return strconv.Quote(s) }

// clippingPct is the share of the inverter's possible AC output that its AC limit cuts.
func clippingPct(r yield.LayoutResult) float64 {
	if t := r.Year.ACWh + r.Year.ClippedWh; t > 0 {
		return 100 * r.Year.ClippedWh / t
	}
	return 0
}
