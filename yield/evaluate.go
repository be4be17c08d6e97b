package yield

import (
	"fmt"

	"sunstring/yield/electric"
)

// Loss is one step of the breakdown from plane-of-array irradiation to AC energy.
type Loss struct {
	Step string
	KWh  float64 // energy lost at this step
	Pct  float64 // of the energy entering the step
}

// LayoutResult is a layout's year.
type LayoutResult struct {
	Layout electric.Layout
	Year   electric.YearResult

	ACkWh                float64 // net of every loss, night consumption and availability
	UnshadedACkWh        float64 // the same modules without shade, same losses
	ShadeLossPct         float64 // share of UnshadedACkWh lost to shade, electrical effects included
	MonthlyACkWh         [12]float64
	MonthlyUnshadedACkWh [12]float64
	// NominalDCkWh is the layout's modules' unshaded POA irradiation at STC efficiency, the
	// start of the loss breakdown.
	NominalDCkWh float64
	// RefPOAKWhM2 is the layout's modules' mean unshaded plane-of-array irradiation: the
	// reference yield of the performance ratio (IEC 61724-1), kWh/m² = kWh/kWp at 1 kW/m².
	RefPOAKWhM2 float64
	Losses      []Loss
}

// options fills in the inverter's night time, from the year's records, and the flat DC
// losses, which act before the inverter's efficiency and AC limit.
func (m *Model) options(opt electric.EvalOptions) electric.EvalOptions {
	if opt.DCKeep == 0 {
		opt.DCKeep, _ = m.flat()
	}
	if opt.NightHours == 0 {
		opt.NightHours = float64(m.NightHours) * m.In.Weather.Interval.Hours()
		if opt.NightHours == 0 {
			opt.NightHours = -1
		}
	}
	return opt
}

// flat returns the factor the flat DC losses (module tolerance mismatch, DC wiring) leave
// of the DC power on its way to the inverter, and the one availability leaves of the AC.
func (m *Model) flat() (dcKeep, avail float64) {
	l := m.In.System.Losses
	return (1 - l.MismatchPct/100) * (1 - l.WiringPct/100), 1 - l.AvailabilityPct/100
}

// EvaluateACWh is the layout's annual AC energy (Wh) net of every loss, as Evaluate's ACkWh,
// without the unshaded reference and the breakdown: the layout search's objective.
func (m *Model) EvaluateACWh(l electric.Layout, opt electric.EvalOptions) (float64, error) {
	return m.EvaluateACWhCached(l, opt, nil)
}

// EvaluateACWhCached is EvaluateACWh through a cache of the inputs' shares of the year, so
// that a search that changes one or two inputs at a time recomputes only those; the value is
// the same to the bit. A nil cache computes everything.
func (m *Model) EvaluateACWhCached(l electric.Layout, opt electric.EvalOptions, c *electric.EvalCache) (float64, error) {
	yr, err := m.Year.EvaluateCached(l, m.In.System.Inverter, m.options(opt), c)
	if err != nil {
		return 0, fmt.Errorf("yield: layout: %w", err)
	}
	_, avail := m.flat()
	return (yr.ACWh - yr.NightWh) * avail, nil
}

// Evaluate runs a layout over the prepared year, and the same layout over the unshaded
// reference year for its shade loss.
func (m *Model) Evaluate(l electric.Layout, opt electric.EvalOptions) (LayoutResult, error) {
	sys := m.In.System
	opt = m.options(opt)
	yr, err := m.Year.Evaluate(l, sys.Inverter, opt)
	if err != nil {
		return LayoutResult{}, fmt.Errorf("yield: layout: %w", err)
	}
	r := LayoutResult{Layout: l, Year: yr}
	_, avail := m.flat()
	net := func(y electric.YearResult) float64 { return (y.ACWh - y.NightWh) * avail / 1000 }
	r.ACkWh = net(yr)
	var yu electric.YearResult
	if m.YearUnshaded != nil {
		if yu, err = m.YearUnshaded.Evaluate(l, sys.Inverter, opt); err != nil {
			return LayoutResult{}, fmt.Errorf("yield: layout, unshaded: %w", err)
		}
		r.UnshadedACkWh = net(yu)
	}
	if r.UnshadedACkWh > 0 {
		r.ShadeLossPct = 100 * (1 - r.ACkWh/r.UnshadedACkWh)
	}
	// Monthly: the step energies carry the same factors; night consumption goes to the
	// months by their night hours.
	var month, monthUn [12]float64
	for s, wh := range yr.StepACWh {
		month[m.StepMonth[s]] += wh
	}
	for s, wh := range yu.StepACWh {
		monthUn[m.StepMonth[s]] += wh
	}
	for i := range 12 {
		night := 0.0
		if m.NightHours > 0 {
			night = yr.NightWh * float64(m.MonthNightHours[i]) / float64(m.NightHours)
		}
		r.MonthlyACkWh[i] = (month[i] - night) * avail / 1000
		r.MonthlyUnshadedACkWh[i] = (monthUn[i] - night) * avail / 1000
	}

	// The breakdown, over the layout's modules only.
	var poaUn, poaSh, poaIAM, poaSoil, own, ownUn float64
	ownAll := m.Year.ModuleDCWh()
	var ownUnAll []float64
	if m.YearUnshaded != nil {
		ownUnAll = m.YearUnshaded.ModuleDCWh()
	}
	for _, in := range l.Inputs {
		for _, st := range in {
			for _, k := range st {
				poaUn += m.modPOAUn[k]
				poaSh += m.modPOASh[k]
				poaIAM += m.modPOAIAM[k]
				poaSoil += m.modPOASoil[k]
				own += ownAll[k]
				if ownUnAll != nil {
					ownUn += ownUnAll[k]
				}
			}
		}
	}
	eta := m.EtaSTC
	r.NominalDCkWh = poaUn * eta / 1000
	if count := len(modulesOf(l)); count > 0 && len(m.In.Modules) > 0 {
		r.RefPOAKWhM2 = poaUn / (float64(count) * m.In.Modules[0].AreaM2()) / 1000
	}
	var steps []Loss
	level := poaUn * eta
	add := func(name string, lossWh float64) {
		pct := 0.0
		if level > 0 {
			pct = 100 * lossWh / level
		}
		steps = append(steps, Loss{Step: name, KWh: lossWh / 1000, Pct: pct})
		level -= lossWh
	}
	// Strings lose to mismatch even without shade (faces of different orientation or
	// temperature in one string or on one input); that share, measured on the unshaded
	// reference, is told apart from the mismatch that shade adds.
	mismatch := own - yr.GlobalDCWh
	plain := 0.0
	if ownUn > 0 {
		plain = own * (1 - yu.GlobalDCWh/ownUn)
	}
	add("shade on the modules (irradiance)", (poaUn-poaSh)*eta)
	add("incidence angle (reflection)", (poaSh-poaIAM)*eta)
	add("soiling", (poaIAM-poaSoil)*eta)
	add("temperature, low light and bypass diodes", poaSoil*eta-own)
	add("string mismatch without shade (orientation, temperature)", plain)
	add("string mismatch under shade", mismatch-plain)
	add("MPPT voltage window", yr.WindowLossWh)
	add("input current limit", yr.CurrentLimitLossWh)
	if yr.TrackerLossWh != 0 {
		add("tracker on a local maximum", yr.TrackerLossWh)
	}
	add("module tolerance mismatch", yr.DCWh*sys.Losses.MismatchPct/100)
	add("DC wiring", yr.DCWh*(1-sys.Losses.MismatchPct/100)*sys.Losses.WiringPct/100)
	dcIn := yr.DCWh * opt.DCKeep
	add("inverter conversion", dcIn-yr.ACWh-yr.ClippedWh)
	add("inverter clipping (AC limit)", yr.ClippedWh)
	add("inverter night consumption", yr.NightWh)
	add("availability", (yr.ACWh-yr.NightWh)*(1-avail))
	r.Losses = steps
	return r, nil
}

// modulesOf lists the layout's modules.
func modulesOf(l electric.Layout) []int {
	var out []int
	for _, in := range l.Inputs {
		for _, st := range in {
			out = append(out, st...)
		}
	}
	return out
}
