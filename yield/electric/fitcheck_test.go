package electric

import (
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
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
		// The ordinary 60-cell module with a Pmax coefficient of −0.50 %/K: the fit, driven by
		// the Voc and Isc coefficients, gives −0.348 %/K (see TestFittedPmaxCoeff), 0.15 %/K
		// apart (invented, inconsistent datasheet).
		{"Pmax coefficient far from the fit", Datasheet{PowerW: 300, VocV: 39.8, IscA: 9.8, VmpV: 32.6, ImpA: 9.2, TempCoeffVocPct: -0.29, TempCoeffIscPct: 0.05, TempCoeffPmaxPct: -0.50, CellsSeries: 60, BypassDiodes: 3},
			[]string{"maximum-power temperature coefficient is -0.348", "-0.500", "hot hours higher"}},
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

// TestFittedPmaxCoeff checks the fitted model's Pmax temperature coefficient two ways. A
// first-order estimate: dP/P = dVmp/Vmp + dImp/Imp, with Vmp following Voc in absolute volts
// (dVmp/dT ≈ dVoc/dT, common practice) and Imp following Isc, gives γ ≈ βVoc·Voc/Vmp + αIsc
// = −0.29·39.8/32.6 + 0.05 = −0.304 %/K for the ordinary 60-cell module [hand calculation];
// the fill factor's own fall with temperature makes the model's value somewhat more negative,
// so it must lie in −0.40..−0.30 %/K. And a regression value of the fit, −0.3477 %/K to
// 0.001 %/K, so that a change of the fit or the translation shows.
func TestFittedPmaxCoeff(t *testing.T) {
	ds := Datasheet{PowerW: 300, VocV: 39.8, IscA: 9.8, VmpV: 32.6, ImpA: 9.2, TempCoeffVocPct: -0.29, TempCoeffIscPct: 0.05, TempCoeffPmaxPct: -0.38, CellsSeries: 60, BypassDiodes: 3}
	p, err := Fit(ds)
	if err != nil {
		t.Fatal(err)
	}
	got := FittedPmaxCoeffPct(ds, p)
	if got < -0.40 || got > -0.30 {
		t.Errorf("γ = %.4f %%/K, outside the single-diode band −0.40..−0.30", got)
	}
	if !scalar.EqualWithinAbs(got, -0.3477, 0.001) {
		t.Errorf("γ = %.4f %%/K, regression value −0.3477 ± 0.001", got)
	}
}
