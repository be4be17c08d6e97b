package electric

import "math"

// Physical constants (CODATA 2018, exact SI values).
const (
	boltzmannJPerK   = 1.380649e-23
	chargeC          = 1.602176634e-19
	boltzmannEVPerK  = boltzmannJPerK / chargeC
	kelvinOffset     = 273.15
	stcIrrWPerM2     = 1000.0
	stcTempC         = 25.0
	bandGapRefEV     = 1.121     // crystalline silicon, De Soto et al. (2006)
	bandGapTempCoeff = 0.0002677 // 1/K, De Soto et al. (2006)
)

// Params are the five single-diode parameters of a module (or of one cell)
// at one irradiance and temperature: light current IL (A), diode saturation
// current I0 (A), series resistance Rs (Ω), shunt resistance Rsh (Ω) and the
// modified ideality factor A = n·Ns·k·T/q (V). The zero value is a dark,
// open device and has no curve; Fit fills it from a datasheet.
type Params struct{ IL, I0, Rs, Rsh, A float64 }

// VoltageAt returns the voltage (V) at current iA (A), from the explicit
// Lambert-W solution of the single-diode equation (Jain & Kapoor 2004). It is
// valid for any current: above IL the device is driven into reverse bias
// through its shunt resistance (no avalanche breakdown term; see doc.go).
func (p Params) VoltageAt(iA float64) float64 {
	d := p.IL + p.I0 - iA
	L := math.Log(p.I0*p.Rsh/p.A) + d*p.Rsh/p.A
	return d*p.Rsh - iA*p.Rs - p.A*lambertWExp(L)
}

// CurrentAt returns the current (A) at voltage vV (V), from the explicit
// Lambert-W solution of Jain & Kapoor (2004).
func (p Params) CurrentAt(vV float64) float64 {
	if p.Rs <= 0 {
		return p.IL - p.I0*math.Expm1(vV/p.A) - vV/p.Rsh
	}
	s := p.Rs + p.Rsh
	L := math.Log(p.Rs*p.Rsh*p.I0/(p.A*s)) + p.Rsh*(p.Rs*p.IL+p.Rs*p.I0+vV)/(p.A*s)
	return (p.Rsh*(p.IL+p.I0)-vV)/s - p.A/p.Rs*lambertWExp(L)
}

// Voc returns the open-circuit voltage (V).
func (p Params) Voc() float64 { return p.VoltageAt(0) }

// Isc returns the short-circuit current (A).
func (p Params) Isc() float64 { return p.CurrentAt(0) }

// MaxPower returns the maximum power point (W, V, A) of the device. P(I) is
// unimodal on [0, Isc] for the single-diode model, so a golden-section search
// bracketed by the curve's own ends converges; it stops at a relative width of
// 1e-10 (at most 60 steps), never after a fixed unchecked count.
func (p Params) MaxPower() (pW, vV, iA float64) {
	if p.IL <= 0 {
		return 0, 0, 0
	}
	lo, hi := 0.0, p.Isc()
	if hi <= 0 {
		return 0, 0, 0
	}
	f := func(i float64) float64 { return i * p.VoltageAt(i) }
	const g = 0.6180339887498949
	x1 := hi - g*(hi-lo)
	x2 := lo + g*(hi-lo)
	f1, f2 := f(x1), f(x2)
	for n := 0; n < 60 && hi-lo > 1e-10*hi; n++ {
		if f1 < f2 {
			lo, x1, f1 = x1, x2, f2
			x2 = lo + g*(hi-lo)
			f2 = f(x2)
		} else {
			hi, x2, f2 = x2, x1, f1
			x1 = hi - g*(hi-lo)
			f1 = f(x1)
		}
	}
	iA = 0.5 * (lo + hi)
	vV = p.VoltageAt(iA)
	return iA * vV, vV, iA
}

// translate moves reference parameters (at 1000 W/m², 25 °C) to irradiance
// sWPerM2 and cell temperature tempC with the equations of De Soto, Klein &
// Beckman (2006): IL scales with irradiance and αIsc, I0 with T³ and the band
// gap, A with T, Rsh inversely with irradiance, Rs constant. alphaAPerK is the
// short-circuit current's temperature coefficient in A/K for this device.
// Irradiance below 1 W/m² keeps the shunt resistance of 1 W/m² so that a dark
// cell stays a finite (large) resistor.
func translate(ref Params, alphaAPerK, sWPerM2, tempC float64) Params {
	tRef := stcTempC + kelvinOffset
	tc := tempC + kelvinOffset
	s := math.Max(sWPerM2, 0)
	egT := bandGapRefEV * (1 - bandGapTempCoeff*(tc-tRef))
	p := Params{
		IL:  lightCurrent(ref.IL, alphaAPerK, s, tempC),
		I0:  ref.I0 * math.Pow(tc/tRef, 3) * math.Exp((bandGapRefEV/tRef-egT/tc)/boltzmannEVPerK),
		Rs:  ref.Rs,
		Rsh: ref.Rsh * stcIrrWPerM2 / math.Max(s, 1),
		A:   ref.A * tc / tRef,
	}
	return p
}

// lightCurrent is translate's IL alone (no exponentials): the light current
// at irradiance sWPerM2 and tempC for reference light current ilRef.
func lightCurrent(ilRef, alphaAPerK, sWPerM2, tempC float64) float64 {
	tRef := stcTempC + kelvinOffset
	tc := tempC + kelvinOffset
	s := math.Max(sWPerM2, 0)
	il := s / stcIrrWPerM2 * (ilRef + alphaAPerK*(tc-tRef))
	if il < 0 {
		return 0
	}
	return il
}
