package yield

import (
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// TestDefaultIAM: the zero System takes the Martin & Ruiz (2001) modifier with ar = 0.16. Hand
// calculation from their formula [1 − exp(−cos θ/ar)]/[1 − exp(−1/ar)] (a regression value):
// 0.9579 at 60° and 0.6635 at 80°; ar = 0.20 would give 0.9241 and 0.5848, so a changed
// parameter fails here.
func TestDefaultIAM(t *testing.T) {
	p := &prep{in: &Input{}}
	tests := []struct {
		name      string
		theta     float64
		want, tol float64
	}{
		{"60°", 60, 0.9579, 5e-5},
		{"80°", 80, 0.6635, 5e-5},
		{"normal incidence", 0, 1, 1e-12},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := p.beamIAM(tc.theta); !scalar.EqualWithinAbs(got, tc.want, tc.tol) {
				t.Errorf("IAM(%g°) = %.5f, want %.4f (Martin & Ruiz, ar 0.16)", tc.theta, got, tc.want)
			}
		})
	}
}

// TestShadedModulesOwnTemperature: each module's cells are heated by the light that module
// receives, shade included, through the mounting's model (the zero value: rails, King et al.
// 2004 close roof mount): the stored temperature is that model at the module's own shaded
// POA, so a module behind the wall runs cooler than the same module would unshaded.
func TestShadedModulesOwnTemperature(t *testing.T) {
	m, _ := prepare(t, 6, 1) // a wall higher than the eave shades the lower rows
	n := len(m.In.Modules)
	cooler := 0
	for s, rec := range m.StepRecord {
		r := m.Records[rec]
		for k := range n {
			poa, un := float64(m.ModulePOA[s*n+k]), float64(m.ModulePOAUnshaded[s*n+k])
			want := m.In.System.Mounting.CellTemp(poa, r.AirTempC, r.WindMS)
			if got := float64(m.ModuleTempC[s*n+k]); !scalar.EqualWithinAbs(got, want, 1e-4) {
				t.Fatalf("step %d module %d: %.4f °C, want %.4f from its own %.1f W/m²", s, k, got, want, poa)
			}
			if un-poa > 30 && m.In.System.Mounting.CellTemp(un, r.AirTempC, r.WindMS)-want > 0.5 {
				cooler++
			}
		}
	}
	if cooler == 0 {
		t.Errorf("no shaded module-step ran cooler than it would unshaded")
	}
}
