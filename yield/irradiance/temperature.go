package irradiance

import (
	"errors"
	"fmt"
	"math"
)

// FaimanU0 and FaimanU1 are the Faiman (2008) heat-loss coefficients used when the caller
// gives none: U0 in W/(m²·K), U1 in W·s/(m³·K). They are the typical values for an
// open-rack glass–polymer module (from memory; commonly quoted with the model).
const FaimanU0, FaimanU1 = 25.0, 6.84

// CellTempFaiman returns the cell temperature in °C for plane-of-array irradiance poa
// (W/m²), air temperature airC (°C) and wind speed windMS (m/s), after Faiman (2008):
// Tc = Ta + POA/(U0 + U1·v). Passing u0 = u1 = 0 selects FaimanU0 and FaimanU1, so the
// zero value means the defaults. Negative poa and wind are read as 0. If the resulting
// heat-loss coefficient is not positive (negative coefficients), the module cannot shed
// heat in this model and the result is NaN rather than a made-up number.
func CellTempFaiman(poa, airC, windMS, u0, u1 float64) float64 {
	if u0 == 0 && u1 == 0 {
		u0, u1 = FaimanU0, FaimanU1
	}
	u := u0 + u1*math.Max(0, windMS)
	if !(u > 0) {
		return math.NaN()
	}
	return airC + math.Max(0, poa)/u
}

// noctDefaultC is the NOCT assumed when the caller passes 0: a common value for
// open-rack glass–polymer modules (common practice).
const noctDefaultC = 45.0

// CellTempNOCT returns the cell temperature in °C with the linear NOCT rise
// Tc = Ta + (NOCT − 20)/800 · POA, NOCT measured at 800 W/m², 20 °C air and 1 m/s wind.
// noctC = 0 selects 45 °C. Negative poa is read as 0. It ignores wind, so it suits
// monthly energy estimates better than hourly temperatures.
func CellTempNOCT(poa, airC, noctC float64) float64 {
	if noctC == 0 {
		noctC = noctDefaultC
	}
	return airC + (noctC-20)/800*math.Max(0, poa)
}

// Mounting says how modules are fixed, which sets how well their backs shed heat. The zero
// value is Rails, the usual way on a pitched roof.
type Mounting int

// Mountings, each with the cell-temperature coefficients of King, Boyson & Kratochvil (2004),
// "Photovoltaic array performance model", Sandia report SAND2004-3535, Table 1 (values as
// the table prints them; read from a secondary copy of the table).
const (
	// Rails: modules on rails a few centimetres over a pitched roof. Table 1's "close roof
	// mount" row (glass/cell/glass module, little air behind it): a −2.98, b −0.0471, ΔT 1 K.
	// The table has this mounting for glass–glass modules only; a glass–polymer module on
	// rails runs within a few kelvin of it (from memory).
	Rails Mounting = iota
	// OpenRack: free air behind the module (frames on a flat roof or on the ground). Table 1's
	// "open rack" row for a glass/cell/polymer-sheet module: a −3.56, b −0.0750, ΔT 3 K.
	OpenRack
	// Flush: built into the roof, the back closed and unventilated. Table 1's "insulated back"
	// row for a glass/cell/polymer-sheet module: a −2.81, b −0.0455, ΔT 0 K.
	Flush
)

// SAPMTemp holds the coefficients of the King et al. (2004) cell-temperature model:
// a and b of the back-surface temperature (b per m/s) and ΔT, the rise from back to cell at
// 1000 W/m², in K.
type SAPMTemp struct {
	A, B, DeltaTK float64
}

var mountings = [...]struct {
	name string
	c    SAPMTemp
}{
	Rails:    {"rails", SAPMTemp{A: -2.98, B: -0.0471, DeltaTK: 1}},
	OpenRack: {"open-rack", SAPMTemp{A: -3.56, B: -0.0750, DeltaTK: 3}},
	Flush:    {"flush", SAPMTemp{A: -2.81, B: -0.0455, DeltaTK: 0}},
}

// ErrUnknownMounting is returned by ParseMounting for a name it does not know.
var ErrUnknownMounting = errors.New("irradiance: unknown mounting")

// MountingNames lists the names ParseMounting accepts, the default first.
func MountingNames() []string {
	out := make([]string, len(mountings))
	for i, m := range mountings {
		out[i] = m.name
	}
	return out
}

// ParseMounting returns the mounting named "rails", "open-rack" or "flush". The empty
// string gives the default, Rails.
func ParseMounting(s string) (Mounting, error) {
	if s == "" {
		return Rails, nil
	}
	for i, m := range mountings {
		if m.name == s {
			return Mounting(i), nil
		}
	}
	return Rails, fmt.Errorf("%w %q (want rails, open-rack or flush)", ErrUnknownMounting, s)
}

// String returns the name ParseMounting accepts, or "Mounting(n)" for an invalid value.
func (m Mounting) String() string {
	if m >= 0 && int(m) < len(mountings) {
		return mountings[m].name
	}
	return fmt.Sprintf("Mounting(%d)", int(m))
}

// Coefficients returns the mounting's King et al. (2004) coefficients; an invalid value
// gives those of Rails.
func (m Mounting) Coefficients() SAPMTemp {
	if m >= 0 && int(m) < len(mountings) {
		return mountings[m].c
	}
	return mountings[Rails].c
}

// CellTemp returns the cell temperature in °C of a module so mounted, for plane-of-array
// irradiance poa (W/m²), air temperature airC (°C) and wind speed windMS (m/s, as weather
// files give it, about 10 m above ground), with CellTempSAPM.
func (m Mounting) CellTemp(poa, airC, windMS float64) float64 {
	return CellTempSAPM(poa, airC, windMS, m.Coefficients())
}

// HotCellC returns the hottest cell temperature the string-voltage checks assume: the cell
// in full sun (1000 W/m²) at the hottest expected air temperature highAirC, with a light
// wind of 1 m/s, by the same model the yield uses (common practice for these checks: full
// sun, hottest air, little wind).
func (m Mounting) HotCellC(highAirC float64) float64 {
	return m.CellTemp(1000, highAirC, 1)
}

// CellTempSAPM returns the cell temperature in °C after King et al. (2004), eq. 11 and 12:
// the back of the module at Tm = E·exp(a + b·WS) + Ta, the cell ΔT·E/1000 above it.
// Negative poa and wind are read as 0. The model was fitted on measured arrays in New
// Mexico; the report gives its accuracy as about ±5 °C (from memory).
func CellTempSAPM(poa, airC, windMS float64, c SAPMTemp) float64 {
	e := math.Max(0, poa)
	ws := math.Max(0, windMS)
	return airC + e*math.Exp(c.A+c.B*ws) + c.DeltaTK*e/1000
}
