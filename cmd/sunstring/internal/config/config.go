package config

import (
	"errors"
	"fmt"
	"io/fs"
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
	for k, d := range survey.KeyDefaults {
		v.SetDefault(k, d)
	}
	from := map[string]string{} // key → where its value came from, when not the file
	for _, k := range survey.Keys() {
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
	for _, k := range survey.Required {
		if !v.IsSet(k) {
			missing = append(missing, &survey.Error{File: path, Key: k, Msg: "missing: " + survey.RequiredWhy[k]})
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
	for _, k := range survey.Keys() {
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
		if near := survey.Nearest(name, names); near != "" {
			msg += fmt.Sprintf("; did you mean %s?", near)
		}
		out = append(out, msg)
	}
	sort.Strings(out)
	return out
}

// unknownKeyMsg is the message for an unknown key, with the nearest known key when one is
// close.
func unknownKeyMsg(key string) string {
	if near := survey.Nearest(key, survey.Keys()); near != "" {
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
