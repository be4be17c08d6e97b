package config

import (
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"sort"
	"strings"
	"time"

	"github.com/go-viper/mapstructure/v2"
	"github.com/spf13/pflag"
	"github.com/spf13/viper"

	"sunstring/yield/report"
	"sunstring/yield/survey"
)

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
	keys := append([]string{"latitude", "longitude", "elevation_m", "climate.monthly_ghi_kwh_m2", "climate.monthly_temp_c", "layouts.fixed", "surroundings"}, required...)
	for k := range defaults {
		keys = append(keys, k)
	}
	return keys
}

// defaults gives every other key a default, so that environment variables reach it.
var defaults = map[string]any{
	"name": "", "map": "", "horizon": "", "surroundings_radius_m": 100.0,
	"climate.file": "", "climate.low_temp_c": -10.0, "climate.high_temp_c": 35.0, "climate.albedo": 0.2,
	"module.power_w": 0.0, "module.voc_v": 0.0, "module.isc_a": 0.0, "module.vmp_v": 0.0, "module.imp_a": 0.0,
	"module.half_cut": false,
	"module.length_m": 0.0, "module.width_m": 0.0, "module.max_system_voltage_v": 1000.0,
	"module.mounting":     "rails",
	"inverter.ac_power_w": 0.0, "inverter.max_dc_voltage_v": 0.0, "inverter.mppt_min_v": 0.0,
	"inverter.mppt_max_v": 0.0, "inverter.max_input_current_a": 0.0,
	"inverter.efficiency_pct": 96.0, "inverter.night_w": 0.0, "inverter.transformerless": true,
	"fill.orientation": "portrait", "fill.setback_m": 0.3, "fill.gap_m": 0.02, "fill.clearance_m": 0.3,
	"fill.min_modules": 1.0,
	"layouts.search":   true, "layouts.keep": 5.0, "layouts.cable_weight_kwh_per_m": 0.0,
	"losses.soiling_pct": 2.0, "losses.wiring_pct": 1.0, "losses.mismatch_pct": 1.0, "losses.availability_pct": 0.5,
	"model.sky": "perez", "model.iam": "martin-ruiz",
	"proposal.customer": "", "proposal.address": "", "proposal.prepared_by": "", "proposal.date": "",
	"proposal.valid_until": "",
}

// blame marks each error whose key took its value from the environment or a flag.
func blame(err error, from map[string]string) error {
	var es survey.Errors
	switch e := err.(type) {
	case survey.Errors:
		es = e
	case *survey.Error:
		es = survey.Errors{e}
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

// Load reads the site file at path with flags (may be nil) bound by key name: a flag named
// in bind overrides that key when the user set it.
func Load(path string, flags *pflag.FlagSet, bind map[string]string) (*survey.Config, error) {
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
		// The environment overrides a flag (the order README.md states: file < flags < environment),
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
			return nil, &survey.Error{File: path, Msg: fmt.Sprintf("cannot read the site file: %v", pe.Err)}
		}
		return nil, &survey.Error{File: path, Msg: fmt.Sprintf("not valid YAML: %v", unwrapYAML(err))}
	}
	// Keys without a sensible default must be given (in the file or the environment).
	var missing survey.Errors
	for _, k := range required {
		if !v.IsSet(k) {
			missing = append(missing, &survey.Error{File: path, Key: k, Msg: "missing: " + requiredWhy[k]})
		}
	}
	var s survey.Config
	err := v.Unmarshal(&s, func(c *mapstructure.DecoderConfig) {
		c.ErrorUnused = true
		c.WeaklyTypedInput = true
		c.DecodeHook = mapstructure.ComposeDecodeHookFunc(c.DecodeHook, rejectLossyFloat, dateAsText)
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
	keys := make([]string, 0, len(from))
	for k := range from {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	for _, k := range keys {
		s.Overrides = append(s.Overrides, report.Override{Key: k, Value: fmt.Sprint(v.Get(k)), Source: from[k]})
	}
	s.Warnings = unknownEnv(os.Environ())
	return &s, nil
}

// unknownEnv warns about every SUNSTRING_ variable that names no key of the site file: a
// misspelt one would otherwise be ignored without a word.
func unknownEnv(environ []string) []string {
	known := map[string]bool{}
	var names []string
	for _, k := range allKeys() {
		known[EnvName(k)] = true
		names = append(names, EnvName(k))
	}
	var out []string
	for _, kv := range environ {
		name, _, _ := strings.Cut(kv, "=")
		if !strings.HasPrefix(name, "SUNSTRING_") || known[name] {
			continue
		}
		msg := fmt.Sprintf("environment variable %s names no key of the site file and is ignored", name)
		if near := nearest(name, names); near != "" {
			msg += fmt.Sprintf("; did you mean %s?", near)
		}
		out = append(out, msg)
	}
	sort.Strings(out)
	return out
}

// nearest returns the candidate closest to s by edit distance, when it is close enough to be
// a likely misspelling (at most a third of s's length, and at most 4 edits); else "".
func nearest(s string, candidates []string) string {
	best, bestD := "", math.MaxInt
	for _, c := range candidates {
		if d := editDistance(strings.ToLower(s), strings.ToLower(c)); d < bestD || d == bestD && c < best {
			best, bestD = c, d
		}
	}
	if bestD > min(4, max(1, len(s)/3)) {
		return ""
	}
	return best
}

// editDistance is the Levenshtein distance between a and b, in bytes.
func editDistance(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

// unknownKeyMsg is the message for an unknown key, with the nearest known key when one is
// close.
func unknownKeyMsg(key string) string {
	if near := nearest(key, allKeys()); near != "" {
		return fmt.Sprintf("unknown key; did you mean %q? (see the site file reference in README.md)", near)
	}
	return "unknown key (see the site file reference in README.md)"
}

// dateAsText turns a date YAML wrote without quotes (decoded as a time) back into the text
// the user wrote, YYYY-MM-DD, for a text key such as proposal.date.
func dateAsText(from, to reflect.Type, data any) (any, error) {
	t, ok := data.(time.Time)
	if !ok || to.Kind() != reflect.String {
		return data, nil
	}
	if t.Hour() == 0 && t.Minute() == 0 && t.Second() == 0 && t.Nanosecond() == 0 {
		return t.Format(time.DateOnly), nil
	}
	return t.Format(time.RFC3339), nil
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
	var out survey.Errors
	for _, line := range strings.Split(err.Error(), "\n") {
		line = strings.TrimSpace(strings.TrimPrefix(strings.TrimSpace(line), "*"))
		if line == "" || strings.HasPrefix(line, "decoding failed due to") || strings.HasSuffix(line, "error(s) decoding:") {
			continue
		}
		if strings.HasPrefix(line, "has invalid keys: ") {
			for _, k := range strings.Split(strings.TrimPrefix(line, "has invalid keys: "), ", ") {
				out = append(out, &survey.Error{File: path, Key: k, Msg: unknownKeyMsg(k)})
			}
			continue
		}
		if i := strings.Index(line, "' has invalid keys: "); i >= 0 && strings.HasPrefix(line, "'") {
			parent := line[1:i]
			for _, k := range strings.Split(line[i+len("' has invalid keys: "):], ", ") {
				out = append(out, &survey.Error{File: path, Key: parent + "." + k, Msg: unknownKeyMsg(parent + "." + k)})
			}
			continue
		}
		if strings.HasPrefix(line, "'") {
			if j := strings.Index(line[1:], "'"); j >= 0 {
				out = append(out, &survey.Error{File: path, Key: line[1 : j+1], Msg: plainDecodeMsg(strings.TrimSpace(line[j+2:]))})
				continue
			}
		}
		out = append(out, &survey.Error{File: path, Msg: line})
	}
	if len(out) == 0 {
		return &survey.Error{File: path, Msg: err.Error()}
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
