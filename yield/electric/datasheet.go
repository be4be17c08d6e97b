package electric

import (
	"fmt"
	"math"
)

// Datasheet holds a module's values at standard test conditions (1000 W/m²,
// 25 °C cell, AM1.5) as a datasheet prints them. The zero value is invalid;
// Validate says why.
type Datasheet struct {
	PowerW, VocV, IscA, VmpV, ImpA float64
	// Temperature coefficients in %/K of the STC value (Voc and Pmax negative,
	// Isc small and positive for crystalline silicon).
	TempCoeffVocPct, TempCoeffIscPct, TempCoeffPmaxPct float64
	// CellsSeries counts cells as the datasheet does (60, 72, or 120/144 for
	// half-cut modules).
	CellsSeries int
	// BypassDiodes is the number of substrings, each behind its own diode.
	BypassDiodes int
	// HalfCut reports whether the module is built of CellsSeries half-cells
	// in two parallel halves, so CellsSeries/2 cell positions are in series.
	HalfCut bool
}

// seriesCells returns the number of cell positions in series.
func (d Datasheet) seriesCells() int {
	if d.HalfCut {
		return d.CellsSeries / 2
	}
	return d.CellsSeries
}

// Validate checks that the values are finite, in range and consistent, and returns the
// first problem Problems finds, or nil. Each error names its field under "module." and
// implements BadInput() bool.
func (d Datasheet) Validate() error {
	if ps := d.Problems(); len(ps) > 0 {
		return ps[0]
	}
	return nil
}

// Problems returns every problem with the values, each an *InputError whose Field is the
// site file's key ("module.vmp_v"), in the order of the fields. It is the one validation of a
// datasheet: a front end maps each error to its key rather than keeping limits of its own.
// Checks that relate two fields run only when both fields are valid on their own.
func (d Datasheet) Problems() []*InputError {
	var out []*InputError
	bad := func(field, format string, args ...any) {
		out = append(out, &InputError{Field: field, Msg: fmt.Sprintf(format, args...)})
	}
	pos := []struct {
		name string
		v    float64
		max  float64
		unit string
	}{
		{"module.power_w", d.PowerW, 2000, "W"},
		{"module.voc_v", d.VocV, 200, "V"},
		{"module.isc_a", d.IscA, 50, "A"},
		{"module.vmp_v", d.VmpV, 200, "V"},
		{"module.imp_a", d.ImpA, 50, "A"},
	}
	okPos := true
	for _, f := range pos {
		if math.IsNaN(f.v) || f.v <= 0 || f.v > f.max {
			bad(f.name, "%g must be greater than 0 and at most %g %s", f.v, f.max, f.unit)
			okPos = false
		}
	}
	if okPos {
		vOK := d.VmpV < d.VocV
		if !vOK {
			bad("module.vmp_v", "%g must be below voc_v %g", d.VmpV, d.VocV)
		}
		iOK := d.ImpA < d.IscA
		if !iOK {
			bad("module.imp_a", "%g must be below isc_a %g", d.ImpA, d.IscA)
		}
		// A fill factor above ~0.9 is beyond any silicon cell; below 0.5 is a typo.
		if ff := d.VmpV * d.ImpA / (d.VocV * d.IscA); vOK && iOK && (ff < 0.5 || ff > 0.9) {
			bad("module.vmp_v", "fill factor vmp·imp/(voc·isc) = %.3f must lie in 0.5..0.9", ff)
		}
		// Datasheets round Vmp and Imp; allow 3 % between them and the rated power.
		if pm := d.VmpV * d.ImpA; math.Abs(pm-d.PowerW) > 0.03*d.PowerW {
			bad("module.power_w", "%g differs from vmp_v·imp_a = %.1f by more than 3 %%", d.PowerW, pm)
		}
	}
	coeffs := []struct {
		name   string
		v      float64
		lo, hi float64
	}{
		{"module.temp_coeff_voc_pct", d.TempCoeffVocPct, -1, 0},
		{"module.temp_coeff_isc_pct", d.TempCoeffIscPct, -0.1, 0.2},
		{"module.temp_coeff_pmax_pct", d.TempCoeffPmaxPct, -1, 0},
	}
	for _, c := range coeffs {
		if math.IsNaN(c.v) || c.v < c.lo || c.v > c.hi {
			bad(c.name, "%g must lie in %g..%g %%/K", c.v, c.lo, c.hi)
		} else if c.name == "module.temp_coeff_voc_pct" && c.v == 0 {
			bad(c.name, "0 must be negative")
		}
	}
	cellsOK := true
	switch {
	case d.CellsSeries <= 0 || d.CellsSeries > 288 || d.CellsSeries%6 != 0:
		bad("module.cells_series", "%d must be a positive multiple of 6 up to 288", d.CellsSeries)
		cellsOK = false
	case d.HalfCut && d.CellsSeries%12 != 0:
		bad("module.cells_series", "%d half-cells must be a multiple of 12 (two halves of 6 columns)", d.CellsSeries)
		cellsOK = false
	}
	if d.BypassDiodes < 1 || d.BypassDiodes > 6 || 6%d.BypassDiodes != 0 {
		bad("module.bypass_diodes", "%d must be 1, 2, 3 or 6 (the 6 cell columns split evenly)", d.BypassDiodes)
	}
	// Per-cell Voc of silicon lies near 0.5..0.8 V.
	if okPos && cellsOK {
		if vc := d.VocV / float64(d.seriesCells()); vc < 0.4 || vc > 0.9 {
			bad("module.cells_series", "%d gives %.3f V a cell from voc_v %g; expected 0.4..0.9 V", d.CellsSeries, vc, d.VocV)
		}
	}
	return out
}
