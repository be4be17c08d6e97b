package electric

import (
	"strings"
	"testing"
)

func TestFitWarnings(t *testing.T) {
	for _, c := range []struct {
		name string
		ds   Datasheet
		want []string // fragments; none means no warning
	}{
		// Ratios of ordinary datasheets (Imp/Isc ≈ 0.94, Vmp/Voc ≈ 0.82–0.84): the fit is
		// physical (n ≈ 0.96 and 0.88 [calc]) and reproduces the Voc coefficient.
		{"ordinary 60-cell", Datasheet{PowerW: 300, VocV: 39.8, IscA: 9.8, VmpV: 32.6, ImpA: 9.2, TempCoeffVocPct: -0.29, TempCoeffIscPct: 0.05, TempCoeffPmaxPct: -0.38, CellsSeries: 60, BypassDiodes: 3}, nil},
		{"ordinary half-cut", Datasheet{PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1, TempCoeffVocPct: -0.27, TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34, CellsSeries: 120, BypassDiodes: 3, HalfCut: true}, nil},
		// Imp/Isc = 0.967 with Vmp/Voc = 0.81 forces a junction far sharper than silicon's:
		// the fit lands at the lower end of its scan and cannot follow the Voc coefficient
		// (invented, inconsistent datasheet).
		{"Imp too close to Isc", Datasheet{PowerW: 300, VocV: 39.5, IscA: 9.7, VmpV: 32.0, ImpA: 9.375, TempCoeffVocPct: -0.29, TempCoeffIscPct: 0.05, TempCoeffPmaxPct: -0.38, CellsSeries: 60, BypassDiodes: 3},
			[]string{"ideality factor", "imp_a", "temperature coefficient"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			p, err := Fit(c.ds)
			if err != nil {
				t.Fatal(err)
			}
			ws := FitWarnings(c.ds, p)
			all := strings.Join(ws, "\n")
			if len(c.want) == 0 && len(ws) > 0 {
				t.Errorf("unexpected warnings: %s", all)
			}
			for _, w := range c.want {
				if !strings.Contains(all, w) {
					t.Errorf("warnings lack %q: %s", w, all)
				}
			}
		})
	}
}
