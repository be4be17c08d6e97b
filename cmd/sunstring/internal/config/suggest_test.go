package config

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestUnknownEnv(t *testing.T) {
	got := unknownEnv([]string{"PATH=/bin", "SUNSTRING_INVERTER_AC_POWER_W=5000", "SUNSTRING_INVERTER_AC_POWR_W=5000", "SUNSTRING_TURBO=1"})
	if len(got) != 2 {
		t.Fatalf("warnings %q, want two", got)
	}
	if !strings.Contains(got[0], "SUNSTRING_INVERTER_AC_POWR_W") || !strings.Contains(got[0], "did you mean SUNSTRING_INVERTER_AC_POWER_W?") {
		t.Errorf("warning %q", got[0])
	}
	if !strings.Contains(got[1], "SUNSTRING_TURBO names no key") || strings.Contains(got[1], "did you mean") {
		t.Errorf("warning %q", got[1])
	}
}

func TestOverridesRecorded(t *testing.T) {
	dir := t.TempDir()
	site, err := os.ReadFile("../../../../examples/sample-house/site.yaml")
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "site.yaml")
	if err := os.WriteFile(path, site, 0o644); err != nil {
		t.Fatal(err)
	}
	t.Setenv("SUNSTRING_INVERTER_AC_POWER_W", "7000")
	t.Setenv("SUNSTRING_INVERTER_AC_POWR_W", "1")
	cfg, err := Load(path, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if cfg.Inverter.ACPowerW != 7000 {
		t.Errorf("ac_power_w %g, want the environment's 7000", cfg.Inverter.ACPowerW)
	}
	if len(cfg.Overrides) != 1 || cfg.Overrides[0].Key != "inverter.ac_power_w" || cfg.Overrides[0].Value != "7000" ||
		cfg.Overrides[0].Source != "environment variable SUNSTRING_INVERTER_AC_POWER_W" {
		t.Errorf("overrides %+v", cfg.Overrides)
	}
	if len(cfg.Warnings) != 1 || !strings.Contains(cfg.Warnings[0], "SUNSTRING_INVERTER_AC_POWR_W") {
		t.Errorf("warnings %q", cfg.Warnings)
	}
}
