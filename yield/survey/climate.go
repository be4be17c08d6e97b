package survey

import (
	"bytes"
	"fmt"
	"path/filepath"
	"strings"
	"sunstring/yield/weather"
)

// Weather returns the weather year the site file asks for, and what it is: a weather file, a
// synthetic year from monthly values, or an indicative clear-sky year.
func (p *Project) Weather() (*weather.Series, error) {
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
		b, err := p.read(wp, "weather file")
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
			return nil, badInput{fmt.Errorf("%s: climate.file: the weather file must end in .epw or .csv", cfg.File)}
		}
		if err != nil {
			return nil, err
		}
		// Annual figures need one whole year: a partial year would understate them and
		// several years would add up to more than one.
		if err := s.CheckYear(wp); err != nil {
			return nil, err
		}
		if err := s.CheckClearSky(wp, ws); err != nil {
			return nil, err
		}
		s.Warnings = append(s.Warnings, s.CheckSite(ws)...)
		if w := s.NoonWarning(wp, p.Observer); w != "" {
			s.Warnings = append(s.Warnings, w)
		}
		return s, nil
	case len(cfg.Climate.MonthlyGHI) == 12:
		var g, t [12]float64
		copy(g[:], cfg.Climate.MonthlyGHI)
		var note string
		if temps != nil {
			t = *temps
		} else {
			t = weather.DefaultTemps(p.LatDeg)
			note = "climate.monthly_temp_c is not given: the temperatures of a temperate mid-latitude climate are assumed (0 to 19.5 °C from the coldest to the warmest month); give the site's monthly mean temperatures, since cell temperature moves the yield by several percent"
		}
		if err := weather.CheckMonthly(ws, cfg.File+": climate", g, t); err != nil {
			return nil, err
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

// NoModules says why no module was placed: no roof face at all, or the faces' own notes
// (too small for the module at this setback, skipped below the minimum count).
func (p *Project) NoModules() error {
	mapFile := p.Cfg.Path(p.Cfg.Map)
	if len(p.Site.Faces) == 0 {
		return badInput{fmt.Errorf("%s: the map has no roof face (a feature with \"kind\": \"roof\"); there is nothing to place modules on", mapFile)}
	}
	why := "check the faces, the setback and the module size"
	if len(p.Notes) > 0 {
		why = strings.Join(p.Notes, "; ")
	}
	return badInput{fmt.Errorf("%s: no module fits on any roof face (module %.2f × %.2f m, setback %.2f m): %s",
		mapFile, p.Cfg.Module.LengthM, p.Cfg.Module.WidthM, p.Cfg.Fill.SetbackM, why)}
}

// IndicativeWarning is printed wherever an indicative clear-sky year stands in for a climate.
const IndicativeWarning = "INDICATIVE ONLY: no climate data was given, so this estimate uses a clear-sky year without clouds; real yields are lower. Add climate.file or monthly values to the site file."
