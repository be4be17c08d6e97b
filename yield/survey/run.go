package survey

import (
	"context"
	"fmt"
	"strings"

	"sunstring/yield"
	"sunstring/yield/electric"
	"sunstring/yield/irradiance"
	"sunstring/yield/report"
	"sunstring/yield/weather"
)

// Options shape a survey run. The zero value runs silently.
type Options struct {
	// Progress, when set, is told that done of total units of a named stage are finished.
	// It may be called from several goroutines at once.
	Progress func(stage string, done, total int)
}

// Result is a finished survey: the model of the year, the ranked layouts (best first) and
// summary.json's document, from which every report file is made (Render).
type Result struct {
	Project *Project
	Weather *weather.Series
	Model   *yield.Model
	Layouts []RankedLayout
	Summary *report.Summary
}

// badInput is a problem with the user's input: a front end reports it as such (exit status 2
// on the command line).
type badInput struct{ error }

// BadInput reports whether the error is the user's input (always).
func (badInput) BadInput() bool { return true }

// Run surveys the project: the weather year, the sun, the shade on every cell, the module
// curves, the layouts (the roof order, the user's fixed layouts and the searched ones) and
// the summary with its alternatives. It stops early when ctx is cancelled.
func (p *Project) Run(ctx context.Context, opt Options) (*Result, error) {
	if len(p.Modules) == 0 {
		return nil, p.NoModules()
	}
	if err := p.prepareLayouts(); err != nil {
		return nil, err
	}
	// One cache for the run's evaluations, let go before the report is drawn.
	p.cache = &electric.EvalCache{}
	defer func() { p.cache = nil }()
	pf, err := p.Preflight()
	if err != nil {
		return nil, err
	}
	if err := pf.Findings.Err(); err != nil {
		return nil, err
	}
	ws := pf.Weather
	sky, _ := irradiance.ParseSkyModel(strings.ToLower(p.Cfg.Model.Sky))
	mounting := p.Mounting()
	iam := yield.IAMMartinRuiz
	if strings.EqualFold(p.Cfg.Model.IAM, "ashrae") {
		iam = yield.IAMASHRAE
	}
	in := yield.Input{
		Site: p.Site, Modules: p.Modules, Weather: ws, Observer: p.Observer, Zone: p.Cfg.Zone,
		Horizon: p.Horizon, Progress: opt.Progress,
		System: yield.System{
			Module: p.Datasheet, Inverter: p.Inverter, Inverters: p.Inverters(), Albedo: p.Cfg.Climate.Albedo, Sky: sky, IAM: iam,
			Mounting: mounting,
			Losses: yield.Losses{
				SoilingPct: p.Cfg.Losses.SoilingPct, WiringPct: p.Cfg.Losses.WiringPct,
				MismatchPct: p.Cfg.Losses.MismatchPct, AvailabilityPct: p.Cfg.Losses.AvailabilityPct,
			},
		},
	}
	model, err := yield.Prepare(ctx, in)
	if err != nil {
		return nil, err
	}
	layouts, err := p.layouts(ctx, model)
	if err != nil {
		return nil, err
	}
	sum := p.summary(model, pf, layouts)
	if sum.Alternatives, err = p.alternatives(model, layouts); err != nil {
		return nil, err
	}
	if err := ctx.Err(); err != nil {
		return nil, fmt.Errorf("survey: %w", err)
	}
	return &Result{Project: p, Weather: ws, Model: model, Layouts: layouts, Summary: sum}, nil
}
