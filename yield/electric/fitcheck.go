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
)

// FitWarnings reports, in words a surveyor can act on, where the fitted single-diode model
// departs from the datasheet or from physics: an ideality factor outside the range of silicon
// cells, or an open-circuit temperature coefficient that the fit could not reproduce. Such a
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
	return out
}
