package irradiance

import "math"

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
