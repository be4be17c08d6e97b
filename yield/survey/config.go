package survey

import (
	"fmt"
	"sunstring/yield/report"

	"math"
	"path/filepath"
	"strings"
	"sunstring/geo"
	"time"

	"sunstring/yield/electric"
	"sunstring/yield/irradiance"
)

// Config is the decoded site file: the site, its climate, the module, the inverter, the fill
// rules, the layouts to compare and the loss factors. Its zero value is not valid; a front end
// decodes the file (with its defaults) into it and calls Validate.
type Config struct {
	Name       string   `mapstructure:"name"`
	Map        string   `mapstructure:"map"`
	Timezone   string   `mapstructure:"timezone"`
	Latitude   *float64 `mapstructure:"latitude"`
	Longitude  *float64 `mapstructure:"longitude"`
	ElevationM *float64 `mapstructure:"elevation_m"`
	Horizon    string   `mapstructure:"horizon"` // optional far-horizon CSV, relative to the file
	// Surroundings lists maps of the neighbourhood (OpenStreetMap XML, or GeoJSON of blocks and
	// trees), relative to the file: their buildings and trees within SurroundingsRadiusM of the
	// roof faces become obstacles.
	Surroundings        []string `mapstructure:"surroundings"`
	SurroundingsRadiusM float64  `mapstructure:"surroundings_radius_m"`
	Climate             Climate  `mapstructure:"climate"`
	Module              Module   `mapstructure:"module"`
	Inverter            Inverter `mapstructure:"inverter"`
	Fill                Fill     `mapstructure:"fill"`
	Layouts             Layouts  `mapstructure:"layouts"`
	Losses              Losses   `mapstructure:"losses"`
	Model               Model    `mapstructure:"model"`
	Proposal            Proposal `mapstructure:"proposal"`

	// Dir is the folder of the site file; relative paths resolve against it.
	Dir string `mapstructure:"-"`
	// File is the site file's path as given.
	File string `mapstructure:"-"`
	// Zone is the loaded Timezone.
	Zone *time.Location `mapstructure:"-"`
	// Overrides are the settings that came from outside the site file (an environment
	// variable or a flag), in key order, for the record in summary.json.
	Overrides []report.Override `mapstructure:"-"`
	// Warnings are what the front end noticed while reading the settings (an environment
	// variable of the tool's prefix that names no key); the survey reports them.
	Warnings []string `mapstructure:"-"`
}

// Climate says where the weather comes from.
type Climate struct {
	File       string    `mapstructure:"file"`
	MonthlyGHI []float64 `mapstructure:"monthly_ghi_kwh_m2"`
	MonthlyT   []float64 `mapstructure:"monthly_temp_c"`
	LowTempC   float64   `mapstructure:"low_temp_c"`
	HighTempC  float64   `mapstructure:"high_temp_c"` // hottest expected air temperature
	Albedo     float64   `mapstructure:"albedo"`
}

// Module is the module datasheet.
type Module struct {
	PowerW           float64 `mapstructure:"power_w"`
	VocV             float64 `mapstructure:"voc_v"`
	IscA             float64 `mapstructure:"isc_a"`
	VmpV             float64 `mapstructure:"vmp_v"`
	ImpA             float64 `mapstructure:"imp_a"`
	TempCoeffVocPct  float64 `mapstructure:"temp_coeff_voc_pct"`
	TempCoeffIscPct  float64 `mapstructure:"temp_coeff_isc_pct"`
	TempCoeffPmaxPct float64 `mapstructure:"temp_coeff_pmax_pct"`
	CellsSeries      float64 `mapstructure:"cells_series"`
	BypassDiodes     float64 `mapstructure:"bypass_diodes"`
	HalfCut          bool    `mapstructure:"half_cut"`
	LengthM          float64 `mapstructure:"length_m"`
	WidthM           float64 `mapstructure:"width_m"`
	MaxSystemVoltage float64 `mapstructure:"max_system_voltage_v"`
	// Mounting is how the modules are fixed: rails (over a pitched roof, the default),
	// open-rack or flush; it sets the cell temperature model.
	Mounting string `mapstructure:"mounting"`
}

// MaxInverters is the most inverters the site file may give (inverter.count): enough for a
// large roof of a few hundred kilowatts with inverters of the usual sizes.
const MaxInverters = 20

// Inverter is the inverter datasheet. EfficiencyPct is a number (flat) or a list of
// [load fraction, efficiency %] pairs. Count inverters of this model share the modules (1 to
// MaxInverters; Defaults gives 1).
type Inverter struct {
	Count            float64 `mapstructure:"count"`
	ACPowerW         float64 `mapstructure:"ac_power_w"`
	MaxDCVoltageV    float64 `mapstructure:"max_dc_voltage_v"`
	MPPTMinV         float64 `mapstructure:"mppt_min_v"`
	MPPTMaxV         float64 `mapstructure:"mppt_max_v"`
	Inputs           float64 `mapstructure:"inputs"`
	MaxInputCurrentA float64 `mapstructure:"max_input_current_a"`
	EfficiencyPct    any     `mapstructure:"efficiency_pct"`
	NightW           float64 `mapstructure:"night_w"`
	Transformerless  bool    `mapstructure:"transformerless"`

	// Curve is EfficiencyPct decoded: pairs of load fraction and efficiency (0..1).
	Curve [][2]float64 `mapstructure:"-"`
}

// Fill is how modules are placed on each face.
type Fill struct {
	Orientation string  `mapstructure:"orientation"`
	SetbackM    float64 `mapstructure:"setback_m"`
	GapM        float64 `mapstructure:"gap_m"`
	ClearanceM  float64 `mapstructure:"clearance_m"` // around blocks on a face
	MinModules  float64 `mapstructure:"min_modules"`
}

// Layouts is the string-layout search and the user's own layouts.
type Layouts struct {
	Search bool `mapstructure:"search"`
	// LeaveOut lets the search leave modules unconnected when that yields more.
	LeaveOut bool          `mapstructure:"leave_out"`
	Keep     float64       `mapstructure:"keep"`
	Fixed    []FixedLayout `mapstructure:"fixed"`
	// CableWeight is the energy, in kWh a year, that one extra metre of string cable is worth
	// in the ranking (0: cable length is reported, not weighed).
	CableWeight float64 `mapstructure:"cable_weight_kwh_per_m"`
}

// FixedLayout is a layout drawn by the user: strings of module ids, optionally assigned to
// inverter inputs (1-based, each inverter's own; missing spreads them over the inputs in
// order) and, with several inverters, to inverters (1-based; missing spreads them over the
// inverters in turn, and then inputs must be missing too).
type FixedLayout struct {
	Name      string     `mapstructure:"name"`
	Strings   [][]string `mapstructure:"strings"`
	Inputs    []float64  `mapstructure:"inputs"`
	Inverters []float64  `mapstructure:"inverters"`
}

// Losses are the usual flat loss factors, in percent.
type Losses struct {
	SoilingPct      float64 `mapstructure:"soiling_pct"`
	WiringPct       float64 `mapstructure:"wiring_pct"`
	MismatchPct     float64 `mapstructure:"mismatch_pct"`
	AvailabilityPct float64 `mapstructure:"availability_pct"`
}

// Model selects the published models used.
type Model struct {
	Sky string `mapstructure:"sky"` // perez | hay-davies | isotropic
	IAM string `mapstructure:"iam"` // martin-ruiz | ashrae
}

// Proposal is whom the documents are for and who made them, printed on the first page and
// in the footer; every key is optional. Date, the survey's date, also dates the documents.
type Proposal struct {
	Customer   string `mapstructure:"customer"`
	Address    string `mapstructure:"address"`
	PreparedBy string `mapstructure:"prepared_by"`
	Date       string `mapstructure:"date"`        // YYYY-MM-DD
	ValidUntil string `mapstructure:"valid_until"` // YYYY-MM-DD, not before Date
}

// Error is a problem with the site file; the command line turns it into exit status 2.
type Error struct {
	File string
	Key  string // dotted key path, empty for the whole file
	Msg  string
	// From names where the value came from when not the file: an environment variable or a
	// flag.
	From string
}

func (e *Error) Error() string {
	switch {
	case e.Key == "":
		return fmt.Sprintf("%s: %s", e.File, e.Msg)
	case e.From != "":
		return fmt.Sprintf("%s: %s (set by %s): %s", e.File, e.Key, e.From, e.Msg)
	}
	return fmt.Sprintf("%s: %s: %s", e.File, e.Key, e.Msg)
}

// BadInput reports whether the error is the user's input (always).
func (e *Error) BadInput() bool { return true }

// Errors is every problem found in one file.
type Errors []*Error

func (es Errors) Error() string {
	parts := make([]string, len(es))
	for i, e := range es {
		parts[i] = e.Error()
	}
	return strings.Join(parts, "\n")
}

// BadInput reports whether the errors are the user's input (always).
func (es Errors) BadInput() bool { return true }

// Validate checks every value's range and returns one Error per problem.
func (s *Config) Validate() Errors {
	var es Errors
	bad := func(key, format string, a ...any) {
		es = append(es, &Error{File: s.File, Key: key, Msg: fmt.Sprintf(format, a...)})
	}
	finite := func(key string, x float64) bool {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			bad(key, "%v is not a finite number", x)
			return false
		}
		return true
	}
	rng := func(key string, x, lo, hi float64, unit string) {
		if finite(key, x) && (x < lo || x > hi) {
			bad(key, "%g is outside the allowed range %g to %g%s", x, lo, hi, unit)
		}
	}
	positive := func(key string, x float64, unit string) {
		if finite(key, x) && x <= 0 {
			bad(key, "must be greater than 0%s (got %g)", unit, x)
		}
	}
	whole := func(key string, x, lo, hi float64) {
		if !finite(key, x) {
			return
		}
		if x != math.Trunc(x) {
			bad(key, "%g must be a whole number", x)
		} else if x < lo || x > hi {
			bad(key, "%g is outside the allowed range %g to %g", x, lo, hi)
		}
	}
	if s.Map == "" {
		bad("map", "missing: the path of the GeoJSON map, relative to the site file")
	}
	for i, f := range s.Surroundings {
		if _, ok := surroundingsFormat(f); !ok {
			bad(fmt.Sprintf("surroundings[%d]", i), "%q: a surroundings file is an OpenStreetMap extract (.osm) or a GeoJSON of blocks and trees (.geojson, .json)", f)
		}
	}
	rng("surroundings_radius_m", s.SurroundingsRadiusM, 1, geo.MaxExtentM, " m")
	if z, err := time.LoadLocation(s.Timezone); err != nil || s.Timezone == "" || strings.EqualFold(s.Timezone, "local") {
		bad("timezone", "%q is not an IANA time zone name such as Europe/Vienna or America/Denver", s.Timezone)
	} else {
		s.Zone = z
	}
	if s.Latitude != nil {
		rng("latitude", *s.Latitude, -90, 90, "°")
	}
	if s.Longitude != nil {
		rng("longitude", *s.Longitude, -180, 180, "°")
	}
	if (s.Latitude == nil) != (s.Longitude == nil) {
		bad("latitude", "give both latitude and longitude, or neither (then the map's centroid is used)")
	}
	if s.ElevationM != nil {
		rng("elevation_m", *s.ElevationM, -500, 9000, " m")
	}
	c := s.Climate
	if n := len(c.MonthlyGHI); n != 0 && n != 12 {
		bad("climate.monthly_ghi_kwh_m2", "has %d values; give 12, January to December", n)
	}
	for i, g := range c.MonthlyGHI {
		rng(fmt.Sprintf("climate.monthly_ghi_kwh_m2[%d]", i), g, 0, 350, " kWh/m²")
	}
	if n := len(c.MonthlyT); n != 0 && n != 12 {
		bad("climate.monthly_temp_c", "has %d values; give 12, January to December", n)
	}
	for i, t := range c.MonthlyT {
		rng(fmt.Sprintf("climate.monthly_temp_c[%d]", i), t, -60, 50, " °C")
	}
	if len(c.MonthlyT) == 12 && len(c.MonthlyGHI) == 0 && c.File == "" {
		bad("climate.monthly_ghi_kwh_m2", "missing: monthly temperatures are given without monthly GHI")
	}
	rng("climate.low_temp_c", c.LowTempC, -60, 30, " °C")
	rng("climate.high_temp_c", c.HighTempC, -20, 60, " °C")
	if c.HighTempC <= c.LowTempC {
		bad("climate.high_temp_c", "%g must be above climate.low_temp_c (%g)", c.HighTempC, c.LowTempC)
	}
	rng("climate.albedo", c.Albedo, 0, 1, "")
	m := s.Module
	// The datasheet's values are checked once, by electric.Datasheet.Problems, whose errors
	// carry the site file's keys; here only what the file's typing adds: whole numbers.
	wholeOK := func(key string, x float64) bool {
		if !finite(key, x) {
			return false
		}
		if x != math.Trunc(x) {
			bad(key, "%g must be a whole number", x)
			return false
		}
		return true
	}
	if wholeOK("module.cells_series", m.CellsSeries) && wholeOK("module.bypass_diodes", m.BypassDiodes) {
		for _, e := range s.Datasheet().Problems() {
			bad(e.Field, "%s", e.Msg)
		}
	}
	rng("module.length_m", m.LengthM, 0.3, 3, " m")
	rng("module.width_m", m.WidthM, 0.2, 2, " m")
	if m.WidthM > m.LengthM {
		bad("module.width_m", "%g m is more than length_m (%g m): width is the short side", m.WidthM, m.LengthM)
	}
	rng("module.max_system_voltage_v", m.MaxSystemVoltage, 50, 1500, " V")
	if _, err := irradiance.ParseMounting(strings.ToLower(m.Mounting)); err != nil {
		bad("module.mounting", "%q is not one of %s", m.Mounting, strings.Join(irradiance.MountingNames(), ", "))
	}
	inv := &s.Inverter
	positive("inverter.ac_power_w", inv.ACPowerW, " W")
	positive("inverter.max_dc_voltage_v", inv.MaxDCVoltageV, " V")
	positive("inverter.mppt_min_v", inv.MPPTMinV, " V")
	positive("inverter.mppt_max_v", inv.MPPTMaxV, " V")
	if inv.MPPTMaxV <= inv.MPPTMinV && inv.MPPTMinV > 0 {
		bad("inverter.mppt_max_v", "%g must be above mppt_min_v (%g)", inv.MPPTMaxV, inv.MPPTMinV)
	}
	if inv.MPPTMaxV > inv.MaxDCVoltageV && inv.MaxDCVoltageV > 0 {
		bad("inverter.mppt_max_v", "%g must not exceed max_dc_voltage_v (%g)", inv.MPPTMaxV, inv.MaxDCVoltageV)
	}
	whole("inverter.count", inv.Count, 1, MaxInverters)
	whole("inverter.inputs", inv.Inputs, 1, 12)
	positive("inverter.max_input_current_a", inv.MaxInputCurrentA, " A")
	rng("inverter.night_w", inv.NightW, 0, 100, " W")
	if curve, msg := decodeEfficiency(inv.EfficiencyPct); msg != "" {
		bad("inverter.efficiency_pct", "%s", msg)
	} else {
		inv.Curve = curve
	}
	f := s.Fill
	switch strings.ToLower(f.Orientation) {
	case "portrait", "landscape", "best":
	default:
		bad("fill.orientation", "%q is not one of portrait, landscape, best", f.Orientation)
	}
	rng("fill.setback_m", f.SetbackM, 0, 5, " m")
	rng("fill.gap_m", f.GapM, 0, 1, " m")
	rng("fill.clearance_m", f.ClearanceM, 0, 5, " m")
	whole("fill.min_modules", f.MinModules, 1, 1000)
	whole("layouts.keep", s.Layouts.Keep, 1, 50)
	rng("layouts.cable_weight_kwh_per_m", s.Layouts.CableWeight, 0, 100, " kWh/m")
	names := map[string]bool{}
	for i, fl := range s.Layouts.Fixed {
		key := fmt.Sprintf("layouts.fixed[%d]", i)
		if fl.Name == "" {
			bad(key+".name", "missing: every fixed layout needs a name")
		} else if names[fl.Name] {
			bad(key+".name", "%q is used twice", fl.Name)
		}
		names[fl.Name] = true
		if len(fl.Strings) == 0 {
			bad(key+".strings", "missing: a list of strings, each a list of module ids")
		}
		for j, st := range fl.Strings {
			if len(st) == 0 {
				bad(fmt.Sprintf("%s.strings[%d]", key, j), "is empty")
			}
		}
		if len(fl.Inputs) != 0 && len(fl.Inputs) != len(fl.Strings) {
			bad(key+".inputs", "has %d entries for %d strings; give one inverter input (1-based) per string", len(fl.Inputs), len(fl.Strings))
		}
		for j, in := range fl.Inputs {
			whole(fmt.Sprintf("%s.inputs[%d]", key, j), in, 1, inv.Inputs)
		}
		if len(fl.Inverters) != 0 && len(fl.Inverters) != len(fl.Strings) {
			bad(key+".inverters", "has %d entries for %d strings; give one inverter (1-based) per string", len(fl.Inverters), len(fl.Strings))
		}
		for j, k := range fl.Inverters {
			whole(fmt.Sprintf("%s.inverters[%d]", key, j), k, 1, max(inv.Count, 1))
		}
		if len(fl.Inputs) != 0 && len(fl.Inverters) == 0 && inv.Count > 1 {
			bad(key+".inputs", "with inverter.count %g, say which inverter each string is on (inverters: [1, 2, …], one per string, beside inputs), or give neither to spread the strings over the inverters in turn", inv.Count)
		}
	}
	l := s.Losses
	rng("losses.soiling_pct", l.SoilingPct, 0, 50, " %")
	rng("losses.wiring_pct", l.WiringPct, 0, 20, " %")
	rng("losses.mismatch_pct", l.MismatchPct, 0, 20, " %")
	rng("losses.availability_pct", l.AvailabilityPct, 0, 50, " %")
	var date time.Time
	for _, d := range []struct {
		key, v string
		t      *time.Time
	}{{"proposal.date", s.Proposal.Date, &date}, {"proposal.valid_until", s.Proposal.ValidUntil, nil}} {
		if d.v == "" {
			continue
		}
		t, err := time.Parse(time.DateOnly, d.v)
		if err != nil {
			bad(d.key, "%q is not a date written YYYY-MM-DD, such as 2026-05-04", d.v)
			continue
		}
		if d.t != nil {
			*d.t = t
		} else if !date.IsZero() && t.Before(date) {
			bad(d.key, "%s is before proposal.date (%s)", d.v, s.Proposal.Date)
		}
	}
	switch strings.ToLower(s.Model.Sky) {
	case "perez", "hay-davies", "isotropic":
	default:
		bad("model.sky", "%q is not one of perez, hay-davies, isotropic", s.Model.Sky)
	}
	switch strings.ToLower(s.Model.IAM) {
	case "martin-ruiz", "ashrae":
	default:
		bad("model.iam", "%q is not one of martin-ruiz, ashrae", s.Model.IAM)
	}
	return es
}

// decodeEfficiency turns efficiency_pct (a number, or [load fraction, %] pairs) into a curve.
func decodeEfficiency(v any) ([][2]float64, string) {
	num := func(x any) (float64, bool) {
		switch t := x.(type) {
		case float64:
			return t, true
		case int:
			return float64(t), true
		case int64:
			return float64(t), true
		}
		return 0, false
	}
	if x, ok := num(v); ok {
		if !(x > 50 && x <= 100) { // written so that NaN (".nan" in YAML) fails too
			return nil, fmt.Sprintf("%g %% is outside 50 to 100 %%", x)
		}
		return [][2]float64{{1, x / 100}}, ""
	}
	list, ok := v.([]any)
	if !ok || len(list) == 0 {
		return nil, fmt.Sprintf("%v is neither a number (percent) nor a list of [load fraction, percent] pairs", v)
	}
	var out [][2]float64
	for i, p := range list {
		pair, ok := p.([]any)
		if !ok || len(pair) != 2 {
			return nil, fmt.Sprintf("point %d is not a [load fraction, percent] pair", i+1)
		}
		lf, ok1 := num(pair[0])
		e, ok2 := num(pair[1])
		if !ok1 || !ok2 || !(lf > 0 && lf <= 1.2 && e > 0 && e <= 100) { // NaN fails too
			return nil, fmt.Sprintf("point %d %v: load fraction must be in (0, 1.2], efficiency in (0, 100] %%", i+1, pair)
		}
		if len(out) > 0 && lf <= out[len(out)-1][0] {
			return nil, fmt.Sprintf("point %d: load fractions must increase", i+1)
		}
		out = append(out, [2]float64{lf, e / 100})
	}
	return out, ""
}

// Path resolves a path from the site file against the file's folder.
func (s *Config) Path(p string) string {
	if p == "" || filepath.IsAbs(p) {
		return p
	}
	return filepath.Join(s.Dir, p)
}

// Datasheet returns the module's datasheet values as the electrical model takes them.
// Counts given as fractions are truncated; Validate reports them.
func (s *Config) Datasheet() electric.Datasheet {
	m := s.Module
	return electric.Datasheet{
		PowerW: m.PowerW, VocV: m.VocV, IscA: m.IscA, VmpV: m.VmpV, ImpA: m.ImpA,
		TempCoeffVocPct: m.TempCoeffVocPct, TempCoeffIscPct: m.TempCoeffIscPct, TempCoeffPmaxPct: m.TempCoeffPmaxPct,
		CellsSeries: int(m.CellsSeries), BypassDiodes: int(m.BypassDiodes), HalfCut: m.HalfCut,
	}
}
