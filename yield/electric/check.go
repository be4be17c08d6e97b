package electric

import (
	"fmt"
	"math"
)

// Severity ranks a Finding.
type Severity int

const (
	// Info is a remark.
	Info Severity = iota
	// Warning costs energy but harms nothing.
	Warning
	// Error would damage equipment or break a standard's requirement.
	Error
)

func (s Severity) String() string {
	switch s {
	case Error:
		return "error"
	case Warning:
		return "warning"
	}
	return "info"
}

// Finding is the result of one design check. Value and Limit carry the
// number compared, in volts, amperes or milliamperes as Unit says.
type Finding struct {
	Severity     Severity
	Code         string // stable identifier, e.g. "voc_cold"
	Message      string
	Input        int // inverter input (0-based), −1 when not input-specific
	Value, Limit float64
	Unit         string // "V", "A" or "mA"
	// Detail is the installer-facing explanation: where a limit comes from and what
	// the estimate assumes. Empty when the Message says it all.
	Detail string
}

// VocAt returns the module's open-circuit voltage at cell temperature tempC
// (°C) from the datasheet coefficient: Voc·[1 + β(T − 25)] (IEC 62548-1
// sizing practice).
func VocAt(ds Datasheet, tempC float64) float64 {
	return ds.VocV * (1 + ds.TempCoeffVocPct/100*(tempC-stcTempC))
}

// VmpCoeffPct returns the MPP-voltage temperature coefficient (%/K) as the
// Pmax coefficient less the Isc coefficient, taking Imp to vary like Isc
// (common practice when a datasheet gives no Vmp coefficient).
func VmpCoeffPct(ds Datasheet) float64 { return ds.TempCoeffPmaxPct - ds.TempCoeffIscPct }

// VmpAt returns the module's MPP voltage at cell temperature tempC (°C).
func VmpAt(ds Datasheet, tempC float64) float64 {
	return scaleByCoeff(ds.VmpV, VmpCoeffPct(ds), tempC)
}

func scaleByCoeff(v, coeffPct, tempC float64) float64 {
	return v * (1 + coeffPct/100*(tempC-stcTempC))
}

// StringLimits returns the shortest and longest string for the inverter:
// the longest keeps the open-circuit voltage at lowTempC below the maximum
// DC voltage, the shortest keeps the MPP voltage at hotCellTempC at or above
// the MPPT minimum. minN > maxN means no length satisfies both.
func StringLimits(ds Datasheet, lowTempC, hotCellTempC float64, inv Inverter) (minN, maxN int) {
	voc := VocAt(ds, lowTempC)
	vmp := VmpAt(ds, hotCellTempC)
	if voc > 0 {
		maxN = int(math.Floor(inv.MaxDCVoltageV/voc + 1e-9))
	}
	if vmp > 0 {
		minN = int(math.Ceil(inv.MPPTMinV/vmp - 1e-9))
	}
	return max(minN, 1), maxN
}

// CheckStrings checks string lengths per inverter input (inputs[a] lists the
// lengths of the strings on input a) against the inverter: open-circuit
// voltage at lowTempC (the lowest expected air temperature, taken as the
// cell temperature at dawn, common practice) below the maximum DC voltage
// (Error); MPP voltage at hotCellTempC at or above the MPPT minimum
// (Warning); MPP voltage at lowTempC within the MPPT maximum (Warning);
// input MPP current at STC within the input limit (Warning: the inverter
// moves off the maximum); 1.25·Isc per input above the limit (Warning: the
// factor IEC 62548-1 applies to a string's short-circuit current at STC for
// higher irradiance when it sizes cables and protection, from memory; an
// input rated below it may not withstand a fault); strings
// of unequal length on one input (Warning); more inputs than the inverter
// has (Error). Invalid datasheet or inverter values give one Error each.
func CheckStrings(ds Datasheet, inputs [][]int, lowTempC, hotCellTempC float64, inv Inverter) []Finding {
	var out []Finding
	if err := ds.Validate(); err != nil {
		return []Finding{{Severity: Error, Code: "bad_module", Message: err.Error(), Input: -1}}
	}
	if err := inv.Validate(); err != nil {
		return []Finding{{Severity: Error, Code: "bad_inverter", Message: err.Error(), Input: -1}}
	}
	if len(inputs) > inv.Inputs {
		out = append(out, Finding{Severity: Error, Code: "too_many_inputs", Input: -1,
			Message: fmt.Sprintf("%d inputs used, the inverter has %d", len(inputs), inv.Inputs),
			Value:   float64(len(inputs)), Limit: float64(inv.Inputs)})
	}
	voc, vmpHot, vmpCold := VocAt(ds, lowTempC), VmpAt(ds, hotCellTempC), VmpAt(ds, lowTempC)
	for a, lens := range inputs {
		var nPar, minL, maxL int
		for b, n := range lens {
			if n <= 0 {
				out = append(out, Finding{Severity: Error, Code: "empty_string", Input: a,
					Message: fmt.Sprintf("input %d string %d has %d modules", a+1, b+1, n)})
				continue
			}
			nPar++
			if minL == 0 || n < minL {
				minL = n
			}
			maxL = max(maxL, n)
		}
		if nPar == 0 {
			continue
		}
		if v := float64(maxL) * voc; v > inv.MaxDCVoltageV {
			out = append(out, Finding{Severity: Error, Code: "voc_cold", Input: a, Value: v, Limit: inv.MaxDCVoltageV, Unit: "V",
				Message: fmt.Sprintf("input %d: %d modules reach %.1f V open circuit at %g °C, above the inverter's maximum %.0f V", a+1, maxL, v, lowTempC, inv.MaxDCVoltageV)})
		}
		if v := float64(minL) * vmpHot; v < inv.MPPTMinV {
			out = append(out, Finding{Severity: Warning, Code: "vmp_hot", Input: a, Value: v, Limit: inv.MPPTMinV, Unit: "V",
				Message: fmt.Sprintf("input %d: %d modules give %.1f V at the MPP at %.0f °C cell, below the MPPT minimum %.0f V", a+1, minL, v, hotCellTempC, inv.MPPTMinV)})
		}
		if v := float64(maxL) * vmpCold; v > inv.MPPTMaxV {
			out = append(out, Finding{Severity: Warning, Code: "vmp_cold", Input: a, Value: v, Limit: inv.MPPTMaxV, Unit: "V",
				Message: fmt.Sprintf("input %d: %d modules give %.1f V at the MPP at %g °C, above the MPPT maximum %.0f V", a+1, maxL, v, lowTempC, inv.MPPTMaxV)})
		}
		// One string on an input cannot be split further: the remedy is another input.
		give, fewer := fmt.Sprintf("%d strings give", nPar), "or put fewer strings on this input"
		if nPar == 1 {
			give, fewer = "1 string gives", "or choose an inverter whose inputs take one string's current"
		}
		if i := float64(nPar) * ds.ImpA; i > inv.MaxInputCurrentA {
			out = append(out, Finding{Severity: Warning, Code: "input_current", Input: a, Value: i, Limit: inv.MaxInputCurrentA, Unit: "A",
				Message: fmt.Sprintf("input %d: %s %.1f A at the MPP, above the input limit %.1f A; the inverter will clip current", a+1, give, i, inv.MaxInputCurrentA)})
		}
		if i := 1.25 * float64(nPar) * ds.IscA; i > inv.MaxInputCurrentA {
			out = append(out, Finding{Severity: Warning, Code: "input_isc", Input: a, Value: i, Limit: inv.MaxInputCurrentA, Unit: "A",
				Message: fmt.Sprintf("input %d: 1.25 × short-circuit current (the IEC 62548-1 sizing factor) is %.1f A, above the input rating %.1f A; check the inverter's maximum short-circuit current per input, %s", a+1, i, inv.MaxInputCurrentA, fewer)})
		}
		if minL != maxL {
			out = append(out, Finding{Severity: Warning, Code: "unequal_strings", Input: a, Value: float64(maxL), Limit: float64(minL), Unit: "",
				Message: fmt.Sprintf("input %d: strings of %d and %d modules in parallel lose power to mismatch", a+1, minL, maxL)})
		}
	}
	return out
}

// LeakageAssumptions are the inputs of the leakage estimate. The zero value
// gives the documented defaults.
type LeakageAssumptions struct {
	// DryNFPerM2 and WetNFPerM2 are the array's capacitance to earth per
	// module area (nF/m²). Zero means 20 dry and 100 wet: framed glass-foil
	// crystalline modules measure roughly 50–150 nF/kWp dry, several times
	// more under dew or rain (from memory; no measured value here).
	DryNFPerM2, WetNFPerM2 float64
	// CommonModeV is the RMS grid-frequency voltage of the array against
	// earth (V). Zero means 115 V: half of 230 V, for a single-phase
	// transformerless bridge whose array midpoint follows the grid (common
	// practice estimate).
	CommonModeV float64
	// GridHz is the grid frequency; zero means 50 Hz.
	GridHz float64
	// RatedKVA is the inverter's rating; it selects the continuous limit.
	RatedKVA float64
}

// LeakageResult is the capacitive leakage estimate.
type LeakageResult struct {
	CapDryNF, CapWetNF float64 // array capacitance to earth (nF)
	DrymA, WetmA       float64 // RMS leakage current (mA)
	// ContinuousLimitmA is the continuous residual-current limit the estimate is held to.
	ContinuousLimitmA float64
	Findings          []Finding
}

// Residual-current monitoring of transformerless inverters, IEC 62109-2:2011 clause 4.8.3.5
// (clause number and values from memory, not re-read): a continuous residual current above
// 300 mA for inverters rated up to 30 kVA (10 mA per kVA above) must disconnect within 0.3 s;
// sudden changes of 30, 60 and 150 mA within 0.3, 0.15 and 0.04 s. The sudden-change limits
// guard against a person touching a live part or a fresh insulation fault, which step the
// residual current within fractions of a second. Dew and rain raise the capacitive leakage
// over minutes, so wetting is held to the continuous limit, never to the sudden-change ones.
const (
	leakContinuousmA      = 300.0
	leakContinuousPerkVA  = 10.0
	leakContinuousUpTokVA = 30.0
	leakSuddenmA          = 30.0
)

// leakageSource names where the limits come from, for the installer.
const leakageSource = "IEC 62109-2:2011 clause 4.8.3.5, values from memory: check the inverter's manual"

// ContinuousLeakageLimitmA returns the continuous residual-current limit (mA) of a
// transformerless inverter rated ratedKVA: 300 mA up to 30 kVA, 10 mA per kVA above
// (IEC 62109-2:2011 clause 4.8.3.5, from memory).
func ContinuousLeakageLimitmA(ratedKVA float64) float64 {
	if ratedKVA > leakContinuousUpTokVA {
		return leakContinuousPerkVA * ratedKVA
	}
	return leakContinuousmA
}

// Leakage estimates the capacitive current that a transformerless inverter
// drives through the array's capacitance to earth: I = 2πf·C·Vcm, with C the
// module area times the capacitance per area. The wet current and the
// dry-to-wet rise are both held to the continuous residual-current limit: the
// wet current above it is an Error (the inverter will refuse to run in wet
// weather); the rise is an Info that states the margin and why the
// sudden-change limits do not apply to it. Each finding's Detail says where the
// limits come from, for the installer.
func Leakage(moduleAreaM2 float64, a LeakageAssumptions) (LeakageResult, error) {
	if math.IsNaN(moduleAreaM2) || moduleAreaM2 < 0 || moduleAreaM2 > 1e5 {
		return LeakageResult{}, outOfModelf("array_area_m2", "%g must lie in 0..100000", moduleAreaM2)
	}
	def := func(v, d float64) float64 {
		if v == 0 {
			return d
		}
		return v
	}
	dry, wet := def(a.DryNFPerM2, 20), def(a.WetNFPerM2, 100)
	vcm, f := def(a.CommonModeV, 115), def(a.GridHz, 50)
	for _, x := range []float64{dry, wet, vcm, f} {
		if math.IsNaN(x) || x < 0 || math.IsInf(x, 0) {
			return LeakageResult{}, outOfModelf("leakage", "assumptions must be finite and non-negative")
		}
	}
	r := LeakageResult{CapDryNF: dry * moduleAreaM2, CapWetNF: wet * moduleAreaM2}
	w := 2 * math.Pi * f * vcm * 1e-9 * 1e3 // nF → mA
	r.DrymA, r.WetmA = w*r.CapDryNF, w*r.CapWetNF
	limit := ContinuousLeakageLimitmA(a.RatedKVA)
	r.ContinuousLimitmA = limit
	detail := fmt.Sprintf("Continuous residual-current limit %.0f mA (%.0f mA up to %.0f kVA, %.0f mA per kVA above); sudden changes of %.0f mA must trip within 0.3 s (%s). "+
		"The estimate assumes %.0f nF/m² dry and %.0f nF/m² wet to earth and %.0f V common-mode at %.0f Hz; measured values depend on the modules, the mounting and the weather.",
		limit, leakContinuousmA, leakContinuousUpTokVA, leakContinuousPerkVA, leakSuddenmA, leakageSource, dry, wet, vcm, f)
	// A warning, not an error: the estimate rests on assumed capacitances, and an error here
	// printed "fail" on a run that went on with exit 0.
	if r.WetmA > limit {
		r.Findings = append(r.Findings, Finding{Severity: Warning, Code: "leakage_continuous", Input: -1, Value: r.WetmA, Limit: limit, Unit: "mA",
			Message: fmt.Sprintf("wet array drives about %.0f mA capacitive current, above the %.0f mA continuous residual-current limit: the inverter may refuse to run in wet weather; split the array over more inverters or choose one with a transformer",
				r.WetmA, limit),
			Detail: detail})
	}
	if d := r.WetmA - r.DrymA; d > 0 {
		r.Findings = append(r.Findings, Finding{Severity: Info, Code: "leakage_rise", Input: -1, Value: d, Limit: limit, Unit: "mA",
			Message: fmt.Sprintf("leakage rises by about %.0f mA from dry (%.0f mA) to wet (%.0f mA) over minutes of dew or rain; held to the %.0f mA continuous limit, not to the %.0f mA sudden-change limit, which is for steps within fractions of a second",
				d, r.DrymA, r.WetmA, limit, leakSuddenmA),
			Detail: detail})
	}
	return r, nil
}
