package electric

import (
	"fmt"
	"math"
)

// EffPoint is one point of an efficiency curve: LoadFrac is the DC input
// power over the AC rating (0..1.2), Eff the AC/DC efficiency (0..1).
type EffPoint struct{ LoadFrac, Eff float64 }

// SandiaParams are the coefficients of the inverter model of King, Gonzalez,
// Galbraith & Boyson (2007), SAND2007-5036: PacoW rated AC power, PdcoW the DC
// power giving PacoW at VdcoV, PsoW the DC power to start inverting, C0 (1/W)
// the curvature, C1..C3 (1/V) the voltage dependence of Pdco, Pso and C0,
// PntW the night consumption (W).
type SandiaParams struct {
	PacoW, PdcoW, VdcoV, PsoW float64
	C0, C1, C2, C3            float64
	PntW                      float64
}

// Inverter describes a string inverter. The zero Efficiency with a nil Sandia
// means a flat 96 % (common practice for a modern transformerless inverter).
type Inverter struct {
	ACPowerW         float64 // AC power limit (clipping)
	MaxDCVoltageV    float64 // absolute maximum input voltage
	MPPTMinV         float64 // MPPT voltage window
	MPPTMaxV         float64
	Inputs           int     // independent MPPT inputs
	MaxInputCurrentA float64 // per input; the tracker moves off the MPP above it
	// Efficiency maps load fraction to efficiency, linearly between points
	// and flat beyond the ends; one point is a flat efficiency.
	Efficiency []EffPoint
	NightW     float64       // consumption while not feeding in (W)
	Sandia     *SandiaParams // optional; when set it replaces Efficiency
}

// defaultEff is the flat efficiency of the zero Inverter (common practice).
const defaultEff = 0.96

// Validate checks ranges; errors name the field under "inverter." and
// implement BadInput() bool.
func (inv Inverter) Validate() error {
	pos := []struct {
		name string
		v    float64
	}{
		{"inverter.ac_power_w", inv.ACPowerW},
		{"inverter.max_dc_voltage_v", inv.MaxDCVoltageV},
		{"inverter.mppt_max_v", inv.MPPTMaxV},
		{"inverter.max_input_current_a", inv.MaxInputCurrentA},
	}
	for _, f := range pos {
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) || f.v <= 0 {
			return badf(f.name, "%g must be a positive number", f.v)
		}
	}
	if math.IsNaN(inv.MPPTMinV) || inv.MPPTMinV < 0 || inv.MPPTMinV >= inv.MPPTMaxV {
		return badf("inverter.mppt_min_v", "%g must lie in 0..mppt_max_v %g", inv.MPPTMinV, inv.MPPTMaxV)
	}
	if inv.MPPTMaxV > inv.MaxDCVoltageV {
		return badf("inverter.mppt_max_v", "%g must not exceed max_dc_voltage_v %g", inv.MPPTMaxV, inv.MaxDCVoltageV)
	}
	if inv.Inputs < 1 || inv.Inputs > 64 {
		return badf("inverter.inputs", "%d must lie in 1..64", inv.Inputs)
	}
	if math.IsNaN(inv.NightW) || inv.NightW < 0 || inv.NightW > 0.05*inv.ACPowerW {
		return badf("inverter.night_w", "%g must lie in 0..5 %% of ac_power_w", inv.NightW)
	}
	prev := -1.0
	for k, e := range inv.Efficiency {
		f := fmt.Sprintf("inverter.efficiency[%d]", k)
		if math.IsNaN(e.LoadFrac) || e.LoadFrac < 0 || e.LoadFrac > 1.5 || e.LoadFrac <= prev {
			return badf(f, "load fraction %g must lie in 0..1.5 and rise from point to point", e.LoadFrac)
		}
		if math.IsNaN(e.Eff) || e.Eff <= 0 || e.Eff > 1 {
			return badf(f, "efficiency %g must lie in (0, 1]", e.Eff)
		}
		prev = e.LoadFrac
	}
	if s := inv.Sandia; s != nil {
		if !(s.PacoW > 0) || !(s.PdcoW > s.PacoW) || !(s.VdcoV > 0) || !(s.PsoW >= 0) || !(s.PsoW < s.PdcoW) || !(s.PntW >= 0) {
			return badf("inverter.sandia", "need paco > 0, pdco > paco, vdco > 0, 0 ≤ pso < pdco, pnt ≥ 0")
		}
	}
	return nil
}

// eff returns the efficiency-curve value at load fraction x.
func (inv Inverter) eff(x float64) float64 {
	pts := inv.Efficiency
	switch {
	case len(pts) == 0:
		return defaultEff
	case x <= pts[0].LoadFrac:
		return pts[0].Eff
	case x >= pts[len(pts)-1].LoadFrac:
		return pts[len(pts)-1].Eff
	}
	for k := 1; k < len(pts); k++ {
		if x <= pts[k].LoadFrac {
			a, b := pts[k-1], pts[k]
			return a.Eff + (x-a.LoadFrac)*(b.Eff-a.Eff)/(b.LoadFrac-a.LoadFrac)
		}
	}
	return pts[len(pts)-1].Eff
}

// ACPower returns the AC output (W) for DC input dcW (W) at the reference
// voltage, and the AC power lost to the AC limit (clipping).
func (inv Inverter) ACPower(dcW float64) (acW, clippedW float64) {
	v := 0.0
	if inv.Sandia != nil {
		v = inv.Sandia.VdcoV
	}
	return inv.ACPowerAt(dcW, v)
}

// ACPowerAt is ACPower at DC voltage dcV (V); only the Sandia model depends
// on the voltage. Non-positive or NaN input gives zero.
func (inv Inverter) ACPowerAt(dcW, dcV float64) (acW, clippedW float64) {
	if !(dcW > 0) {
		return 0, 0
	}
	limit := inv.ACPowerW
	if s := inv.Sandia; s != nil {
		acW = sandiaAC(*s, dcW, dcV)
		if s.PacoW > 0 && (limit <= 0 || s.PacoW < limit) {
			limit = s.PacoW
		}
	} else {
		ref := inv.ACPowerW
		if ref <= 0 {
			ref = dcW
		}
		acW = dcW * inv.eff(dcW/ref)
	}
	if acW < 0 {
		return 0, 0
	}
	if limit > 0 && acW > limit {
		return limit, acW - limit
	}
	return acW, 0
}

// sandiaAC is equation (1) of King et al. (2007) before the AC limit:
// Pac = [Paco/(A−B) − C(A−B)](Pdc−B) + C(Pdc−B)², with A, B, C the
// voltage-adjusted Pdco, Pso and C0.
func sandiaAC(s SandiaParams, pdc, vdc float64) float64 {
	dv := vdc - s.VdcoV
	a := s.PdcoW * (1 + s.C1*dv)
	b := s.PsoW * (1 + s.C2*dv)
	c := s.C0 * (1 + s.C3*dv)
	if a <= b {
		return 0
	}
	return (s.PacoW/(a-b)-c*(a-b))*(pdc-b) + c*(pdc-b)*(pdc-b)
}

// EuropeanEfficiency returns the European weighted efficiency of eff, a
// function of load fraction: ηEU = 0.03η5% + 0.06η10% + 0.13η20% + 0.10η30%
// + 0.48η50% + 0.20η100% (the European weighting, restated in EN 50530;
// from memory).
func EuropeanEfficiency(eff func(loadFrac float64) float64) float64 {
	loads := [...]float64{0.05, 0.10, 0.20, 0.30, 0.50, 1.00}
	weights := [...]float64{0.03, 0.06, 0.13, 0.10, 0.48, 0.20}
	var s float64
	for k := range loads {
		s += weights[k] * eff(loads[k])
	}
	return s
}

// EfficiencyAt returns AC/DC efficiency at load fraction x (DC power over the
// AC rating), without clipping: the function EuropeanEfficiency expects.
func (inv Inverter) EfficiencyAt(x float64) float64 {
	if x <= 0 {
		return 0
	}
	if inv.Sandia != nil {
		pdc := x * inv.ACPowerW
		return math.Max(sandiaAC(*inv.Sandia, pdc, inv.Sandia.VdcoV), 0) / pdc
	}
	return inv.eff(x)
}

// nightW returns the night consumption (W).
func (inv Inverter) nightW() float64 {
	if inv.Sandia != nil && inv.NightW == 0 {
		return inv.Sandia.PntW
	}
	return inv.NightW
}
