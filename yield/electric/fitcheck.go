package electric

import (
	"fmt"
	"math"
)

// Plausible ideality factors of a crystalline-silicon cell in the single-diode model: about
// 1 to 1.5 for good cells, up to 2 for recombination-dominated ones (common practice; De Soto
// et al. 2006 report fitted values in this range for their six modules, from memory).
const (
	idealityLow, idealityHigh = 0.8, 2.0
	// vocCoeffTolPct is how far, in %/K, the fitted model's open-circuit temperature
	// coefficient may stray from the datasheet's before the fit is reported as poor.
	vocCoeffTolPct = 0.03
	// pmaxCoeffTolPct is how far, in %/K, the fitted model's maximum-power temperature
	// coefficient may stray from the datasheet's before a warning. Datasheets print the
	// coefficient to two decimals, and its measurement on a flash tester carries roughly
	// ±0.02–0.04 %/K (from memory); 0.05 %/K is beyond both, and over the 40–50 K by which
	// cells on a roof exceed 25 °C in summer it moves the hot-hour power by 2–2.5 %.
	pmaxCoeffTolPct = 0.05
)

// FittedPmaxCoeffPct returns the fitted model's temperature coefficient of the maximum
// power at STC, in %/K: (Pmp(30 °C) − Pmp(20 °C)) / (10 K · Pmp(25 °C)) at 1000 W/m², a
// central difference that is exact to second order in the temperature. It follows from the
// Voc and Isc coefficients the fit was given and the bandgap's temperature dependence (De
// Soto et al. 2006), not from the datasheet's own Pmax coefficient.
func FittedPmaxCoeffPct(ds Datasheet, p Params) float64 {
	alpha := ds.TempCoeffIscPct / 100 * ds.IscA
	pm := func(tc float64) float64 {
		w, _, _ := translate(p, alpha, stcIrrWPerM2, tc).MaxPower()
		return w
	}
	p0 := pm(stcTempC)
	if !(p0 > 0) {
		return math.NaN()
	}
	return 100 * (pm(stcTempC+5) - pm(stcTempC-5)) / (10 * p0)
}

// FitWarnings reports, in words a surveyor can act on, where the fitted single-diode model
// departs from the datasheet or from physics: an ideality factor outside the range of silicon
// cells, an open-circuit temperature coefficient that the fit could not reproduce, or a
// maximum-power temperature coefficient more than 0.05 %/K from the datasheet's. Such a
// datasheet usually has a typing error (Imp or Vmp too close to Isc or Voc); the estimate
// then misjudges temperature and low-light losses.
func FitWarnings(ds Datasheet, p Params) []string {
	var out []string
	vt := boltzmannJPerK * (stcTempC + kelvinOffset) / chargeC
	n := p.A / (float64(ds.seriesCells()) * vt)
	if n < idealityLow || n > idealityHigh {
		out = append(out, fmt.Sprintf("module: the single-diode fit needs an ideality factor of %.2f, outside %.1f–%.1f for silicon cells; check imp_a (%g A against isc_a %g A) and vmp_v (%g V against voc_v %g V)",
			n, idealityLow, idealityHigh, ds.ImpA, ds.IscA, ds.VmpV, ds.VocV))
	}
	const dT = 10.0
	alpha := ds.TempCoeffIscPct / 100 * ds.IscA
	hot := translate(p, alpha, stcIrrWPerM2, stcTempC+dT)
	got := 100 * (hot.Voc()/p.Voc() - 1) / dT
	if math.Abs(got-ds.TempCoeffVocPct) > vocCoeffTolPct {
		out = append(out, fmt.Sprintf("module: the fitted model's open-circuit temperature coefficient is %.3f %%/K, the datasheet's %.3f %%/K; temperature losses will be misjudged (check the datasheet values)",
			got, ds.TempCoeffVocPct))
	}
	if got := FittedPmaxCoeffPct(ds, p); !(math.Abs(got-ds.TempCoeffPmaxPct) <= pmaxCoeffTolPct) {
		higher := "lower"
		if got > ds.TempCoeffPmaxPct {
			higher = "higher"
		}
		out = append(out, fmt.Sprintf("module: the fitted model's maximum-power temperature coefficient is %.3f %%/K, the datasheet's temp_coeff_pmax_pct %.3f %%/K, more than %.2f %%/K apart; the yield follows the fitted model, so it puts hot hours %s than the datasheet's coefficient would (check temp_coeff_voc_pct and temp_coeff_pmax_pct)",
			got, ds.TempCoeffPmaxPct, pmaxCoeffTolPct, higher))
	}
	return out
}
