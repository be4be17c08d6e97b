package layout

import (
	"fmt"
	"math"

	"sunstring/yield/electric"
	"sunstring/yield/irradiance"
)

// Limits are the temperature extremes, the mounting and the module's own voltage rating.
type Limits struct {
	LowTempC         float64 // lowest expected air temperature, taken as the cell temperature at dawn
	HighTempC        float64 // hottest expected air temperature
	MaxSystemVoltage float64 // the module's rating (0: not checked)
	// Mounting gives the hottest cell temperature, Mounting.HotCellC(HighTempC): the same
	// model the yield uses.
	Mounting irradiance.Mounting
}

// Bounds are the allowed modules per string and strings per input.
type Bounds struct {
	MinSeries, MaxSeries int
	MaxParallel          int
	VocColdV, VmpHotV    float64 // one module's
	VmpColdV             float64
}

// StringBounds returns how many modules a string may hold and how many strings an input may
// take, from the voltage at the cold end (IEC 62548-1: N·Voc(Tmin) below the inverter's and
// the module's maximum DC voltage), the MPP voltage at the hot end (N·Vmp(Tcell,max) above the
// MPPT minimum), the MPP voltage at the cold end (below the MPPT maximum, so the tracker is
// not pushed out of its window) and the input current limit (strings × Imp).
func StringBounds(ds electric.Datasheet, inv electric.Inverter, lim Limits) (Bounds, error) {
	var b Bounds
	// One set of formulas with the checks that are reported (electric.VocAt, VmpAt: the Vmp
	// coefficient is Pmax's less Isc's), so that no string the bounds allow is flagged.
	b.VocColdV = electric.VocAt(ds, lim.LowTempC)
	hot := lim.Mounting.HotCellC(lim.HighTempC)
	b.VmpHotV = electric.VmpAt(ds, hot)
	b.VmpColdV = electric.VmpAt(ds, lim.LowTempC)
	maxV := inv.MaxDCVoltageV
	if lim.MaxSystemVoltage > 0 && lim.MaxSystemVoltage < maxV {
		maxV = lim.MaxSystemVoltage
	}
	b.MaxSeries = int(math.Floor(maxV / b.VocColdV))
	if n := int(math.Floor(inv.MPPTMaxV / b.VmpColdV)); n < b.MaxSeries {
		b.MaxSeries = n
	}
	b.MinSeries = int(math.Ceil(inv.MPPTMinV / b.VmpHotV))
	if b.MinSeries < 1 {
		b.MinSeries = 1
	}
	b.MaxParallel = int(math.Floor(inv.MaxInputCurrentA / ds.ImpA))
	switch {
	case b.MaxSeries < b.MinSeries:
		return b, fmt.Errorf("layout: no string length fits: at most %d modules (%.1f V open-circuit each at %g °C, limit %.0f V) but at least %d (%.1f V MPP each at %.0f °C cell, MPPT minimum %.0f V)",
			b.MaxSeries, b.VocColdV, lim.LowTempC, maxV, b.MinSeries, b.VmpHotV, hot, inv.MPPTMinV)
	case b.MaxParallel < 1:
		return b, fmt.Errorf("layout: one string's current (%.1f A at MPP) exceeds the input limit %.1f A", ds.ImpA, inv.MaxInputCurrentA)
	}
	return b, nil
}

// Sequential wires the modules in the given order into as few strings as the bounds allow,
// as equal in length as possible, strings of one input of equal length. Modules that do not
// fit the inverter are left out; left reports how many.
func Sequential(order []int, inputs int, b Bounds) (l electric.Layout, left int, err error) {
	n := len(order)
	if n < b.MinSeries {
		return l, n, fmt.Errorf("layout: %d modules cannot make one string of at least %d", n, b.MinSeries)
	}
	capacity := inputs * b.MaxParallel * b.MaxSeries
	if n > capacity {
		left = n - capacity
		n = capacity
	}
	// Fewest strings; spread over inputs first (one string per input before parallels).
	k := (n + b.MaxSeries - 1) / b.MaxSeries
	for k*b.MinSeries > n {
		k--
	}
	if k < 1 {
		k = 1
	}
	// Strings in parallel on one input must be equal: with k strings over the inputs, an input
	// with p strings takes p·len modules.
	l.Inputs = make([][][]int, 0, inputs)
	perInput := make([]int, inputs)
	for i := range k {
		perInput[i%inputs]++
	}
	pos := 0
	remaining := n
	remStrings := k
	for in := 0; in < inputs && remStrings > 0; in++ {
		p := perInput[in]
		if p == 0 {
			continue
		}
		// this input's share of modules, a multiple of p
		share := remaining * p / remStrings
		length := share / p
		if length > b.MaxSeries {
			length = b.MaxSeries
		}
		if length < b.MinSeries {
			length = b.MinSeries
		}
		if p*length > remaining {
			break
		}
		var strs [][]int
		for range p {
			strs = append(strs, append([]int(nil), order[pos:pos+length]...))
			pos += length
		}
		l.Inputs = append(l.Inputs, strs)
		remaining -= p * length
		remStrings -= p
	}
	left += remaining
	return l, left, nil
}
