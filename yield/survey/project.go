package survey

import (
	"bytes"
	"errors"
	"fmt"
	"sunstring/geo"
	"sunstring/shading"
	"sunstring/shading/sun"
	"sunstring/yield/electric"
	"sunstring/yield/finding"
	"sunstring/yield/layout"
	"sunstring/yield/report"
)

// ReadFunc returns the whole content of the input file at path; what names the file for
// messages ("map", "weather file", "horizon profile"). The front end decides how files are
// opened (size limits, which kinds of file are refused); a problem with the file should be an
// error whose BadInput method reports true.
type ReadFunc func(path, what string) ([]byte, error)

// Project is a loaded site: the site file, the map, the placed modules and the electrical
// equipment. Load makes one; Run surveys it.
type Project struct {
	Cfg     *Config
	Site    *geo.Site
	Modules []geo.Module
	Notes   []string
	// Findings are what Load found worth saying about the site file and the map: the map's
	// warnings, blocks hidden below their roof, the module's size against its power, the
	// inverter against the array, the time zone against the coordinates. A Fail among them
	// stops Run; `check` prints them all.
	Findings       finding.List
	Datasheet      electric.Datasheet
	Inverter       electric.Inverter
	Observer       sun.Observer
	Horizon        *shading.Horizon
	LatDeg, LonDeg float64

	// Set by prepareLayouts: the string bounds and the user's fixed layouts as indices.
	bounds   layout.Bounds
	fixed    []electric.Layout
	boundsOK bool
	read     ReadFunc
	// Set by layouts: which layout to wire and why.
	advice *report.LayoutAdvice
	// cache serves every layout evaluation of a run (the search, its screen, the listed
	// layouts, the alternatives), so that the memory the kept inputs and strings take is
	// bounded once for the run.
	cache *electric.EvalCache
}

// evalCache returns the run's evaluation cache.
func (p *Project) evalCache() *electric.EvalCache {
	if p.cache == nil {
		p.cache = &electric.EvalCache{}
	}
	return p.cache
}

// Inverters returns how many inverters of the model share the modules (inverter.count).
func (p *Project) Inverters() int { return max(int(p.Cfg.Inverter.Count), 1) }

// Plant returns the inverters.
func (p *Project) Plant() electric.Plant { return electric.Identical(p.Inverter, p.Inverters()) }

// inputs returns how many inputs all the inverters have together: the layouts' inputs, the
// first inverter's first (electric.Plant.Split).
func (p *Project) inputs() int { return p.Inverters() * p.Inverter.Inputs }

// inputsText says how many inputs the inverters have, as messages give it: "2 inputs", or
// "2 inverters × 12 inputs".
func (p *Project) inputsText() string {
	in := report.Count(p.Inverter.Inputs, "input", "inputs")
	if n := p.Inverters(); n > 1 {
		return fmt.Sprintf("%d inverters × %s", n, in)
	}
	return in
}

// Load reads the map and (optionally) the horizon that a validated site file names, through
// read, checks the module and the inverter, and places the modules. Every problem found is
// reported, not just the first.
func Load(cfg *Config, read ReadFunc) (*Project, error) {
	if cfg == nil || read == nil {
		return nil, errors.New("survey: Load needs a site configuration and a ReadFunc")
	}
	path := cfg.File
	p := &Project{Cfg: cfg, read: read}
	mapPath := cfg.Path(cfg.Map)
	raw, err := read(mapPath, "map")
	if err != nil {
		return nil, err
	}
	site, err := geo.Decode(bytes.NewReader(raw), geo.DecodeOptions{
		File: mapPath, OriginLonDeg: cfg.Longitude, OriginLatDeg: cfg.Latitude, ElevationM: cfg.ElevationM,
	})
	if err != nil {
		return nil, err
	}
	p.Site = site
	if err := p.loadSurroundings(read); err != nil {
		return nil, err
	}
	lon, lat, _ := site.Proj.Inverse(geo.Vec3{})
	p.LatDeg, p.LonDeg = lat, lon
	elev := 0.0
	if cfg.ElevationM != nil {
		elev = *cfg.ElevationM
	}
	p.Observer = sun.Observer{LatDeg: lat, LonDeg: lon, ElevationM: elev}
	if cfg.Horizon != "" {
		hp := cfg.Path(cfg.Horizon)
		hb, err := read(hp, "horizon profile")
		if err != nil {
			return nil, err
		}
		if p.Horizon, err = shading.ReadHorizon(bytes.NewReader(hb), hp); err != nil {
			return nil, err
		}
	}
	p.Datasheet = cfg.Datasheet()
	if err := p.Datasheet.Validate(); err != nil {
		return nil, badInput{fmt.Errorf("%s: module: %w", path, err)}
	}
	inv := cfg.Inverter
	p.Inverter = electric.Inverter{
		ACPowerW: inv.ACPowerW, MaxDCVoltageV: inv.MaxDCVoltageV, MPPTMinV: inv.MPPTMinV, MPPTMaxV: inv.MPPTMaxV,
		Inputs: int(inv.Inputs), MaxInputCurrentA: inv.MaxInputCurrentA, NightW: inv.NightW,
	}
	for _, pt := range inv.Curve {
		p.Inverter.Efficiency = append(p.Inverter.Efficiency, electric.EffPoint{LoadFrac: pt[0], Eff: pt[1]})
	}
	mod, err := electric.NewModule(p.Datasheet)
	if err != nil {
		return nil, badInput{fmt.Errorf("%s: module: %w", path, err)}
	}
	fitNotes := electric.FitWarnings(p.Datasheet, mod.Params())
	cols, rows := mod.Grid()
	orient, err := geo.ParseOrientation(cfg.Fill.Orientation)
	if err != nil {
		return nil, badInput{fmt.Errorf("%s: fill.orientation: %w", path, err)}
	}
	mods, notes, err := geo.Fill(site, geo.FillOptions{
		LengthM: cfg.Module.LengthM, WidthM: cfg.Module.WidthM, Grid: geo.CellGrid{Cols: cols, Rows: rows},
		Orientation: orient, SetbackM: cfg.Fill.SetbackM, GapM: cfg.Fill.GapM,
		ObstacleClearanceM: cfg.Fill.ClearanceM, MinModules: int(cfg.Fill.MinModules),
	})
	if err != nil {
		return nil, err
	}
	p.Modules, p.Notes = mods, append(fitNotes, notes...)
	p.Findings = p.loadFindings(mapPath, fitNotes, notes)
	return p, nil
}
