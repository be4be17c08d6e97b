package cli

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/spf13/pflag"

	"sunstring/cmd/sunstring/internal/config"
	"sunstring/geo"
	"sunstring/shading"
	"sunstring/shading/sun"
	"sunstring/yield/electric"
	"sunstring/yield/layout"
	"sunstring/yield/weather"
)

// inputError is a problem with a file the user named.
type inputError struct{ error }

func (inputError) BadInput() bool { return true }

// maxInputBytes bounds what is read of any one input file: a map or a weather year is a few
// megabytes; anything far larger is a mistake and must not exhaust memory.
const maxInputBytes = 64 << 20

// readInput reads a user's file whole, with a clear message when it is missing, a folder or
// too large.
func readInput(path, what string) ([]byte, error) {
	st, err := os.Stat(path)
	if err != nil {
		var pe *os.PathError
		if errors.As(err, &pe) {
			return nil, inputError{fmt.Errorf("%s: cannot read the %s: %v", path, what, pe.Err)}
		}
		return nil, inputError{fmt.Errorf("%s: cannot read the %s: %w", path, what, err)}
	}
	if st.IsDir() {
		return nil, inputError{fmt.Errorf("%s: the %s is a folder, not a file", path, what)}
	}
	if st.Size() > maxInputBytes {
		return nil, inputError{fmt.Errorf("%s: the %s is %d MB; at most %d MB is accepted", path, what, st.Size()>>20, maxInputBytes>>20)}
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, inputError{fmt.Errorf("%s: cannot read the %s: %w", path, what, err)}
	}
	return b, nil
}

// project is a loaded site: the file, the map, the placed modules and the weather.
type project struct {
	Cfg            *config.Site
	Site           *geo.Site
	Modules        []geo.Module
	Notes          []string
	Datasheet      electric.Datasheet
	Inverter       electric.Inverter
	Observer       sun.Observer
	Horizon        *shading.Horizon
	LatDeg, LonDeg float64

	// Set by prepareLayouts: the string bounds and the user's fixed layouts as indices.
	bounds   layout.Bounds
	fixed    []electric.Layout
	boundsOK bool
}

// siteFlags are the flags that override site-file keys, shared by the commands that read one.
func bindSiteFlags(f *pflag.FlagSet) map[string]string {
	f.String("weather", "", "weather file (EPW or CSV), relative to the current folder; overrides climate.file")
	f.String("orientation", "", "module orientation: portrait, landscape or best (overrides fill.orientation)")
	f.Float64("setback", 0, "setback from every roof edge, m (overrides fill.setback_m)")
	f.String("sky", "", "sky model: perez, hay-davies or isotropic (overrides model.sky)")
	return map[string]string{"climate.file": "weather", "fill.orientation": "orientation", "fill.setback_m": "setback", "model.sky": "sky"}
}

// loadProject reads and validates the site file, the map and (optionally) the horizon, and
// places the modules. Every problem found is reported, not just the first.
func loadProject(path string, flags *pflag.FlagSet, bind map[string]string) (*project, error) {
	cfg, err := config.Load(path, flags, bind)
	if err != nil {
		return nil, err
	}
	p := &project{Cfg: cfg}
	mapPath := cfg.Path(cfg.Map)
	raw, err := readInput(mapPath, "map")
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
	lon, lat, _ := site.Proj.Inverse(geo.Vec3{})
	p.LatDeg, p.LonDeg = lat, lon
	elev := 0.0
	if cfg.ElevationM != nil {
		elev = *cfg.ElevationM
	}
	p.Observer = sun.Observer{LatDeg: lat, LonDeg: lon, ElevationM: elev}
	if cfg.Horizon != "" {
		hp := cfg.Path(cfg.Horizon)
		hb, err := readInput(hp, "horizon profile")
		if err != nil {
			return nil, err
		}
		if p.Horizon, err = shading.ReadHorizon(bytes.NewReader(hb), hp); err != nil {
			return nil, err
		}
	}
	m := cfg.Module
	p.Datasheet = electric.Datasheet{
		PowerW: m.PowerW, VocV: m.VocV, IscA: m.IscA, VmpV: m.VmpV, ImpA: m.ImpA,
		TempCoeffVocPct: m.TempCoeffVocPct, TempCoeffIscPct: m.TempCoeffIscPct, TempCoeffPmaxPct: m.TempCoeffPmaxPct,
		CellsSeries: int(m.CellsSeries), BypassDiodes: int(m.BypassDiodes), HalfCut: m.HalfCut,
	}
	if err := p.Datasheet.Validate(); err != nil {
		return nil, inputError{fmt.Errorf("%s: module: %w", path, err)}
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
		return nil, inputError{fmt.Errorf("%s: module: %w", path, err)}
	}
	fitNotes := electric.FitWarnings(p.Datasheet, mod.Params())
	cols, rows := mod.Grid()
	orient, err := geo.ParseOrientation(cfg.Fill.Orientation)
	if err != nil {
		return nil, inputError{fmt.Errorf("%s: fill.orientation: %w", path, err)}
	}
	mods, notes, err := geo.Fill(site, geo.FillOptions{
		LengthM: m.LengthM, WidthM: m.WidthM, Grid: geo.CellGrid{Cols: cols, Rows: rows},
		Orientation: orient, SetbackM: cfg.Fill.SetbackM, GapM: cfg.Fill.GapM,
		ObstacleClearanceM: cfg.Fill.ClearanceM, MinModules: int(cfg.Fill.MinModules),
	})
	if err != nil {
		return nil, err
	}
	p.Modules, p.Notes = mods, append(fitNotes, notes...)
	if w := zoneWarning(cfg, lon); w != "" {
		p.Notes = append(p.Notes, w)
	}
	return p, nil
}

// loadWeather returns the weather year the site file asks for, and what it is.
func (p *project) loadWeather() (*weather.Series, error) {
	cfg := p.Cfg
	ws := weather.Site{LatDeg: p.LatDeg, LonDeg: p.LonDeg, ElevationM: p.Observer.ElevationM, Zone: cfg.Zone}
	var temps *[12]float64
	if len(cfg.Climate.MonthlyT) == 12 {
		var t [12]float64
		copy(t[:], cfg.Climate.MonthlyT)
		temps = &t
	}
	switch {
	case cfg.Climate.File != "":
		wp := cfg.Path(cfg.Climate.File)
		b, err := readInput(wp, "weather file")
		if err != nil {
			return nil, err
		}
		var s *weather.Series
		switch strings.ToLower(filepath.Ext(wp)) {
		case ".epw":
			s, err = weather.ReadEPW(bytes.NewReader(b), wp)
		case ".csv":
			s, err = weather.ReadCSVAt(bytes.NewReader(b), wp, ws)
		default:
			return nil, inputError{fmt.Errorf("%s: climate.file: the weather file must end in .epw or .csv", cfg.File)}
		}
		if err != nil {
			return nil, err
		}
		// Annual figures need one whole year: a partial year would understate them and
		// several years would add up to more than one.
		if n := len(s.Records); s.Interval != time.Hour || n < 8760 || n > 8784 {
			return nil, inputError{fmt.Errorf("%s: %d records of %v; a survey needs one whole year of hourly records (8760, or 8784 in a leap year)", wp, n, s.Interval)}
		}
		s.Warnings = append(s.Warnings, s.CheckSite(ws)...)
		return s, nil
	case len(cfg.Climate.MonthlyGHI) == 12:
		var g, t [12]float64
		copy(g[:], cfg.Climate.MonthlyGHI)
		var note string
		if temps != nil {
			t = *temps
		} else {
			t = defaultTemps(p.LatDeg)
			note = "climate.monthly_temp_c is not given: a plain seasonal cycle of 12 °C ± 9 K is assumed; give the site's monthly mean temperatures, since cell temperature moves the yield by several percent"
		}
		s, err := weather.FromMonthly(ws, g, t)
		if err == nil && note != "" {
			s.Warnings = append(s.Warnings, note)
		}
		return s, err
	default:
		return weather.ClearSky(ws, temps), nil
	}
}

// defaultTemps is a plain seasonal cycle for when monthly GHI is given without temperatures:
// 12 °C mean with a ±9 K swing peaking in the local summer (common practice for a
// temperate site; it moves the yield by about 1 %).
func defaultTemps(latDeg float64) [12]float64 {
	var t [12]float64
	peak := 6.5 // mid-July in the north
	if latDeg < 0 {
		peak = 0.5
	}
	for i := range t {
		t[i] = 12 + 9*math.Cos(2*math.Pi*(float64(i)+0.5-peak)/12)
	}
	return t
}

// noModules says why no module was placed: no roof face at all, or the faces' own notes
// (too small for the module at this setback, skipped below the minimum count).
func (p *project) noModules(mapFile string) error {
	if len(p.Site.Faces) == 0 {
		return inputError{fmt.Errorf("%s: the map has no roof face (a feature with \"kind\": \"roof\"); there is nothing to place modules on", mapFile)}
	}
	why := "check the faces, the setback and the module size"
	if len(p.Notes) > 0 {
		why = strings.Join(p.Notes, "; ")
	}
	return inputError{fmt.Errorf("%s: no module fits on any roof face (module %.2f × %.2f m, setback %.2f m): %s",
		mapFile, p.Cfg.Module.LengthM, p.Cfg.Module.WidthM, p.Cfg.Fill.SetbackM, why)}
}

// zoneWarning flags a time zone whose standard offset is far from the site's longitude (15°
// an hour): a likely wrong zone, which would shift every hour of a weather file. Zones
// legitimately stray up to about 2 hours (common practice: western Europe, western China), so
// only more than that is flagged.
func zoneWarning(cfg *config.Site, lonDeg float64) string {
	if cfg.Zone == nil {
		return ""
	}
	_, jan := time.Date(weather.TypicalYear, 1, 15, 12, 0, 0, 0, cfg.Zone).Zone()
	_, jul := time.Date(weather.TypicalYear, 7, 15, 12, 0, 0, 0, cfg.Zone).Zone()
	std := float64(min(jan, jul)) / 3600
	d := math.Mod(lonDeg/15-std+36, 24) - 12 // hours, wrapped to (−12, 12]
	if math.Abs(d) > 2.5 {
		return fmt.Sprintf("timezone %s (UTC%+.1f h standard) is %.1f hours from the site's longitude %.2f°; check the zone: a wrong one shifts every hour of a weather file", cfg.Timezone, std, d, lonDeg)
	}
	return ""
}

// IndicativeWarning is printed wherever an indicative clear-sky year stands in for a climate.
const IndicativeWarning = "INDICATIVE ONLY: no climate data was given, so this estimate uses a clear-sky year without clouds; real yields are lower. Add climate.file or monthly values to the site file."
