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
	Losses       []Loss
}

// Evaluate runs a layout over the prepared year.
func (m *Model) Evaluate(l electric.Layout, opt electric.EvalOptions) (LayoutResult, error) {
	sys := m.In.System
	if opt.NightHours == 0 {
		opt.NightHours = float64(m.NightHours) * m.In.Weather.Interval.Hours()
		if opt.NightHours == 0 {
			opt.NightHours = -1
		}
	}
	yr, err := m.Year.Evaluate(l, sys.Inverter, opt)
	if err != nil {
		return LayoutResult{}, fmt.Errorf("yield: layout: %w", err)
	}
	r := LayoutResult{Layout: l, Year: yr}
	// Flat losses. Module tolerance mismatch and DC wiring act before the inverter; they are
	// applied as a factor on the AC energy, which ignores their small effect on the
	// inverter's operating point (under 0.1 % of AC for a few percent of DC loss on a flat
	// efficiency curve — common practice).
	dcKeep := (1 - sys.Losses.MismatchPct/100) * (1 - sys.Losses.WiringPct/100)
	avail := 1 - sys.Losses.AvailabilityPct/100
	grossAC := yr.ACWh
	r.ACkWh = (grossAC*dcKeep - yr.NightWh) * avail / 1000
	r.UnshadedACkWh = (yr.UnshadedACWh*dcKeep - yr.NightWh) * avail / 1000
	if r.UnshadedACkWh > 0 {
		r.ShadeLossPct = 100 * (1 - r.ACkWh/r.UnshadedACkWh)
	}
	// Monthly: the step energies carry the same factors; night consumption is spread by the
	// month's night hours share, which is close enough at a watt or two.
	var monthGross [12]float64
	for s, wh := range yr.StepACWh {
		monthGross[m.StepMonth[s]] += wh
	}
	var totalUn float64
	for _, w := range m.MonthlyUnshadedPOAWh {
		totalUn += w
	}
	for i := range 12 {
		share := 0.0
		if grossAC > 0 {
			share = monthGross[i] / grossAC
		}
		r.MonthlyACkWh[i] = (monthGross[i]*dcKeep - yr.NightWh/12) * avail / 1000
		_ = share
		if totalUn > 0 {
			r.MonthlyUnshadedACkWh[i] = r.UnshadedACkWh * m.MonthlyUnshadedPOAWh[i] / totalUn
		}
	}

	// The breakdown, over the layout's modules only.
	var poaUn, poaSh, poaIAM, poaSoil, own float64
	ownAll := m.Year.ModuleDCWh()
	for _, in := range l.Inputs {
		for _, st := range in {
			for _, k := range st {
				poaUn += m.modPOAUn[k]
				poaSh += m.modPOASh[k]
				poaIAM += m.modPOAIAM[k]
				poaSoil += m.modPOASoil[k]
				own += ownAll[k]
			}
		}
	}
	eta := m.EtaSTC
	r.NominalDCkWh = poaUn * eta / 1000
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
	add("shade on the modules (irradiance)", (poaUn-poaSh)*eta)
	add("incidence angle (reflection)", (poaSh-poaIAM)*eta)
	add("soiling", (poaIAM-poaSoil)*eta)
	add("temperature, low light and bypass diodes", poaSoil*eta-own)
	add("string mismatch under shade", own-yr.GlobalDCWh)
	add("MPPT voltage window", yr.WindowLossWh)
	add("input current limit", yr.CurrentLimitLossWh)
	if yr.TrackerLossWh != 0 {
		add("tracker on a local maximum", yr.TrackerLossWh)
	}
	add("module tolerance mismatch", yr.DCWh*sys.Losses.MismatchPct/100)
	add("DC wiring", yr.DCWh*(1-sys.Losses.MismatchPct/100)*sys.Losses.WiringPct/100)
	dcIn := yr.DCWh * dcKeep
	add("inverter conversion", dcIn-(grossAC+yr.ClippedWh)*dcKeep)
	add("inverter clipping (AC limit)", yr.ClippedWh*dcKeep)
	add("inverter night consumption", yr.NightWh)
	add("availability", (grossAC*dcKeep-yr.NightWh)*(1-avail))
	r.Losses = steps
	return r, nil
}
