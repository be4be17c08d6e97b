package config

import (
	"math"
	"os"
	"path/filepath"
	"testing"
)

// FuzzLoad feeds arbitrary bytes as a site file: never a panic, every error marked as bad
// input, and whatever is accepted keeps the ranges Validate promises.
func FuzzLoad(f *testing.F) {
	seeds, _ := filepath.Glob("../../../../testdata/bad/*/site.yaml")
	seeds = append(seeds, "../../../../examples/sample-house/site.yaml")
	for _, s := range seeds {
		if b, err := os.ReadFile(s); err == nil {
			f.Add(b)
		}
	}
	f.Add([]byte(minimal))
	dir := f.TempDir()
	f.Fuzz(func(t *testing.T, data []byte) {
		p := filepath.Join(dir, "site.yaml")
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
		s, err := Load(p, nil, nil)
		if err != nil {
			if b, ok := err.(interface{ BadInput() bool }); !ok || !b.BadInput() {
				t.Fatalf("error %T not marked as bad input: %v", err, err)
			}
			return
		}
		m := s.Module
		if !(m.PowerW > 0 && m.VmpV < m.VocV && m.ImpA < m.IscA && m.WidthM <= m.LengthM) {
			t.Fatalf("accepted an impossible module: %+v", m)
		}
		if s.Inverter.MPPTMaxV <= s.Inverter.MPPTMinV || len(s.Inverter.Curve) == 0 || s.Zone == nil {
			t.Fatalf("accepted an impossible inverter or zone: %+v", s.Inverter)
		}
		for _, g := range s.Climate.MonthlyGHI {
			if math.IsNaN(g) || g < 0 {
				t.Fatalf("accepted monthly GHI %v", g)
			}
		}
	})
}
