package electric

import (
	"fmt"
	"math"
)

// Fit finds the five single-diode parameters at STC from the datasheet after
// De Soto, Klein & Beckman (2006). The five conditions are: the curve passes
// through (0, Isc), (Voc, 0) and (Vmp, Imp); dP/dV = 0 at (Vmp, Imp); and the
// translated model reproduces the datasheet's Voc temperature coefficient.
//
// For fixed A and Rs the first three conditions are linear in IL, I0 and 1/Rsh,
// so they are solved exactly; Rs is then found by bracketed bisection on the
// dP/dV condition, and A by bracketed bisection on the temperature condition.
// Every loop is bracketed and stops on a tolerance, so the fit either
// converges or reports ErrNoFit. When no A reproduces the Voc coefficient
// exactly, the feasible A closest to it is kept (the STC points still hold).
func Fit(ds Datasheet) (Params, error) {
	if err := ds.Validate(); err != nil {
		return Params{}, err
	}
	ns := float64(ds.seriesCells())
	vt := boltzmannJPerK * (stcTempC + kelvinOffset) / chargeC
	alpha := ds.TempCoeffIscPct / 100 * ds.IscA
	const dT = 10.0
	target := ds.VocV * (1 + ds.TempCoeffVocPct/100*dT)

	resid := func(a float64) (float64, Params, bool) {
		p, ok := fitAtA(ds, a)
		if !ok {
			return 0, p, false
		}
		hot := translate(p, alpha, stcIrrWPerM2, stcTempC+dT)
		return hot.Voc() - target, p, true
	}

	// Scan the ideality factor n over 0.5..2.5 (any silicon module) for a
	// sign change of the temperature residual.
	const nScan = 81
	var (
		prevA, prevR float64
		prevOK       bool
		best         Params
		bestAbs      = math.Inf(1)
	)
	for k := range nScan {
		n := 0.5 + 2.0*float64(k)/(nScan-1)
		a := n * ns * vt
		r, p, ok := resid(a)
		if !ok {
			prevOK = false
			continue
		}
		if math.Abs(r) < bestAbs {
			bestAbs, best = math.Abs(r), p
		}
		if prevOK && (r == 0 || (r > 0) != (prevR > 0)) {
			lo, hi, rlo := prevA, a, prevR
			for it := 0; it < 100 && hi-lo > 1e-12*hi; it++ {
				mid := 0.5 * (lo + hi)
				rm, pm, okm := resid(mid)
				if !okm {
					break
				}
				best = pm
				if (rm > 0) == (rlo > 0) {
					lo, rlo = mid, rm
				} else {
					hi = mid
				}
			}
			return best, nil
		}
		prevA, prevR, prevOK = a, r, true
	}
	if math.IsInf(bestAbs, 1) {
		return Params{}, fmt.Errorf("%w (Isc %g A, Voc %g V, Imp %g A, Vmp %g V)", ErrNoFit, ds.IscA, ds.VocV, ds.ImpA, ds.VmpV)
	}
	return best, nil
}

// fitAtA solves the four STC conditions for a given modified ideality A.
func fitAtA(ds Datasheet, a float64) (Params, bool) {
	isc, voc, imp, vmp := ds.IscA, ds.VocV, ds.ImpA, ds.VmpV
	// f4 is the dP/dV = 0 residual: G·(Vmp − Rs·Imp) − Imp with G the
	// junction-plus-shunt conductance at the maximum power point.
	f4 := func(rs float64) (float64, Params, bool) {
		p, ok := solveLinear3(isc, voc, imp, vmp, a, rs)
		if !ok {
			return 0, p, false
		}
		g := p.I0/a*math.Exp((vmp+imp*rs)/a) + 1/p.Rsh
		return g*(vmp-rs*imp) - imp, p, true
	}
	rsMax := (voc - vmp) / imp
	const nScan = 40
	var prevR, prevRs float64
	prevOK := false
	for k := range nScan + 1 {
		rs := rsMax * float64(k) / nScan * 0.999
		r, p, ok := f4(rs)
		if !ok {
			prevOK = false
			continue
		}
		if r == 0 {
			return p, true
		}
		if prevOK && (r > 0) != (prevR > 0) {
			lo, hi, rlo := prevRs, rs, prevR
			best := p
			for it := 0; it < 100 && hi-lo > 1e-14*rsMax; it++ {
				mid := 0.5 * (lo + hi)
				rm, pm, okm := f4(mid)
				if !okm {
					return best, false
				}
				best = pm
				if (rm > 0) == (rlo > 0) {
					lo, rlo = mid, rm
				} else {
					hi = mid
				}
			}
			return best, true
		}
		prevR, prevRs, prevOK = r, rs, true
	}
	return Params{}, false
}

// solveLinear3 solves the Isc, Voc and (Vmp, Imp) conditions for IL, I0 and
// 1/Rsh at fixed A and Rs. It reports false when the solution is unphysical.
func solveLinear3(isc, voc, imp, vmp, a, rs float64) (Params, bool) {
	// Rows: IL − I0·(e−1) − g·x = rhs, with x the diode voltage.
	x1, x2, x3 := isc*rs, voc, vmp+imp*rs
	e1, e2, e3 := math.Expm1(x1/a), math.Expm1(x2/a), math.Expm1(x3/a)
	// Subtract row 2 from rows 1 and 3 to drop IL:
	//   I0·(e2−e1) + g·(x2−x1) = isc
	//   I0·(e2−e3) + g·(x2−x3) = imp
	a11, a12, b1 := e2-e1, x2-x1, isc
	a21, a22, b2 := e2-e3, x2-x3, imp
	det := a11*a22 - a12*a21
	if det == 0 || math.IsNaN(det) || math.IsInf(det, 0) {
		return Params{}, false
	}
	i0 := (b1*a22 - a12*b2) / det
	g := (a11*b2 - a21*b1) / det
	if !(i0 > 0) || !(g > 0) {
		return Params{}, false
	}
	il := i0*e2 + g*x2
	return Params{IL: il, I0: i0, Rs: rs, Rsh: 1 / g, A: a}, true
}
