package survey_test

import (
	"context"
	"errors"
	"strings"
	"testing"

	"sunstring/yield/survey"
)

// validConfig is the Example's site with the map at roof.geojson.
func validConfig(t *testing.T) *survey.Config {
	t.Helper()
	cfg := survey.Defaults()
	cfg.File, cfg.Map, cfg.Timezone = "site.yaml", "roof.geojson", "Europe/Vienna"
	cfg.Module = survey.Module{PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1,
		TempCoeffVocPct: -0.27, TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34,
		CellsSeries: 120, HalfCut: true, BypassDiodes: 3, LengthM: 1.72, WidthM: 1.134, MaxSystemVoltage: 1000}
	cfg.Inverter = survey.Inverter{Count: 1, ACPowerW: 6000, MaxDCVoltageV: 600, MPPTMinV: 90, MPPTMaxV: 560,
		Inputs: 2, MaxInputCurrentA: 16, EfficiencyPct: 97.0}
	if errs := cfg.Validate(); len(errs) > 0 {
		t.Fatal(errs)
	}
	return cfg
}

type notFound struct{ error }

func (notFound) BadInput() bool { return true }

func isBadInput(err error) bool {
	var bi interface{ BadInput() bool }
	return errors.As(err, &bi) && bi.BadInput()
}

func TestLoadProblems(t *testing.T) {
	tiny := `{"type":"FeatureCollection","features":[{"type":"Feature",
"geometry":{"type":"Polygon","coordinates":[[[15.43,47.05],[15.430005,47.05],[15.430005,47.050005],[15.43,47.050005],[15.43,47.05]]]},
"properties":{"kind":"roof","id":"T","pitch_deg":30,"aspect_deg":180,"eave_height_m":5}}]}`
	for _, c := range []struct {
		name string
		maps map[string]string
		load bool     // Load succeeds
		want []string // fragments of the message (of Load, else of Run)
	}{
		{"map missing", nil, false, []string{"roof.geojson", "no such map"}},
		{"not GeoJSON", map[string]string{"roof.geojson": "[1,2"}, false, []string{"roof.geojson"}},
		{"no module fits", map[string]string{"roof.geojson": tiny}, true, []string{"roof.geojson", "no module fits", "setback"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			read := func(path, what string) ([]byte, error) {
				if b, ok := c.maps[path]; ok {
					return []byte(b), nil
				}
				return nil, notFound{errors.New(path + ": no such " + what)}
			}
			p, err := survey.Load(validConfig(t), read)
			if c.load {
				if err != nil {
					t.Fatalf("Load: %v", err)
				}
				_, err = p.Run(context.Background(), survey.Options{})
			}
			if err == nil || !isBadInput(err) {
				t.Fatalf("want a bad-input error, got %v", err)
			}
			for _, w := range c.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("message %q lacks %q", err, w)
				}
			}
		})
	}
}

func TestLoadNeedsConfigAndReader(t *testing.T) {
	if _, err := survey.Load(nil, nil); err == nil {
		t.Fatal("Load(nil, nil) succeeded")
	}
}
