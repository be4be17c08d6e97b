package survey

import (
	"cmp"
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"
	"sunstring/geo"
	"sunstring/yield"
	"sunstring/yield/electric"
	"sunstring/yield/finding"
	"sunstring/yield/irradiance"
	"sunstring/yield/layout"
	"sunstring/yield/plausible"
	"sunstring/yield/report"
	"sync"
)

// Faces summarizes each roof face with its modules and their power.
func (p *Project) Faces() []report.Face {
	var out []report.Face
	for _, f := range geo.Summarize(p.Site, p.Modules) {
		out = append(out, report.Face{ID: f.ID, PitchDeg: f.PitchDeg, AspectDeg: f.AspectDeg, PlanAreaM2: f.PlanAreaM2,
			SlopedAreaM2: f.SlopedAreaM2, Modules: f.Modules, KWp: float64(f.Modules) * p.Datasheet.PowerW / 1000})
	}
	return out
}

// AlternativesStage names the alternatives' evaluations in Options.Progress.
const AlternativesStage = "alternatives"

// moduleConverterEff is the efficiency assumed for module-level DC converters (common
// practice: 98–99 % for current products' weighted efficiency).
const moduleConverterEff = 0.985

// alternatives runs the best layout with a plain hill-climbing tracker (which can stop on a
// local maximum of a shaded string's P-V curve), with a converter on every module, and with
// converters only on the fewest most-shaded modules that capture most of what converters
// everywhere would gain, the rest on plain strings; so the surveyor sees what the tracker
// choice and module-level electronics are worth here. It also completes the advice with
// what the hardware would change.
func (p *Project) alternatives(m *yield.Model, ls []RankedLayout) ([]report.Alternative, error) {
	if len(ls) == 0 {
		return nil, nil
	}
	best := ls[0].Result
	ids := func(mods []int) []string {
		out := make([]string, len(mods))
		for i, k := range mods {
			out[i] = p.Modules[k].ID
		}
		return out
	}
	var out []report.Alternative
	var every float64
	// Progress counts evaluations: the two alternatives, then at most one for each set of
	// converters someConverters tries; the total shrinks to what was done when it stops early.
	done, total := 0, 2+min(12, max(len(modulesOf(best.Layout))-1, 0))
	tell := func(n int) {
		done += n
		if m.In.Progress != nil {
			m.In.Progress(AlternativesStage, done, total)
		}
	}
	tell(0)
	alts := []struct {
		name, note string
		opt        electric.EvalOptions
	}{
		{"hill-climbing tracker", "the same strings with a tracker that climbs from its last operating point and can stop on a local maximum when shade splits the P-V curve; the estimate assumes a tracker that finds the global maximum",
			electric.EvalOptions{Tracker: electric.LocalClimb}},
		{"module-level converters", fmt.Sprintf("a DC converter on every module holding it at its own maximum power point (%.1f %% conversion efficiency assumed), the inverter's AC stage unchanged", 100*moduleConverterEff),
			electric.EvalOptions{ModuleLevel: true, ModuleLevelEff: moduleConverterEff}},
	}
	// Only the annual energy is reported: no unshaded reference, and both on their own core.
	// The run's cache holds the best layout's strings from the search: read, not added up.
	cache := p.evalCache()
	m.KeepStrings(best.Layout, cache)
	wh := make([]float64, len(alts))
	errs := make([]error, len(alts))
	var wg sync.WaitGroup
	for i, a := range alts {
		wg.Go(func() {
			if wh[i], errs[i] = m.EvaluateACWhCached(best.Layout, a.opt, cache); errs[i] != nil {
				errs[i] = fmt.Errorf("alternative %q: %w", a.name, errs[i])
			}
		})
	}
	wg.Wait()
	if err := errors.Join(errs...); err != nil {
		return nil, err
	}
	tell(len(alts))
	for i, a := range alts {
		ac := wh[i] / 1000
		alt := report.Alternative{Name: a.name, AnnualACkWh: ac, DifferenceKWh: ac - best.ACkWh, Note: a.note}
		if a.opt.ModuleLevel {
			alt.ConvertersOn = ids(modulesOf(best.Layout))
			every = ac - best.ACkWh
		}
		out = append(out, alt)
	}
	part, err := p.someConverters(m, best, every, func() { tell(1) })
	if err != nil {
		return nil, err
	}
	total = done
	tell(0)
	if part != nil {
		out = append(out, *part)
	}
	if p.advice != nil {
		p.advice.Hardware = p.hardware(best, every, part)
	}
	return out, nil
}

// someConverters finds the smallest set of the most shaded modules whose own converters
// capture at least 80 % of what converters on every module gain (every, kWh), the rest of
// the best layout on plain strings (the converters' modules taken out of their strings, or
// the rest rewired in the same order when that breaks the string bounds). Nil when
// converters everywhere gain nothing or no set of up to 12 modules keeps valid strings.
// evaluated is told after each evaluation.
func (p *Project) someConverters(m *yield.Model, best yield.LayoutResult, every float64, evaluated func()) (*report.Alternative, error) {
	if every <= 0 {
		return nil, nil
	}
	conn := connected(best.Layout)
	idx := modulesOf(best.Layout)
	slices.SortStableFunc(idx, func(a, b int) int { return cmp.Compare(m.Stats[b].ShadeLossPct, m.Stats[a].ShadeLossPct) })
	var found *report.Alternative
	// Each set adds one module to the last: the strings it changes are read from the last
	// set's through the cache, the others not computed again.
	cache := p.evalCache()
	for k := 1; k <= min(12, len(idx)-1); k++ {
		conv := slices.Clone(idx[:k])
		if m.Stats[conv[k-1]].ShadeLossPct <= 0 {
			break
		}
		rest := cloneLayout(best.Layout)
		for a := range rest.Inputs {
			for b := range rest.Inputs[a] {
				rest.Inputs[a][b] = slices.DeleteFunc(rest.Inputs[a][b], func(x int) bool { return slices.Contains(conv, x) })
			}
		}
		if !p.fits(rest) {
			var order []int
			for _, in := range best.Layout.Inputs {
				for _, s := range in {
					for _, x := range s {
						if conn[x] && !slices.Contains(conv, x) {
							order = append(order, x)
						}
					}
				}
			}
			l, left, err := layout.Sequential(order, p.inputs(), p.bounds)
			if err != nil || left > 0 || !p.fits(l) {
				continue
			}
			rest = p.Plant().Deal(l) // as the layouts are dealt to the inverters
		}
		wh, err := m.EvaluateACWhCached(rest, electric.EvalOptions{ConvertersOn: conv, ModuleLevelEff: moduleConverterEff}, cache)
		if err != nil {
			return nil, fmt.Errorf("alternative: converters on %d modules: %w", k, err)
		}
		evaluated()
		ac := wh / 1000
		gain := ac - best.ACkWh
		names := make([]string, k)
		for i, x := range conv {
			names[i] = p.Modules[x].ID
		}
		alt := report.Alternative{
			Name:          fmt.Sprintf("module-level converters on the %d most shaded modules", k),
			AnnualACkWh:   ac,
			DifferenceKWh: gain,
			Note: fmt.Sprintf("converters (%.1f %% efficiency) on %s only, the other modules on plain strings: %s kWh a year, %.0f %% of the %s kWh that converters on every module gain",
				100*moduleConverterEff, joinWords(names), report.Thousands(gain, 0), 100*gain/every, report.Thousands(every, 0)),
			ConvertersOn: names,
		}
		if k == 1 {
			alt.Name = "a module-level converter on the most shaded module"
		}
		if found == nil || gain > found.DifferenceKWh {
			found = &alt
		}
		if gain >= 0.8*every {
			return &alt, nil
		}
	}
	return found, nil
}

// hardware says whether module-level converters or another inverter input would be the
// better choice on this roof: when converters everywhere gain more than the equivalence
// margin, or the strings lose more than that to mismatch without shade (orientations).
func (p *Project) hardware(best yield.LayoutResult, every float64, part *report.Alternative) string {
	margin := best.ACkWh * EquivalenceMarginPct / 100
	var plain float64
	for _, l := range best.Losses {
		if strings.HasPrefix(l.Step, "string mismatch without shade") {
			plain = l.KWh
		}
	}
	var s []string
	switch {
	case every > margin && part != nil && part.DifferenceKWh >= 0.8*every:
		s = append(s, fmt.Sprintf("Module-level converters pay here: on every module they add %s kWh a year (%s), and on %d modules alone %s kWh.",
			report.Thousands(every, 0), report.Pct(100*every/best.ACkWh), len(part.ConvertersOn), report.Thousands(part.DifferenceKWh, 0)))
	case every > margin:
		s = append(s, fmt.Sprintf("Module-level converters on every module add %s kWh a year (%s), more than the layouts differ.",
			report.Thousands(every, 0), report.Pct(100*every/best.ACkWh)))
	default:
		s = append(s, fmt.Sprintf("Module-level converters add %s kWh a year at most (%s), within what the model tells apart: plain strings serve.",
			report.Thousands(max(every, 0), 0), report.Pct(100*max(every, 0)/best.ACkWh)))
	}
	if plain > margin {
		s = append(s, fmt.Sprintf("The strings lose %s kWh a year to mismatch without shade (modules of different orientation or temperature on one input): an inverter with another input, or converters, would recover most of it.",
			report.Thousands(plain, 0)))
	}
	return strings.Join(s, " ")
}

// modulesOf lists a layout's modules in string order.
func modulesOf(l electric.Layout) []int {
	var out []int
	for _, in := range l.Inputs {
		for _, s := range in {
			out = append(out, s...)
		}
	}
	return out
}

// RankedLayout is one evaluated layout with its module ids: Strings[i] is wired to input
// Inputs[i] of inverter Inverters[i] (both 1-based).
type RankedLayout struct {
	Name      string
	Strings   [][]string
	Inputs    []int
	Inverters []int
	Result    yield.LayoutResult
	CableM    float64
	Note      string
	// Equivalent reports whether the layout's energy is within EquivalenceMarginPct of the
	// best's; Crossings counts the hops between roof faces along its strings.
	Equivalent bool
	Crossings  int
}

// ModelSources names the survey's models as published, with their sources, for the
// sky model (perez, hay-davies, isotropic), the incidence-angle modifier (martin-ruiz,
// ashrae) and the mounting the site file chose.
func ModelSources(sky, iam string, mounting irradiance.Mounting) []string {
	skyText := "Perez et al. (1990), Solar Energy 44(5):271–289: anisotropic sky with circumsolar and horizon brightening"
	switch strings.ToLower(sky) {
	case "hay-davies":
		skyText = "Hay & Davies (1980), Proc. First Canadian workshop on solar radiation data: circumsolar and isotropic sky"
	case "isotropic":
		skyText = "Liu & Jordan (1963), Solar Energy 7(2):53–74: isotropic sky"
	}
	iamText := "Martin & Ruiz (2001), Solar Energy Materials and Solar Cells 70(1):25–38"
	if strings.EqualFold(iam, "ashrae") {
		iamText = "ASHRAE form after Souka & Safwat (1966), Solar Energy 10(4):170–174"
	}
	return []string{
		"Sun position: Solar Position Algorithm, Reda & Andreas (2004), NREL/TP-560-34302",
		"Light on the tilted module (transposition): " + skyText + "; ground reflection with the site's albedo",
		"Reflection at the glass (incidence-angle modifier): " + iamText,
		"Cell temperature: King, Boyson & Kratochvil (2004), Sandia report SAND2004-3535, eq. 11–12 with the Table 1 coefficients for the mounting " + mounting.String() + mountingText[mounting],
		"Module: single-diode model fitted to the datasheet, De Soto, Klein & Beckman (2006), Solar Energy 80(1):78–88, solved with the Lambert W function (Jain & Kapoor 2004), cell by cell with bypass diodes",
		"Shade: ray tests from every cell centre toward the sun; sky-view factors for the diffuse light",
	}
}

// mountingText says in words what each mounting is.
var mountingText = map[irradiance.Mounting]string{
	irradiance.Rails:    " (modules on rails over the roof: close roof mount)",
	irradiance.OpenRack: " (free air behind the modules: open rack)",
	irradiance.Flush:    " (built into the roof, back closed: insulated back)",
}

// summary builds summary.json from the model and the ranked layouts (best first).
func (p *Project) summary(m *yield.Model, pf *Preflight, ls []RankedLayout) *report.Summary {
	ws := pf.Weather
	found := append(finding.List(nil), pf.Findings...)
	kwp := float64(len(p.Modules)) * p.Datasheet.PowerW / 1000
	s := &report.Summary{
		Site:      report.SiteInfo{Name: p.Cfg.Name, Latitude: p.LatDeg, Longitude: p.LonDeg, Timezone: p.Cfg.Timezone},
		Modules:   len(p.Modules),
		DCkWp:     kwp,
		Inverters: p.Inverters(),
		ACkW:      float64(p.Inverters()) * p.Inverter.ACPowerW / 1000,
		Climate:   report.ClimateInfo{Source: string(ws.Source), File: p.Cfg.Climate.File},
		Models:    ModelSources(p.Cfg.Model.Sky, p.Cfg.Model.IAM, p.Mounting()),
		Cautions:  report.Cautions,
		Overrides: p.Cfg.Overrides,
	}
	for _, mo := range ws.Monthly() {
		s.Climate.AnnualGHIkWhM2 += mo.GHIKWhM2
	}
	s.Faces = p.Faces()
	for _, o := range p.Site.Obstacles() {
		switch {
		case o.Prism != nil && o.Prism.Source != "":
			s.Surroundings = append(s.Surroundings, report.Surrounding{ID: o.ID, Kind: o.Kind, Source: o.Prism.Source,
				HeightM: report.Round(max(o.Prism.HeightM, o.Prism.RidgeM), 2)})
		case o.Crown != nil && o.Crown.Source != "":
			s.Surroundings = append(s.Surroundings, report.Surrounding{ID: o.ID, Kind: o.Kind, Source: o.Crown.Source,
				HeightM: report.Round(o.Crown.HeightM, 2)})
		}
	}
	for i := range s.Faces {
		if i < len(pf.FaceKWhM2) {
			s.Faces[i].AnnualPOAkWhM2 = pf.FaceKWhM2[i]
		}
	}
	stringOf := map[string]string{}
	inverterOf := map[string]int{}
	if len(ls) > 0 {
		best := ls[0]
		r := best.Result
		// The figures are the connected modules': a layout may leave some out.
		connected := 0
		for _, st := range best.Strings {
			connected += len(st)
		}
		if connected < len(p.Modules) {
			found.Add(finding.Warning, "unconnected", p.Cfg.File+": inverter", "the best layout leaves %d of the %d placed modules unconnected; the figures are for the %d connected ones; choose an inverter with more inputs or a wider voltage window, or more inverters (inverter.count), to connect them",
				len(p.Modules)-connected, len(p.Modules), connected)
			s.Modules = connected
			kwp = float64(connected) * p.Datasheet.PowerW / 1000
			s.DCkWp = kwp
		}
		s.AnnualACkWh = r.ACkWh
		s.SpecificYield = r.ACkWh / kwp
		if r.RefPOAKWhM2 > 0 {
			// IEC 61724-1: final yield over reference yield (in-plane irradiation / 1 kW/m²),
			// both over the connected modules.
			s.PerformanceRatio = s.SpecificYield / r.RefPOAKWhM2
		}
		s.MonthlyACkWh = r.MonthlyACkWh
		s.MonthlyUnshaded = r.MonthlyUnshadedACkWh
		s.LossesStartKWh = r.NominalDCkWh
		for _, l := range r.Losses {
			s.Losses = append(s.Losses, report.Loss{Group: l.Group, Step: l.Step, KWh: l.KWh, Pct: l.Pct})
		}
		sh := &report.ShadeSplit{LostKWh: r.Shade.LostKWh, LostPct: r.Shade.LostPct}
		for _, part := range r.Shade.Parts {
			sh.Parts = append(sh.Parts, report.ShadePart{Cause: part.Cause, KWh: part.KWh, Pct: part.Pct})
		}
		s.Shade = sh
		s.Checks = append(p.electricalChecks(best.Name, lengths(best.Result.Layout)), p.leakageChecks(best.Result.Layout)...)
		// "<input>.<string on that input>", both counted from 1; the inverter beside it.
		nth := map[[2]int]int{}
		for i, st := range best.Strings {
			at := [2]int{best.Inverters[i], best.Inputs[i]}
			nth[at]++
			for _, id := range st {
				stringOf[id] = fmt.Sprintf("%d.%d", best.Inputs[i], nth[at])
				inverterOf[id] = best.Inverters[i]
			}
		}
		// One reference for every layout's shade loss, so that the column agrees with the
		// ranking: the best layout's modules with no shade, same losses.
		ref := best.Result.UnshadedACkWh
		for _, l := range ls {
			loss := 0.0
			if ref > 0 {
				loss = 100 * (1 - l.Result.ACkWh/ref)
			}
			s.Layouts = append(s.Layouts, report.Layout{
				Name: l.Name, AnnualACkWh: l.Result.ACkWh, ShadeLossPct: loss,
				BehindBestKWh: best.Result.ACkWh - l.Result.ACkWh, CableM: l.CableM,
				Strings: l.Strings, Inputs: l.Inputs, Inverters: l.Inverters, Note: l.Note,
				EquivalentToBest: l.Equivalent, FaceCrossings: l.Crossings,
			})
		}
		s.EquivalenceMarginPct = EquivalenceMarginPct
		s.LayoutAdvice = p.advice
	}
	if len(ls) > 0 {
		found = append(found, plausible.Result("layout "+strconv.Quote(ls[0].Name), clippingPct(ls[0].Result), s.PerformanceRatio)...)
	}
	for _, f := range found.Sorted() {
		if f.Severity == finding.Info {
			s.Notes = append(s.Notes, f)
		} else {
			s.Warnings = append(s.Warnings, f)
		}
	}
	for i, mod := range p.Modules {
		st := m.Stats[i]
		s.ModuleResults = append(s.ModuleResults, report.ModuleResult{
			ID: mod.ID, Face: mod.Face, AnnualPOAkWhM2: st.POAKWhM2, ShadeLossPct: st.ShadeLossPct,
			BeamShadeLossPct: st.BeamShadeLossPct, SolarAccessPct: 100 - st.ShadeLossPct, SkyViewPct: 100 * st.SkyView,
			String: stringOf[mod.ID], Inverter: inverterOf[mod.ID],
		})
	}
	return s
}
