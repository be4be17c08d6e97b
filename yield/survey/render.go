package survey

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"sunstring/geo"
	"sunstring/shading"
	"sunstring/yield"
	"sunstring/yield/report"
	"sunstring/yield/weather"
	"sync"
	"time"

	"github.com/paulmach/orb"
)

// RenderOptions shape the report files. The zero value gives A4 and PNG charts only.
type RenderOptions struct {
	SVG    bool   // also the charts as SVG
	Paper  string // proposal paper: "a4" (default) or "letter"
	Hourly bool   // also hourly.csv
	// Context, when set, stops rendering between files once it is done; Render then returns
	// its error.
	Context context.Context
	// Date dates the documents when the site file's proposal.date does not: the front end
	// passes SOURCE_DATE_EPOCH's day or the run's. Zero leaves them dated 1 January 2000.
	Date time.Time
	// Progress, when set, is told as each file is made that done of total files are made
	// (stage RenderStage). It may be called from several goroutines at once.
	Progress func(stage string, done, total int)
}

// RenderStage names the rendering in RenderOptions.Progress.
const RenderStage = "report files"

// documentDate is the survey's date: the site file's proposal.date (validated), else the
// given fallback's day in UTC.
func documentDate(cfg *Config, fallback time.Time) time.Time {
	if t, err := time.Parse(time.DateOnly, cfg.Proposal.Date); err == nil {
		return t
	}
	if fallback.IsZero() {
		return time.Time{}
	}
	y, m, d := fallback.UTC().Date()
	return time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
}

// Render makes every file of the report, by name (summary.json, modules.geojson,
// proposal.pdf, technical-sheet.pdf, the charts and, on request, hourly.csv). It writes nothing: the front end
// decides where the files go.
func (r *Result) Render(opt RenderOptions) (map[string][]byte, error) {
	p, m, s, ls := r.Project, r.Model, r.Summary, r.Layouts
	ctx := opt.Context
	if ctx == nil {
		ctx = context.Background()
	}
	// The sun-path chart's outlines and blockers take a while on a large roof: they are
	// found while the files below are put together.
	type sunPathOf struct {
		sp  *report.SunPath
		err error
	}
	spc := make(chan sunPathOf, 1)
	go func() {
		sp, err := p.sunPath(m, s)
		spc <- sunPathOf{sp, err}
	}()
	files := map[string][]byte{}
	js, err := s.JSON()
	if err != nil {
		return nil, err
	}
	files["summary.json"] = js
	gj, err := geo.ExportGeoJSON(p.Site, p.Modules, func(i int) map[string]any {
		r := s.ModuleResults[i]
		props := map[string]any{
			"shade_loss_pct":      report.Round(r.ShadeLossPct, 2),
			"beam_shade_loss_pct": report.Round(r.BeamShadeLossPct, 2),
			"solar_access_pct":    report.Round(r.SolarAccessPct, 2),
			"annual_poa_kwh_m2":   report.Round(r.AnnualPOAkWhM2, 1),
		}
		if r.String != "" {
			props["string"] = r.String
			props["inverter"] = r.Inverter
		}
		if s.Climate.Source == "indicative" {
			props["warning"] = IndicativeWarning
		}
		return props
	})
	if err != nil {
		return nil, fmt.Errorf("modules.geojson: %w", err)
	}
	// The cautions travel with the layout (RFC 7946 §6.1 allows foreign members).
	cj, err := json.Marshal(report.Cautions)
	if err != nil {
		return nil, err
	}
	const head = `{"type":"FeatureCollection",`
	if !bytes.HasPrefix(gj, []byte(head)) {
		return nil, fmt.Errorf("modules.geojson: unexpected start %q", gj[:min(len(gj), 40)])
	}
	gj = append([]byte(head+`"cautions":`+string(cj)+","), gj[len(head):]...)
	files["modules.geojson"] = gj

	// The PDF and the chart files show the same rounded figures as summary.json.
	rs, err := roundedSummary(js)
	if err != nil {
		return nil, err
	}
	pc := p.Cfg.Proposal
	pr := &report.Proposal{Summary: rs, Plan: p.plan(s, ls), Paper: opt.Paper, Equipment: p.equipment(),
		Cover: report.Cover{Customer: pc.Customer, Address: pc.Address, PreparedBy: pc.PreparedBy, Date: pc.Date, ValidUntil: pc.ValidUntil},
		Date:  documentDate(p.Cfg, opt.Date)}
	if pr.Cover.Date == "" && !pr.Date.IsZero() {
		pr.Cover.Date = pr.Date.Format(time.DateOnly)
	}
	sp := <-spc
	if sp.err != nil {
		return nil, sp.err
	}
	pr.SunPath = sp.sp
	formats := []report.Format{report.PNG}
	if opt.SVG {
		formats = append(formats, report.SVG)
	}
	charts := pr.Charts()
	// Every file counts one: summary.json and modules.geojson (made by now), the charts in
	// each format, the two documents and hourly.csv on request.
	total := 4 + len(charts)*len(formats)
	if opt.Hourly && len(ls) > 0 {
		total++
	}
	// Charts are drawn concurrently: one lock keeps the count told in order.
	var mu sync.Mutex
	made := 2
	tell := func() {
		mu.Lock()
		defer mu.Unlock()
		made++
		if opt.Progress != nil {
			opt.Progress(RenderStage, made, total)
		}
	}
	if opt.Progress != nil {
		opt.Progress(RenderStage, made, total)
	}
	type job struct {
		c report.Chart
		f report.Format
	}
	var jobs []job
	for _, c := range charts {
		for _, f := range formats {
			jobs = append(jobs, job{c, f})
		}
	}
	bs, err := report.RenderEach(len(jobs), func(i int) ([]byte, error) {
		if err := ctx.Err(); err != nil {
			return nil, fmt.Errorf("survey: rendering: %w", err)
		}
		j := jobs[i]
		b, err := report.Render(j.c.Plot, j.c.W, j.c.H, j.f)
		if err != nil {
			return nil, fmt.Errorf("%s%s: %w", j.c.Name, j.f.Ext(), err)
		}
		tell()
		return b, nil
	})
	if err != nil {
		return nil, err
	}
	for i, j := range jobs {
		files[j.c.Name+j.f.Ext()] = bs[i]
	}
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("survey: rendering: %w", err)
	}
	pdf, err := pr.PDF()
	if err != nil {
		return nil, fmt.Errorf("%s: %w", report.ProposalFile, err)
	}
	files[report.ProposalFile] = pdf
	tell()
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("survey: rendering: %w", err)
	}
	if pdf, err = pr.TechnicalPDF(); err != nil {
		return nil, fmt.Errorf("%s: %w", report.TechnicalFile, err)
	}
	files[report.TechnicalFile] = pdf
	tell()
	if opt.Hourly && len(ls) > 0 {
		b, err := report.HourlyCSV(hourlyTable(m, ls[0]))
		if err != nil {
			return nil, fmt.Errorf("hourly.csv: %w", err)
		}
		if s.Climate.Source == "indicative" {
			// A comment line ahead of the header (sunstring's own CSV reader skips it).
			b = append([]byte("# "+IndicativeWarning+"\n"), b...)
		}
		files["hourly.csv"] = b
		tell()
	}
	return files, nil
}

// roundedSummary reads summary.json back, so that every figure printed anywhere is the one
// in the file.
func roundedSummary(js []byte) (*report.Summary, error) {
	var s report.Summary
	if err := json.Unmarshal(js, &s); err != nil {
		return nil, fmt.Errorf("summary.json: %w", err)
	}
	return &s, nil
}

// plan is the roof from above with the best layout's strings.
func (p *Project) plan(s *report.Summary, ls []RankedLayout) *report.Plan {
	pl := &report.Plan{}
	for _, f := range p.Site.Faces {
		pl.Faces = append(pl.Faces, report.Shape{ID: f.ID, Ring: ringOf(f.Plan)})
	}
	// Every obstacle is drawn by its shape, whatever kind (or file) it came from.
	for _, ob := range p.Site.Obstacles() {
		switch {
		case ob.Kind == "building":
			// Its roof faces show it; its walls would cover them.
		case ob.Prism != nil:
			pl.Blocks = append(pl.Blocks, report.Shape{ID: ob.ID, Ring: ringOf(ob.Prism.Footprint)})
		case ob.Crown != nil:
			t := ob.Crown
			pl.Trees = append(pl.Trees, report.TreeMark{ID: ob.ID, X: t.Trunk[0], Y: t.Trunk[1], CrownRadiusM: t.CrownRadiusM})
		}
	}
	for _, a := range p.Site.Avoids {
		pl.Avoids = append(pl.Avoids, report.Shape{ID: a.ID, Ring: ringOf(a.Area)})
	}
	index := map[string]int{}
	for i, m := range p.Modules {
		var c [4][2]float64
		for k, v := range m.Corners() {
			c[k] = [2]float64{v.E, v.N}
		}
		pm := report.PlanModule{ID: m.ID, Corners: c}
		pl.Modules = append(pl.Modules, pm)
		index[m.ID] = i
	}
	if len(ls) > 0 {
		for _, st := range ls[0].Strings {
			var idx []int
			for _, id := range st {
				if i, ok := index[id]; ok {
					idx = append(idx, i)
				}
			}
			pl.Strings = append(pl.Strings, idx)
		}
		pl.Inputs, pl.Inverters, pl.InverterOf = ls[0].Inputs, p.Inverters(), ls[0].Inverters
	}
	return pl
}

// sunPath is the sun-path chart's input, seen from the connected module that loses most
// to shade (any module, when no layout connects them).
func (p *Project) sunPath(m *yield.Model, s *report.Summary) (*report.SunPath, error) {
	worst := -1
	for i, r := range s.ModuleResults {
		if r.String == "" && len(s.Layouts) > 0 {
			continue
		}
		if worst < 0 || r.ShadeLossPct > s.ModuleResults[worst].ShadeLossPct {
			worst = i
		}
	}
	if worst < 0 {
		return nil, nil
	}
	sc := m.Scene
	if sc == nil {
		var err error
		if sc, err = shading.NewScene(p.Site, p.Modules, shading.Options{Horizon: p.Horizon, Workers: 1}); err != nil {
			return nil, fmt.Errorf("sun-path chart: %w", err)
		}
	}
	const step = 1.0 // degrees of azimuth: finer than a chimney seen from a few metres
	year := 2025
	if len(m.Records) > 0 {
		year = m.Records[len(m.Records)/2].End.Year()
	}
	// The outlines and what blocks the sun are independent readings of the scene: one on
	// another core.
	var shaders []shading.Blocker
	done := make(chan struct{})
	go func() {
		shaders = sc.Blockers(worst, m.Steps, m.Shade)
		close(done)
	}()
	outlines := sc.Silhouette(worst, step)
	<-done
	return &report.SunPath{
		Observer: p.Observer, Zone: p.Cfg.Zone, Year: year,
		Outlines: outlines, AzStepDeg: step,
		Shaders: shaders,
		Module:  s.ModuleResults[worst].ID, ShadeLossPct: report.Round(s.ModuleResults[worst].ShadeLossPct, 2),
	}, nil
}

// equipment is the module and inverter for the proposal's system table.
func (p *Project) equipment() report.Equipment {
	c := p.Cfg
	return report.Equipment{
		ModulePowerW: c.Module.PowerW, ModuleLengthM: c.Module.LengthM, ModuleWidthM: c.Module.WidthM,
		CellsSeries: int(c.Module.CellsSeries), HalfCut: c.Module.HalfCut, BypassDiodes: int(c.Module.BypassDiodes),
		Inverters: p.Inverters(), InverterACW: c.Inverter.ACPowerW, InverterInputs: int(c.Inverter.Inputs), InverterMaxDCV: c.Inverter.MaxDCVoltageV,
		MPPTMinV: c.Inverter.MPPTMinV, MPPTMaxV: c.Inverter.MPPTMaxV,
	}
}

// hourlyTable takes, for each weather record, the weather itself, the sun as the model took
// it, the mean sunlit share of the modules (Model.Shade), each face's unshaded and each
// string's shaded plane-of-array irradiance, the layout's mean cell temperature and the best
// layout's DC and AC energy per sun-up step (electric.YearResult.StepDCWh and StepACWh,
// mapped to records by Model.StepRecord) as mean power.
func hourlyTable(m *yield.Model, best RankedLayout) report.HourlyTable {
	hours := 1.0
	if m.In.Weather != nil && m.In.Weather.Interval > 0 {
		hours = m.In.Weather.Interval.Hours()
	}
	n := len(m.In.Modules)
	var t report.HourlyTable
	// Faces in the order their modules come; each face's modules share one plane.
	faceOf := make([]int, n)
	faceIdx := map[string]int{}
	for k, mod := range m.In.Modules {
		i, ok := faceIdx[mod.Face]
		if !ok {
			i = len(t.Faces)
			faceIdx[mod.Face] = i
			t.Faces = append(t.Faces, mod.Face)
		}
		faceOf[k] = i
	}
	var strs [][]int
	var used []int
	plant := m.In.System.Plant()
	for a, in := range best.Result.Layout.Inputs {
		k, j := plant.Locate(a)
		for b, str := range in {
			// "<input>.<string>", and "<inverter>.<input>.<string>" with several inverters.
			label := fmt.Sprintf("%d.%d", j+1, b+1)
			if len(plant) > 1 {
				label = fmt.Sprintf("%d.%s", k+1, label)
			}
			t.Strings = append(t.Strings, label)
			strs = append(strs, str)
			used = append(used, str...)
		}
	}
	nan := math.NaN()
	t.Rows = make([]report.HourlyRow, len(m.Records))
	for i, r := range m.Records {
		t.Rows[i] = report.HourlyRow{EndUTC: r.End, GHI: r.GHI, DNI: r.DNI, DHI: r.DHI, AirTempC: r.AirTempC,
			SunElevDeg: nan, SunAzDeg: nan, BeamLitPct: nan, CellTempC: nan}
	}
	yr := best.Result.Year
	faceCount := make([]int, len(t.Faces))
	for _, f := range faceOf {
		faceCount[f]++
	}
	for s, rec := range m.StepRecord {
		if rec < 0 || rec >= len(t.Rows) {
			continue
		}
		row := &t.Rows[rec]
		if s < len(yr.StepACWh) {
			row.ACW = yr.StepACWh[s] / hours
		}
		if s < len(yr.StepDCWh) {
			row.DCW = yr.StepDCWh[s] / hours
		}
		if s < len(m.StepPOA) {
			row.POA = m.StepPOA[s]
		}
		if s < len(m.StepSunElevDeg) {
			row.SunElevDeg, row.SunAzDeg = m.StepSunElevDeg[s], m.StepSunAzDeg[s]
		}
		if m.Shade != nil && n > 0 {
			lit := 0.0
			for k := range m.In.Modules {
				lit += m.Shade.LitFraction(k, s)
			}
			row.BeamLitPct = 100 * lit / float64(n)
		}
		if (s+1)*n > len(m.ModulePOA) {
			continue
		}
		row.FacePOA = make([]float64, len(t.Faces))
		for k := range n {
			row.FacePOA[faceOf[k]] += float64(m.ModulePOAUnshaded[s*n+k]) / float64(faceCount[faceOf[k]])
		}
		row.StringPOA = make([]float64, len(strs))
		for j, str := range strs {
			for _, k := range str {
				row.StringPOA[j] += float64(m.ModulePOA[s*n+k]) / float64(len(str))
			}
		}
		if len(used) > 0 {
			row.CellTempC = 0
			for _, k := range used {
				row.CellTempC += float64(m.ModuleTempC[s*n+k]) / float64(len(used))
			}
		}
	}
	return t
}

// ringOf copies a ring of local east-north metres into plain pairs.
func ringOf(r orb.Ring) [][2]float64 {
	out := make([][2]float64, len(r))
	for i, p := range r {
		out[i] = [2]float64(p)
	}
	return out
}

// SkyView is the sun-path chart's input for one module by id: the sun's paths over a typical
// year and the silhouettes of everything that stands above the module's horizon.
func (p *Project) SkyView(moduleID string) (*report.SunPath, error) {
	idx := -1
	ids := make([]string, 0, len(p.Modules))
	for i, m := range p.Modules {
		if m.ID == moduleID {
			idx = i
		}
		ids = append(ids, m.ID)
	}
	if idx < 0 {
		return nil, badInput{fmt.Errorf("module %q: no such module on %s; modules: %s", moduleID, p.Cfg.File, strings.Join(ids, ", "))}
	}
	sc, err := shading.NewScene(p.Site, p.Modules, shading.Options{Horizon: p.Horizon, Workers: 1})
	if err != nil {
		return nil, fmt.Errorf("sky view: %w", err)
	}
	const step = 1.0 // degrees of azimuth: finer than a chimney seen from a few metres
	return &report.SunPath{
		Observer: p.Observer, Zone: p.Cfg.Zone, Year: weather.TypicalYear,
		Outlines: sc.Silhouette(idx, step), AzStepDeg: step, Module: moduleID,
		ShadeLossPct: -1,
	}, nil
}
