package yield

import (
	"fmt"

	"sunstring/yield/electric"
)

// Loss is one step of the breakdown from plane-of-array irradiation to AC energy.
type Loss struct {
	Group string // where the energy goes: one of LossGroups
	Step  string
	KWh   float64 // energy lost at this step
	Pct   float64 // of the energy entering the step
}

// LossGroups name where the energy goes, in the order the breakdown follows it: the light
// on its way to the cells, the conversion in the modules, the strings and their cables, the
// inverter, and the running of the system.
var LossGroups = []string{GroupLight, GroupModules, GroupStrings, GroupInverter, GroupOperation}

// The loss groups.
const (
	GroupLight     = "light reaching the modules"
	GroupModules   = "the modules themselves"
	GroupStrings   = "strings and cables"
	GroupInverter  = "the inverter"
	GroupOperation = "operation"
)

// The three ways shade costs energy. The same words name the shade split (ShadeSplit),
// the breakdown's shade steps (with the ShadePrefix) and what the report prints.
const (
	ShadeLight   = "less light on the modules"
	ShadeStrings = "shaded modules holding back their strings"
	ShadeBypass  = "bypass diodes in partly shaded modules"
	ShadePrefix  = "shade: "
)

// The breakdown's steps, by group. Steps marked as shade carry ShadePrefix.
const (
	StepShadeLight   = ShadePrefix + ShadeLight
	StepIncidence    = "light reflected off the glass (angle of incidence)"
	StepSoiling      = "dirt on the glass (soiling)"
	StepHeat         = "heat and weak light"
	StepShadeBypass  = ShadePrefix + ShadeBypass
	StepShadeStrings = ShadePrefix + ShadeStrings
	StepUnlike       = "unlike modules in one string (orientation, temperature)"
	StepTolerance    = "module-to-module tolerance"
	StepCables       = "DC cables"
	StepWindow       = "outside the inverter's voltage window"
	StepCurrentLimit = "above an input's current limit"
	StepTracker      = "tracker held on a local peak"
	StepConversion   = "conversion to AC"
	StepACLimit      = "held at the inverter's AC power"
	StepNight        = "the inverter's own use at night"
	StepAvailability = "availability"
)

// ShadeSplit is the share of the year's energy lost to shade and how it divides. The AC
// energy lost (the same modules and strings without shade, less with it) is apportioned
// to the three causes by the breakdown's shade steps, so that the parts add up to the
// whole even though the steps sit at different points of the chain.
type ShadeSplit struct {
	LostKWh float64 // UnshadedACkWh − ACkWh
	LostPct float64 // of UnshadedACkWh: the layout's ShadeLossPct
	// Parts in the order ShadeLight, ShadeStrings, ShadeBypass: kWh of AC a year, and
	// percentage points of UnshadedACkWh (they add up to LostPct).
	Parts [3]ShadePart
}

// ShadePart is one cause of the shade loss.
type ShadePart struct {
	Cause string // ShadeLight, ShadeStrings or ShadeBypass
	KWh   float64
	Pct   float64
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
	Shade       ShadeSplit
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
// its inputs the plant's in order, inverter by inverter (System.Plant, electric.Plant.Split),
// without the unshaded reference and the breakdown: the layout search's objective.
func (m *Model) EvaluateACWh(l electric.Layout, opt electric.EvalOptions) (float64, error) {
	return m.EvaluateACWhCached(l, opt, nil)
}

// EvaluateACWhCached is EvaluateACWh through a cache of the inputs' shares of the year, so
// that a search that changes one or two inputs at a time recomputes only those; the value is
// the same to the bit. A nil cache computes everything.
func (m *Model) EvaluateACWhCached(l electric.Layout, opt electric.EvalOptions, c *electric.EvalCache) (float64, error) {
	yr, err := m.Year.EvaluatePlantCached(l, m.In.System.Plant(), m.options(opt), c)
	if err != nil {
		return 0, fmt.Errorf("yield: layout: %w", err)
	}
	_, avail := m.flat()
	return (yr.ACWh - yr.NightWh) * avail, nil
}

// KeepStrings builds in c the years of the layout's strings on the prepared year
// (electric.EvalCache.KeepStrings), so that evaluating the layout again, with another tracker
// or with some of its modules taken out or rewired, reads them.
func (m *Model) KeepStrings(l electric.Layout, c *electric.EvalCache) {
	c.KeepStrings(m.Year, l)
}

// Evaluate runs a layout over the prepared year, and the same layout over the unshaded
// reference year for its shade loss. The layout's inputs are the plant's in order, inverter by
// inverter (System.Plant, electric.Plant.Split): each inverter clips at its own AC limit and
// counts its own night consumption, and the results add up.
func (m *Model) Evaluate(l electric.Layout, opt electric.EvalOptions) (LayoutResult, error) {
	return m.EvaluateCached(l, opt, nil)
}

// EvaluateCached is Evaluate through a cache of the inputs' and strings' shares of both years
// (electric.EvalCache), for evaluating several layouts that share strings; the result is the
// same to the bit. A nil cache computes everything.
func (m *Model) EvaluateCached(l electric.Layout, opt electric.EvalOptions, c *electric.EvalCache) (LayoutResult, error) {
	sys := m.In.System
	opt = m.options(opt)
	plant := sys.Plant()
	yr, err := m.Year.EvaluatePlantCached(l, plant, opt, c)
	if err != nil {
		return LayoutResult{}, fmt.Errorf("yield: layout: %w", err)
	}
	r := LayoutResult{Layout: l, Year: yr}
	_, avail := m.flat()
	net := func(y electric.YearResult) float64 { return (y.ACWh - y.NightWh) * avail / 1000 }
	r.ACkWh = net(yr)
	var yu electric.YearResult
	if m.YearUnshaded != nil {
		if yu, err = m.YearUnshaded.EvaluatePlantCached(l, plant, opt, c); err != nil {
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
	var poaUn, poaSh, poaIAM, poaSoil, poaSoilUn, own, ownUn float64
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
				poaSoilUn += m.modPOASoilUn[k]
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
	add := func(group, name string, lossWh float64) {
		pct := 0.0
		if level > 0 {
			pct = 100 * lossWh / level
		}
		steps = append(steps, Loss{Group: group, Step: name, KWh: lossWh / 1000, Pct: pct})
		level -= lossWh
	}
	// The modules convert the light they get less well than at STC (heat, weak light);
	// measured on the unshaded reference, that share is the same modules' own. What a
	// partly shaded module loses beyond it (cells held back, bypass diodes conducting) is
	// shade's.
	keepUn := 1.0
	if ownUn > 0 && poaSoilUn > 0 {
		keepUn = ownUn / (poaSoilUn * eta)
	}
	// Strings lose to mismatch even without shade (faces of different orientation or
	// temperature in one string or on one input); that share, measured on the unshaded
	// reference, is told apart from the mismatch that shade adds.
	mismatch := own - yr.GlobalDCWh
	plain := 0.0
	if ownUn > 0 {
		plain = own * (1 - yu.GlobalDCWh/ownUn)
	}
	shadeLight := (poaUn - poaSh) * eta
	shadeBypass := poaSoil*eta*keepUn - own
	shadeStrings := mismatch - plain
	add(GroupLight, StepShadeLight, shadeLight)
	add(GroupLight, StepIncidence, (poaSh-poaIAM)*eta)
	add(GroupLight, StepSoiling, (poaIAM-poaSoil)*eta)
	add(GroupModules, StepHeat, poaSoil*eta*(1-keepUn))
	add(GroupModules, StepShadeBypass, shadeBypass)
	add(GroupStrings, StepShadeStrings, shadeStrings)
	add(GroupStrings, StepUnlike, plain)
	add(GroupStrings, StepTolerance, yr.DCWh*sys.Losses.MismatchPct/100)
	add(GroupStrings, StepCables, yr.DCWh*(1-sys.Losses.MismatchPct/100)*sys.Losses.WiringPct/100)
	add(GroupInverter, StepWindow, yr.WindowLossWh)
	add(GroupInverter, StepCurrentLimit, yr.CurrentLimitLossWh)
	if yr.TrackerLossWh != 0 {
		add(GroupInverter, StepTracker, yr.TrackerLossWh)
	}
	dcIn := yr.DCWh * opt.DCKeep
	add(GroupInverter, StepConversion, dcIn-yr.ACWh-yr.ClippedWh)
	add(GroupInverter, StepACLimit, yr.ClippedWh)
	add(GroupOperation, StepNight, yr.NightWh)
	add(GroupOperation, StepAvailability, (yr.ACWh-yr.NightWh)*(1-avail))
	r.Shade = splitShade(r.UnshadedACkWh, r.ACkWh, [3]float64{shadeLight, shadeStrings, shadeBypass})
	r.Losses = steps
	return r, nil
}

// splitShade apportions the AC energy shade costs (unshaded less shaded) to the three
// causes by their steps in the breakdown, w (Wh, in the order ShadeLight, ShadeStrings,
// ShadeBypass).
func splitShade(unshadedKWh, acKWh float64, w [3]float64) ShadeSplit {
	sp := ShadeSplit{Parts: [3]ShadePart{{Cause: ShadeLight}, {Cause: ShadeStrings}, {Cause: ShadeBypass}}}
	if unshadedKWh <= 0 {
		return sp
	}
	sp.LostKWh = unshadedKWh - acKWh
	sp.LostPct = 100 * sp.LostKWh / unshadedKWh
	sum := w[0] + w[1] + w[2]
	if sum == 0 {
		return sp
	}
	for i := range sp.Parts {
		sp.Parts[i].KWh = sp.LostKWh * w[i] / sum
		sp.Parts[i].Pct = 100 * sp.Parts[i].KWh / unshadedKWh
	}
	return sp
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
