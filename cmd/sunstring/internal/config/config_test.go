package config

import (
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"sunstring/yield/survey"
	"testing"

	"github.com/spf13/pflag"
	"gonum.org/v1/gonum/floats/scalar"
)

func write(t *testing.T, body string) string {
	t.Helper()
	p := filepath.Join(t.TempDir(), "site.yaml")
	if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

const minimal = `
map: roof.geojson
timezone: Europe/Vienna
module: {power_w: 400, voc_v: 37.1, isc_a: 13.7, vmp_v: 31.0, imp_a: 12.9, length_m: 1.72, width_m: 1.13,
  temp_coeff_voc_pct: -0.26, temp_coeff_isc_pct: 0.05, temp_coeff_pmax_pct: -0.32, cells_series: 120, half_cut: true, bypass_diodes: 3}
inverter: {ac_power_w: 6000, max_dc_voltage_v: 600, mppt_min_v: 90, mppt_max_v: 560, inputs: 2, max_input_current_a: 16}
`

func TestLoadExample(t *testing.T) {
	s, err := Load("../../../../examples/sample-house/site.yaml", nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	// The example's own numbers: 410 W module, two-input 6 kW inverter, six-point curve.
	if !scalar.EqualWithinAbs(s.Module.PowerW, 410, 1e-9) || s.Inverter.Inputs != 2 || len(s.Inverter.Curve) != 6 {
		t.Errorf("module/inverter decoded wrong: %+v %+v", s.Module, s.Inverter)
	}
	if !scalar.EqualWithinAbs(s.Inverter.Curve[4][1], 0.972, 1e-12) {
		t.Errorf("efficiency at half load = %v, want 0.972 (97.2 %% in the file)", s.Inverter.Curve[4][1])
	}
	if s.Zone == nil || s.Zone.String() != "Europe/Vienna" {
		t.Errorf("zone = %v", s.Zone)
	}
}

func TestLoadEnvOverrides(t *testing.T) {
	t.Setenv("SUNSTRING_INVERTER_AC_POWER_W", "5000")
	s, err := Load(write(t, minimal), nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if s.Inverter.ACPowerW != 5000 {
		t.Errorf("ac_power_w = %v, want 5000 from the environment", s.Inverter.ACPowerW)
	}
	// Defaults fill what the file leaves out (documented in defaults).
	if s.Losses.SoilingPct != 2 || s.Fill.Orientation != "portrait" {
		t.Errorf("defaults not applied: %+v %+v", s.Losses, s.Fill)
	}
}

func TestLoadBadInput(t *testing.T) {
	for _, c := range []struct {
		name string
		body string
		want []string
	}{
		{"unknown top key", minimal + "colour: red\n", []string{"colour", "unknown key"}},
		{"unknown nested key", minimal + "fill: {setbak_m: 1}\n", []string{"fill.setbak_m", "unknown key"}},
		{"not yaml", "map: [unclosed\n", []string{"not valid YAML"}},
		{"bad zone", strings.Replace(minimal, "Europe/Vienna", "Mars/Olympus", 1), []string{"timezone", "IANA"}},
		{"vmp above voc", strings.Replace(minimal, "vmp_v: 31.0", "vmp_v: 38", 1), []string{"module.vmp_v", "below voc_v"}},
		{"twelve months", minimal + "climate: {monthly_ghi_kwh_m2: [1, 2, 3]}\n", []string{"climate.monthly_ghi_kwh_m2", "12"}},
		{"fractional inputs", strings.Replace(minimal, "inputs: 2", "inputs: 1.5", 1), []string{"inverter.inputs", "whole number"}},
		{"latitude range", minimal + "latitude: 147\nlongitude: 15\n", []string{"latitude", "-90 to 90"}},
		{"bad orientation", minimal + "fill: {orientation: sideways}\n", []string{"fill.orientation", "portrait, landscape, best"}},
		{"efficiency curve", strings.Replace(minimal, "inputs: 2,", "inputs: 2, efficiency_pct: [[0.5, 97], [0.2, 96]],", 1), []string{"inverter.efficiency_pct", "increase"}},
		{"missing map", strings.Replace(minimal, "map: roof.geojson", "", 1), []string{"map", "missing"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			p := write(t, c.body)
			_, err := Load(p, nil, nil)
			if err == nil {
				t.Fatal("no error")
			}
			var bi interface{ BadInput() bool }
			if !asBad(err, &bi) {
				t.Errorf("error %T is not marked as bad input", err)
			}
			for _, w := range append(c.want, p) {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("message %q lacks %q", err, w)
				}
			}
		})
	}
}

func asBad(err error, bi *interface{ BadInput() bool }) bool {
	b, ok := err.(interface{ BadInput() bool })
	if ok {
		*bi = b
	}
	return ok && b.BadInput()
}

func TestPrecedence(t *testing.T) {
	// The order README.md states: file < flags < environment.
	p := write(t, minimal+"fill: {orientation: portrait}\n")
	for _, c := range []struct {
		name, flag, env, want string
	}{
		{"file alone", "", "", "portrait"},
		{"flag over file", "landscape", "", "landscape"},
		{"environment over flag", "landscape", "best", "best"},
		{"environment over file", "", "best", "best"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if c.env != "" {
				t.Setenv("SUNSTRING_FILL_ORIENTATION", c.env)
			}
			fs := pflag.NewFlagSet("test", pflag.ContinueOnError)
			fs.String("orientation", "", "")
			if c.flag != "" {
				if err := fs.Parse([]string{"--orientation", c.flag}); err != nil {
					t.Fatal(err)
				}
			}
			s, err := Load(p, fs, map[string]string{"fill.orientation": "orientation"})
			if err != nil {
				t.Fatal(err)
			}
			if s.Fill.Orientation != c.want {
				t.Errorf("orientation %q, want %q", s.Fill.Orientation, c.want)
			}
		})
	}
}

func TestErrorsNameTheirSource(t *testing.T) {
	p := write(t, minimal)
	t.Setenv("SUNSTRING_INVERTER_INPUTS", "abc")
	_, err := Load(p, nil, nil)
	if err == nil || !strings.Contains(err.Error(), "inverter.inputs (set by environment variable SUNSTRING_INVERTER_INPUTS)") {
		t.Errorf("error %v does not name the environment variable", err)
	}
	t.Setenv("SUNSTRING_INVERTER_INPUTS", "2")
	fs := pflag.NewFlagSet("test", pflag.ContinueOnError)
	fs.String("sky", "", "")
	if err := fs.Parse([]string{"--sky", "bogus"}); err != nil {
		t.Fatal(err)
	}
	_, err = Load(p, fs, map[string]string{"model.sky": "sky"})
	if err == nil || !strings.Contains(err.Error(), "model.sky (set by flag --sky)") {
		t.Errorf("error %v does not name the flag", err)
	}
}

func TestRequiredKeys(t *testing.T) {
	// Keys whose guess would change voltages or hours must be given; each missing one is
	// named, all at once.
	p := write(t, "map: roof.geojson\nmodule: {power_w: 400}\n")
	_, err := Load(p, nil, nil)
	if err == nil {
		t.Fatal("accepted a site file without timezone, datasheet and inverter")
	}
	for _, k := range []string{"timezone: missing", "module.temp_coeff_voc_pct: missing", "module.cells_series: missing", "inverter.inputs: missing"} {
		if !strings.Contains(err.Error(), k) {
			t.Errorf("message lacks %q:\n%v", k, err)
		}
	}
	if strings.Contains(err.Error(), "module.power_w: missing") {
		t.Error("a key given in the file is reported missing")
	}
	// The environment can give a required key.
	t.Setenv("SUNSTRING_TIMEZONE", "Europe/Vienna")
	_, err = Load(p, nil, nil)
	if err == nil || strings.Contains(err.Error(), "timezone: missing") {
		t.Errorf("SUNSTRING_TIMEZONE did not count: %v", err)
	}
}

func TestPathsFromTheEnvironmentAreTheUsers(t *testing.T) {
	// climate.file from the file: relative to the file's folder; from the environment:
	// relative to the current folder (made absolute).
	p := write(t, minimal+"climate: {file: year.csv}\n")
	s, err := Load(p, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if got, want := s.Path(s.Climate.File), filepath.Join(filepath.Dir(p), "year.csv"); got != want {
		t.Errorf("file's path %q, want %q", got, want)
	}
	t.Setenv("SUNSTRING_CLIMATE_FILE", "data/year.epw")
	s, err = Load(p, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	wd, _ := os.Getwd()
	if got, want := s.Path(s.Climate.File), filepath.Join(wd, "data/year.epw"); got != want {
		t.Errorf("environment's path %q, want %q", got, want)
	}
}

// TestDefaultsAgreeWithLibrary keeps the command line's defaults and the library's
// survey.Defaults in step: a site file with only the required keys decodes to the library's
// defaults in every optional key.
func TestDefaultsAgreeWithLibrary(t *testing.T) {
	s, err := Load(write(t, minimal), nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	d := survey.Defaults()
	for _, c := range []struct {
		name      string
		got, want any
	}{
		{"climate", []float64{s.Climate.LowTempC, s.Climate.HighTempC, s.Climate.Albedo}, []float64{d.Climate.LowTempC, d.Climate.HighTempC, d.Climate.Albedo}},
		{"module.max_system_voltage_v", s.Module.MaxSystemVoltage, d.Module.MaxSystemVoltage},
		{"inverter.efficiency_pct", s.Inverter.EfficiencyPct, d.Inverter.EfficiencyPct},
		{"inverter.transformerless", s.Inverter.Transformerless, d.Inverter.Transformerless},
		{"inverter.night_w", s.Inverter.NightW, d.Inverter.NightW},
		{"fill", s.Fill, d.Fill},
		{"layouts", s.Layouts, d.Layouts},
		{"losses", s.Losses, d.Losses},
		{"model", s.Model, d.Model},
	} {
		if !reflect.DeepEqual(c.got, c.want) {
			t.Errorf("%s: the site file's default %+v, the library's %+v", c.name, c.got, c.want)
		}
	}
}

// TestProposalSection: the optional proposal keys decode as given (a YAML date unquoted or
// quoted), and the dates are checked.
func TestProposalSection(t *testing.T) {
	tests := []struct {
		name    string
		section string
		want    survey.Proposal
		errKey  string // the key a bad value is reported under; empty: valid
	}{
		{"all keys, date unquoted", "proposal: {customer: Ms A. Example, address: '1 Example Lane', prepared_by: Sample Surveys, date: 2026-05-04, valid_until: 2026-07-31}",
			survey.Proposal{Customer: "Ms A. Example", Address: "1 Example Lane", PreparedBy: "Sample Surveys", Date: "2026-05-04", ValidUntil: "2026-07-31"}, ""},
		{"none", "", survey.Proposal{}, ""},
		{"valid until before the date", "proposal: {date: '2026-05-04', valid_until: '2026-05-03'}", survey.Proposal{}, "proposal.valid_until"},
		{"no such day", "proposal: {date: '2026-13-01'}", survey.Proposal{}, "proposal.date"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Load(write(t, minimal+tc.section+"\n"), nil, nil)
			if tc.errKey != "" {
				if err == nil || !strings.Contains(err.Error(), tc.errKey) {
					t.Errorf("error %v, want one naming %s", err, tc.errKey)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if s.Proposal != tc.want {
				t.Errorf("proposal %+v, want %+v", s.Proposal, tc.want)
			}
		})
	}
}
