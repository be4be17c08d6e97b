package cli

import (
	"context"
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"sunstring/geo"
	"sunstring/yield"
	"sunstring/yield/electric"
	"sunstring/yield/irradiance"
	"sunstring/yield/report"
	"sunstring/yield/weather"
)

func newSurveyCmd() *cobra.Command {
	var (
		out     string
		svg     bool
		paper   string
		hourly  bool
		timeout time.Duration
	)
	c := &cobra.Command{
		Use:   "survey SITE.yaml -o DIR",
		Short: "Estimate the yield, rank string layouts and write the report",
		Long: `Run the whole survey: place modules on every roof face, compute the sun for every
hour of the year and the shade on every cell of every module, simulate the strings and
the inverter, rank string layouts, and write into DIR:

  summary.json      key figures, losses, layouts and per-module results
  modules.geojson   the placed modules (id, face, string, shade loss) and the drawing
  proposal.pdf      the customer proposal (A4, or --paper letter)
  *.png             the charts: plan, strings, sunpath, monthly, losses, layouts
  hourly.csv        with --hourly: weather, sunlit share and AC power per record

DIR is replaced only when the run succeeds; an earlier report stays as it was otherwise.
Estimates only: local codes and a licensed installer have the final word.`,
		Example: "  sunstring survey examples/sample-house/site.yaml -o out",
		Args:    args(cobra.ExactArgs(1)),
	}
	bind := bindSiteFlags(c.Flags())
	f := c.Flags()
	f.StringVarP(&out, "out", "o", "", "output folder (required)")
	f.BoolVar(&svg, "svg", false, "also write the charts as SVG")
	f.StringVar(&paper, "paper", "a4", "proposal paper size: a4 or letter")
	f.BoolVar(&hourly, "hourly", false, "also write hourly.csv (one row per weather record)")
	f.DurationVar(&timeout, "timeout", 0, "give up after this long (e.g. 2m; 0: no limit)")
	c.RunE = func(c *cobra.Command, a []string) (err error) {
		if out == "" {
			return usageError{fmt.Errorf("survey: -o DIR is required: the folder to write the report into")}
		}
		if err := checkPaper(paper); err != nil {
			return err
		}
		ctx := c.Context()
		if timeout > 0 {
			var cancel func()
			ctx, cancel = contextWithTimeout(ctx, timeout)
			defer cancel()
		}
		defer func() {
			switch {
			case err == nil:
			case errors.Is(ctx.Err(), context.DeadlineExceeded):
				err = fmt.Errorf("survey: gave up after %s (--timeout); nothing was written", timeout)
			case errors.Is(ctx.Err(), context.Canceled):
				err = fmt.Errorf("survey: interrupted; nothing was written")
			}
		}()
		p, err := loadProject(a[0], c.Flags(), bind)
		if err != nil {
			return err
		}
		if len(p.Modules) == 0 {
			return p.noModules(p.Cfg.Path(p.Cfg.Map))
		}
		if err := p.prepareLayouts(); err != nil {
			return err
		}
		ws, err := p.loadWeather()
		if err != nil {
			return err
		}
		sky, _ := irradiance.ParseSkyModel(strings.ToLower(p.Cfg.Model.Sky))
		iam := yield.IAMMartinRuiz
		if strings.EqualFold(p.Cfg.Model.IAM, "ashrae") {
			iam = yield.IAMASHRAE
		}
		prog := newProgress(c.ErrOrStderr())
		defer prog.Done()
		in := yield.Input{
			Site: p.Site, Modules: p.Modules, Weather: ws, Observer: p.Observer, Zone: p.Cfg.Zone,
			Horizon: p.Horizon, Progress: prog.Update,
			System: yield.System{
				Module: p.Datasheet, Inverter: p.Inverter, Albedo: p.Cfg.Climate.Albedo, Sky: sky, IAM: iam,
				Losses: yield.Losses{
					SoilingPct: p.Cfg.Losses.SoilingPct, WiringPct: p.Cfg.Losses.WiringPct,
					MismatchPct: p.Cfg.Losses.MismatchPct, AvailabilityPct: p.Cfg.Losses.AvailabilityPct,
				},
			},
		}
		model, err := yield.Prepare(ctx, in)
		if err != nil {
			return err
		}
		layouts, err := p.layouts(ctx, model)
		if err != nil {
			return err
		}
		prog.Done()
		sum := p.summary(model, ws, layouts)
		if sum.Alternatives, err = alternatives(model, layouts); err != nil {
			return err
		}
		files, err := p.outputs(model, sum, layouts, reportOptions{SVG: svg, Paper: paper, Hourly: hourly})
		if err != nil {
			return err
		}
		if err := files.commit(out); err != nil {
			return err
		}
		w := c.OutOrStdout()
		best := sum
		if sum.Climate.Source == "indicative" {
			fmt.Fprintln(w, IndicativeWarning)
		}
		fmt.Fprintf(w, "%s: %d modules, %.2f kWp\n", p.Cfg.Name, best.Modules, best.DCkWp)
		fmt.Fprintf(w, "annual AC energy %s kWh, specific yield %s kWh/kWp, performance ratio %.2f\n",
			report.Thousands(best.AnnualACkWh, 0), report.Thousands(best.SpecificYield, 0), best.PerformanceRatio)
		if len(best.Layouts) > 0 {
			fmt.Fprintf(w, "best layout %q loses %.1f %% to shade\n", best.Layouts[0].Name, best.Layouts[0].ShadeLossPct)
		}
		for _, s := range best.Warnings {
			fmt.Fprintln(c.ErrOrStderr(), "warning:", s)
		}
		fmt.Fprintln(w, "caution: estimates only; local codes and a licensed installer have the final word on voltages, currents and layouts.")
		fmt.Fprintf(w, "wrote %s\n", out)
		return nil
	}
	return c
}

// faces summarizes each roof face with its modules and their power.
func (p *project) faces() []report.Face {
	var out []report.Face
	for _, f := range geo.Summarize(p.Site, p.Modules) {
		out = append(out, report.Face{ID: f.ID, PitchDeg: f.PitchDeg, AspectDeg: f.AspectDeg, PlanAreaM2: f.PlanAreaM2,
			SlopedAreaM2: f.SlopedAreaM2, Modules: f.Modules, KWp: float64(f.Modules) * p.Datasheet.PowerW / 1000})
	}
	return out
}

// moduleConverterEff is the efficiency assumed for module-level DC converters (common
// practice: 98–99 % for current products' weighted efficiency).
const moduleConverterEff = 0.985

// alternatives runs the best layout with a plain hill-climbing tracker (which can stop on a
// local maximum of a shaded string's P-V curve) and with a converter on every module, so the
// surveyor sees what the tracker choice and module-level electronics are worth here.
func alternatives(m *yield.Model, ls []rankedLayout) ([]report.Alternative, error) {
	if len(ls) == 0 {
		return nil, nil
	}
	best := ls[0].Result
	var out []report.Alternative
	for _, a := range []struct {
		name, note string
		opt        electric.EvalOptions
	}{
		{"hill-climbing tracker", "the same strings with a tracker that climbs from its last operating point and can stop on a local maximum when shade splits the P-V curve; the estimate assumes a tracker that finds the global maximum",
			electric.EvalOptions{Tracker: electric.LocalClimb}},
		{"module-level converters", fmt.Sprintf("a DC converter on every module holding it at its own maximum power point (%.1f %% conversion efficiency assumed), the inverter's AC stage unchanged", 100*moduleConverterEff),
			electric.EvalOptions{ModuleLevel: true, ModuleLevelEff: moduleConverterEff}},
	} {
		r, err := m.Evaluate(best.Layout, a.opt)
		if err != nil {
			return nil, fmt.Errorf("alternative %q: %w", a.name, err)
		}
		out = append(out, report.Alternative{Name: a.name, AnnualACkWh: r.ACkWh, DifferenceKWh: r.ACkWh - best.ACkWh, Note: a.note})
	}
	return out, nil
}

// rankedLayout is one evaluated layout with its module ids.
type rankedLayout struct {
	Name    string
	Strings [][]string
	Inputs  []int
	Result  yield.LayoutResult
	CableM  float64
	Note    string
}

// summary builds summary.json from the model and the ranked layouts (best first).
func (p *project) summary(m *yield.Model, ws *weather.Series, ls []rankedLayout) *report.Summary {
	kwp := float64(len(p.Modules)) * p.Datasheet.PowerW / 1000
	s := &report.Summary{
		Site:    report.SiteInfo{Name: p.Cfg.Name, Latitude: p.LatDeg, Longitude: p.LonDeg, Timezone: p.Cfg.Timezone},
		Modules: len(p.Modules),
		DCkWp:   kwp,
		Climate: report.ClimateInfo{Source: string(ws.Source), File: p.Cfg.Climate.File},
		Models: []string{
			"sun: Reda & Andreas (2004) SPA, NREL/TP-560-34302",
			"sky: " + p.Cfg.Model.Sky + " transposition (Perez et al. 1990 by default)",
			"incidence-angle modifier: " + p.Cfg.Model.IAM,
			"cell temperature: Faiman (2008)",
			"module: single-diode model, De Soto et al. (2006), per cell with bypass diodes",
		},
		Cautions: report.Cautions,
	}
	for _, mo := range ws.Monthly() {
		s.Climate.AnnualGHIkWhM2 += mo.GHIKWhM2
	}
	if ws.Source == weather.Source("indicative") {
		s.Warnings = append(s.Warnings, IndicativeWarning)
	}
	s.Warnings = append(s.Warnings, ws.Warnings...)
	s.Warnings = append(s.Warnings, p.Site.Warnings...)
	s.Warnings = append(s.Warnings, p.Notes...)
	s.Faces = p.faces()
	stringOf := map[string]string{}
	if len(ls) > 0 {
		best := ls[0]
		r := best.Result
		// The figures are the connected modules': a layout may leave some out.
		connected := 0
		for _, st := range best.Strings {
			connected += len(st)
		}
		if connected < len(p.Modules) {
			s.Warnings = append(s.Warnings, fmt.Sprintf("the best layout leaves %d of the %d placed modules unconnected; the figures are for the %d connected ones",
				len(p.Modules)-connected, len(p.Modules), connected))
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
			s.Losses = append(s.Losses, report.Loss{Step: l.Step, KWh: l.KWh, Pct: l.Pct})
		}
		s.Checks = append(p.electricalChecks(best.Name, lengths(best.Result.Layout)), p.leakageChecks(connected)...)
		// "<input>.<string on that input>", both counted from 1.
		nth := map[int]int{}
		for i, st := range best.Strings {
			nth[best.Inputs[i]]++
			for _, id := range st {
				stringOf[id] = fmt.Sprintf("%d.%d", best.Inputs[i], nth[best.Inputs[i]])
			}
		}
		for _, l := range ls {
			s.Layouts = append(s.Layouts, report.Layout{
				Name: l.Name, AnnualACkWh: l.Result.ACkWh, ShadeLossPct: l.Result.ShadeLossPct,
				BehindBestKWh: best.Result.ACkWh - l.Result.ACkWh, CableM: l.CableM,
				Strings: l.Strings, Inputs: l.Inputs, Note: l.Note,
			})
		}
	}
	for i, mod := range p.Modules {
		st := m.Stats[i]
		s.ModuleResults = append(s.ModuleResults, report.ModuleResult{
			ID: mod.ID, Face: mod.Face, AnnualPOAkWhM2: st.POAKWhM2, ShadeLossPct: st.ShadeLossPct,
			BeamShadeLossPct: st.BeamShadeLossPct, SolarAccessPct: 100 - st.ShadeLossPct, SkyViewPct: 100 * st.SkyView,
			String: stringOf[mod.ID],
		})
	}
	return s
}
