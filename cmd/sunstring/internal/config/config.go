package config

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"time"

	"github.com/go-viper/mapstructure/v2"
	"github.com/spf13/pflag"
	"github.com/spf13/viper"
)

// Site is the decoded site file.
type Site struct {
	Name       string   `mapstructure:"name"`
	Map        string   `mapstructure:"map"`
	Timezone   string   `mapstructure:"timezone"`
	Latitude   *float64 `mapstructure:"latitude"`
	Longitude  *float64 `mapstructure:"longitude"`
	ElevationM *float64 `mapstructure:"elevation_m"`
	Horizon    string   `mapstructure:"horizon"` // optional far-horizon CSV, relative to the file
	Climate    Climate  `mapstructure:"climate"`
	Module     Module   `mapstructure:"module"`
	Inverter   Inverter `mapstructure:"inverter"`
	Fill       Fill     `mapstructure:"fill"`
	Layouts    Layouts  `mapstructure:"layouts"`
	Losses     Losses   `mapstructure:"losses"`
	Model      Model    `mapstructure:"model"`

	// Dir is the folder of the site file; relative paths resolve against it.
	Dir string `mapstructure:"-"`
	// File is the site file's path as given.
	File string `mapstructure:"-"`
	// Zone is the loaded Timezone.
	Zone *time.Location `mapstructure:"-"`
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
}

// Inverter is the inverter datasheet. EfficiencyPct is a number (flat) or a list of
// [load fraction, efficiency %] pairs.
type Inverter struct {
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
// inverter inputs (1-based; 0 or missing spreads them over the inputs in order).
type FixedLayout struct {
	Name    string     `mapstructure:"name"`
	Strings [][]string `mapstructure:"strings"`
	Inputs  []float64  `mapstructure:"inputs"`
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

// required are the keys with no default: a guess would change the voltages or the hours.
var required = []string{
	"map", "timezone",
	"module.power_w", "module.voc_v", "module.isc_a", "module.vmp_v", "module.imp_a",
	"module.temp_coeff_voc_pct", "module.temp_coeff_isc_pct", "module.temp_coeff_pmax_pct",
	"module.cells_series", "module.bypass_diodes", "module.length_m", "module.width_m",
	"inverter.ac_power_w", "inverter.max_dc_voltage_v", "inverter.mppt_min_v", "inverter.mppt_max_v",
	"inverter.inputs", "inverter.max_input_current_a",
}

var requiredWhy = map[string]string{
	"map":                          "the path of the GeoJSON map, relative to the site file",
	"timezone":                     "the site's IANA time zone, such as Europe/Vienna; the hours of every weather record depend on it",
	"module.power_w":               "the module's power at STC from its datasheet, W",
	"module.voc_v":                 "the module's open-circuit voltage at STC, V",
	"module.isc_a":                 "the module's short-circuit current at STC, A",
	"module.vmp_v":                 "the module's MPP voltage at STC, V",
	"module.imp_a":                 "the module's MPP current at STC, A",
	"module.temp_coeff_voc_pct":    "the datasheet's Voc temperature coefficient, %/K (it sets the cold string voltage)",
	"module.temp_coeff_isc_pct":    "the datasheet's Isc temperature coefficient, %/K",
	"module.temp_coeff_pmax_pct":   "the datasheet's Pmax temperature coefficient, %/K",
	"module.cells_series":          "the number of cells as the datasheet counts them (60, 72, 120, 144 …)",
	"module.bypass_diodes":         "the number of bypass diodes (usually 3)",
	"module.length_m":              "the module's long side, m",
	"module.width_m":               "the module's short side, m",
	"inverter.ac_power_w":          "the inverter's rated AC power, W",
	"inverter.max_dc_voltage_v":    "the inverter's maximum DC input voltage, V",
	"inverter.mppt_min_v":          "the lower end of the MPPT voltage window, V",
	"inverter.mppt_max_v":          "the upper end of the MPPT voltage window, V",
	"inverter.inputs":              "the number of MPPT inputs",
	"inverter.max_input_current_a": "the maximum current of one MPPT input, A",
}

// allKeys lists every key of the site file: the required ones, those with a default and the
// optional ones without.
func allKeys() []string {
	keys := append([]string{"latitude", "longitude", "elevation_m", "climate.monthly_ghi_kwh_m2", "climate.monthly_temp_c", "layouts.fixed"}, required...)
	for k := range defaults {
		keys = append(keys, k)
	}
	return keys
}

// defaults gives every other key a default, so that environment variables reach it.
var defaults = map[string]any{
	"name": "", "map": "", "horizon": "",
	"climate.file": "", "climate.low_temp_c": -10.0, "climate.high_temp_c": 35.0, "climate.albedo": 0.2,
	"module.power_w": 0.0, "module.voc_v": 0.0, "module.isc_a": 0.0, "module.vmp_v": 0.0, "module.imp_a": 0.0,
	"module.half_cut": false,
	"module.length_m": 0.0, "module.width_m": 0.0, "module.max_system_voltage_v": 1000.0,
	"inverter.ac_power_w": 0.0, "inverter.max_dc_voltage_v": 0.0, "inverter.mppt_min_v": 0.0,
	"inverter.mppt_max_v": 0.0, "inverter.max_input_current_a": 0.0,
	"inverter.efficiency_pct": 96.0, "inverter.night_w": 0.0, "inverter.transformerless": true,
	"fill.orientation": "portrait", "fill.setback_m": 0.3, "fill.gap_m": 0.02, "fill.clearance_m": 0.3,
	"fill.min_modules": 1.0,
	"layouts.search":   true, "layouts.keep": 5.0, "layouts.cable_weight_kwh_per_m": 0.0,
	"losses.soiling_pct": 2.0, "losses.wiring_pct": 1.0, "losses.mismatch_pct": 1.0, "losses.availability_pct": 0.5,
	"model.sky": "perez", "model.iam": "martin-ruiz",
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

// blame marks each error whose key took its value from the environment or a flag.
func blame(err error, from map[string]string) error {
	var es Errors
	switch e := err.(type) {
	case Errors:
		es = e
	case *Error:
		es = Errors{e}
	default:
		return err
	}
	for _, e := range es {
		k := e.Key
		if i := strings.IndexByte(k, '['); i >= 0 {
			k = k[:i]
		}
		if src, ok := from[k]; ok {
			e.From = src
		}
	}
	return err
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

// Load reads the site file at path with flags (may be nil) bound by key name: a flag named
// in bind overrides that key when the user set it.
func Load(path string, flags *pflag.FlagSet, bind map[string]string) (*Site, error) {
	v := viper.NewWithOptions(viper.ExperimentalBindStruct(), viper.EnvKeyReplacer(strings.NewReplacer(".", "_")))
	v.SetEnvPrefix("SUNSTRING")
	v.AutomaticEnv()
	for k, d := range defaults {
		v.SetDefault(k, d)
	}
	from := map[string]string{} // key → where its value came from, when not the file
	for _, k := range allKeys() {
		if _, set := os.LookupEnv(EnvName(k)); set {
			from[k] = "environment variable " + EnvName(k)
		}
	}
	for key, flag := range bind {
		// The environment overrides a flag (the order: file < flags < environment),
		// so a flag is bound only when its key has no SUNSTRING_ variable.
		if _, set := os.LookupEnv(EnvName(key)); set {
			continue
		}
		if f := flags.Lookup(flag); f != nil && f.Changed {
			if err := v.BindPFlag(key, f); err != nil {
				return nil, fmt.Errorf("config: bind --%s: %w", flag, err)
			}
			from[key] = "flag --" + flag
		}
	}
	v.SetConfigFile(path)
	v.SetConfigType("yaml")
	if err := v.ReadInConfig(); err != nil {
		var pe *fs.PathError
		if errors.As(err, &pe) {
			return nil, &Error{File: path, Msg: fmt.Sprintf("cannot read the site file: %v", pe.Err)}
		}
		return nil, &Error{File: path, Msg: fmt.Sprintf("not valid YAML: %v", unwrapYAML(err))}
	}
	// Keys without a sensible default must be given (in the file or the environment).
	var missing Errors
	for _, k := range required {
		if !v.IsSet(k) {
			missing = append(missing, &Error{File: path, Key: k, Msg: "missing: " + requiredWhy[k]})
		}
	}
	var s Site
	err := v.Unmarshal(&s, func(c *mapstructure.DecoderConfig) {
		c.ErrorUnused = true
		c.WeaklyTypedInput = true
		c.DecodeHook = mapstructure.ComposeDecodeHookFunc(c.DecodeHook, rejectLossyFloat)
	})
	if err != nil {
		return nil, blame(decodeErrors(path, err), from)
	}
	if len(missing) > 0 {
		return nil, missing
	}
	s.File = path
	s.Dir = filepath.Dir(path)
	// A path typed on the command line or set in the environment is the user's, relative to
	// where they are; only the file's own paths are relative to the file.
	for key, p := range map[string]*string{"map": &s.Map, "horizon": &s.Horizon, "climate.file": &s.Climate.File} {
		if _, ok := from[key]; ok && *p != "" && !filepath.IsAbs(*p) {
			if abs, err := filepath.Abs(*p); err == nil {
				*p = abs
			}
		}
	}
	if errs := s.Validate(); len(errs) > 0 {
		return nil, blame(errs, from)
	}
	return &s, nil
}

// EnvName is the environment variable that sets a key: SUNSTRING_ and the key path
// upper-cased, dots as underscores (climate.file → SUNSTRING_CLIMATE_FILE).
func EnvName(key string) string {
	return "SUNSTRING_" + strings.ToUpper(strings.ReplaceAll(key, ".", "_"))
}

// rejectLossyFloat keeps a fractional number out of a bool or string field, where weak typing
// would turn it into something the user did not write.
func rejectLossyFloat(from, to reflect.Type, data any) (any, error) {
	if to.Kind() == reflect.Bool {
		switch data.(type) {
		case bool:
		case string:
			b := strings.ToLower(data.(string))
			if b != "true" && b != "false" {
				return nil, fmt.Errorf("%q is not true or false", data)
			}
		default:
			return nil, fmt.Errorf("%v is not true or false", data)
		}
	}
	return data, nil
}

func unwrapYAML(err error) string {
	msg := err.Error()
	if i := strings.Index(msg, "yaml: "); i >= 0 {
		return msg[i:]
	}
	return msg
}

// decodeErrors splits mapstructure's joined message into one Error a key.
func decodeErrors(path string, err error) error {
	var out Errors
	for _, line := range strings.Split(err.Error(), "\n") {
		line = strings.TrimSpace(strings.TrimPrefix(strings.TrimSpace(line), "*"))
		if line == "" || strings.HasPrefix(line, "decoding failed due to") || strings.HasSuffix(line, "error(s) decoding:") {
			continue
		}
		if strings.HasPrefix(line, "has invalid keys: ") {
			for _, k := range strings.Split(strings.TrimPrefix(line, "has invalid keys: "), ", ") {
				out = append(out, &Error{File: path, Key: k, Msg: "unknown key (see the site file reference in README.md)"})
			}
			continue
		}
		if i := strings.Index(line, "' has invalid keys: "); i >= 0 && strings.HasPrefix(line, "'") {
			parent := line[1:i]
			for _, k := range strings.Split(line[i+len("' has invalid keys: "):], ", ") {
				out = append(out, &Error{File: path, Key: parent + "." + k, Msg: "unknown key (see the site file reference in README.md)"})
			}
			continue
		}
		if strings.HasPrefix(line, "'") {
			if j := strings.Index(line[1:], "'"); j >= 0 {
				out = append(out, &Error{File: path, Key: line[1 : j+1], Msg: plainDecodeMsg(strings.TrimSpace(line[j+2:]))})
				continue
			}
		}
		out = append(out, &Error{File: path, Msg: line})
	}
	if len(out) == 0 {
		return &Error{File: path, Msg: err.Error()}
	}
	return out
}

// plainDecodeMsg turns the decoder's words for a value of the wrong type into a surveyor's.
func plainDecodeMsg(msg string) string {
	switch {
	case strings.Contains(msg, "'float64'"), strings.Contains(msg, "ParseFloat"):
		return "must be a number (" + msg + ")"
	case strings.Contains(msg, "'bool'"), strings.Contains(msg, "ParseBool"):
		return "must be true or false (" + msg + ")"
	case strings.Contains(msg, "'string'"):
		return "must be text (" + msg + ")"
	case strings.Contains(msg, "expected type '[]"), strings.Contains(msg, "source data must be an array"):
		return "must be a list (" + msg + ")"
	}
	return msg
}

// Validate checks every value's range and returns one Error per problem.
func (s *Site) Validate() Errors {
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
	positive("module.power_w", m.PowerW, " W")
	positive("module.voc_v", m.VocV, " V")
	positive("module.isc_a", m.IscA, " A")
	positive("module.vmp_v", m.VmpV, " V")
	positive("module.imp_a", m.ImpA, " A")
	if m.VmpV >= m.VocV && m.VocV > 0 {
		bad("module.vmp_v", "%g must be below voc_v (%g)", m.VmpV, m.VocV)
	}
	if m.ImpA >= m.IscA && m.IscA > 0 {
		bad("module.imp_a", "%g must be below isc_a (%g)", m.ImpA, m.IscA)
	}
	if m.VmpV > 0 && m.ImpA > 0 && m.PowerW > 0 && math.Abs(m.VmpV*m.ImpA-m.PowerW) > 0.03*m.PowerW {
		bad("module.power_w", "%g W disagrees with vmp_v × imp_a = %.1f W by more than 3 %%", m.PowerW, m.VmpV*m.ImpA)
	}
	rng("module.temp_coeff_voc_pct", m.TempCoeffVocPct, -1, 0, " %/K")
	rng("module.temp_coeff_isc_pct", m.TempCoeffIscPct, -0.1, 0.5, " %/K")
	rng("module.temp_coeff_pmax_pct", m.TempCoeffPmaxPct, -1, 0, " %/K")
	whole("module.cells_series", m.CellsSeries, 12, 216)
	whole("module.bypass_diodes", m.BypassDiodes, 1, 6)
	if m.HalfCut && int(m.CellsSeries)%2 != 0 {
		bad("module.cells_series", "%g half-cells cannot form two equal halves", m.CellsSeries)
	}
	rng("module.length_m", m.LengthM, 0.3, 3, " m")
	rng("module.width_m", m.WidthM, 0.2, 2, " m")
	if m.WidthM > m.LengthM {
		bad("module.width_m", "%g m is more than length_m (%g m): width is the short side", m.WidthM, m.LengthM)
	}
	rng("module.max_system_voltage_v", m.MaxSystemVoltage, 50, 1500, " V")
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
	}
	l := s.Losses
	rng("losses.soiling_pct", l.SoilingPct, 0, 50, " %")
	rng("losses.wiring_pct", l.WiringPct, 0, 20, " %")
	rng("losses.mismatch_pct", l.MismatchPct, 0, 20, " %")
	rng("losses.availability_pct", l.AvailabilityPct, 0, 50, " %")
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
		if x <= 50 || x > 100 {
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
		if !ok1 || !ok2 || lf <= 0 || lf > 1.2 || e <= 0 || e > 100 {
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
func (s *Site) Path(p string) string {
	if p == "" || filepath.IsAbs(p) {
		return p
	}
	return filepath.Join(s.Dir, p)
}

// Exists reports whether a regular file is at p.
func Exists(p string) bool {
	st, err := os.Stat(p)
	return err == nil && st.Mode().IsRegular()
}
