package irradiance

import "math"

// SolarConstant is the extraterrestrial irradiance at mean Sun–Earth distance, W/m².
//
// 1367 W/m² is the value of Duffie & Beckman's handbook and of the data behind the
// Perez et al. (1990) fit; using it keeps the sky-model coefficients consistent with the
// brightness index they were fitted on. The present measured value is lower,
// 1360.8 ± 0.5 W/m² (Kopp & Lean 2011, Geophys. Res. Lett. 38, L01706); the 0.5 %
// difference is well inside the uncertainty of the decomposition and sky models.
const SolarConstant = 1367.0

// ExtraterrestrialNormal returns the irradiance on a plane normal to the sun's rays at the
// top of the atmosphere on day of year doy (1 = 1 January), in W/m², from Spencer's (1971)
// Fourier series for the Sun–Earth distance correction. Days outside 1..366 wrap around
// the year, so the function is defined for every int.
func ExtraterrestrialNormal(doy int) float64 {
	d := ((doy-1)%365 + 365) % 365 // 366 wraps onto 1 January: the series is 365-periodic
	b := 2 * math.Pi * float64(d) / 365
	e0 := 1.000110 + 0.034221*math.Cos(b) + 0.001280*math.Sin(b) +
		0.000719*math.Cos(2*b) + 0.000077*math.Sin(2*b)
	return SolarConstant * e0
}

// kastenYoungLimitDeg is the zenith angle where the Kasten–Young formula has its pole.
const kastenYoungLimitDeg = 96.07995

// AirMass returns the relative optical air mass for a sun at zenithDeg degrees (apparent,
// refraction-corrected), after Kasten & Young (1989). The formula is finite up to
// 96.08°, but is only fitted above the horizon: at exactly 90° it gives 37.92, and any
// zenith beyond 90° returns that horizon value, so that callers scaling twilight diffuse
// light get a large, finite number rather than a pole. Negative zenith angles are read
// as their absolute value; NaN gives NaN.
func AirMass(zenithDeg float64) float64 {
	z := math.Min(math.Abs(zenithDeg), 90)
	return 1 / (math.Cos(z*math.Pi/180) + 0.50572*math.Pow(kastenYoungLimitDeg-z, -1.6364))
}

// ErbsDiffuseFraction returns the hourly diffuse fraction DHI/GHI for the clearness index
// kt, after Erbs, Klein & Duffie (1982). Negative kt is treated as 0 (fully diffuse).
func ErbsDiffuseFraction(kt float64) float64 {
	switch {
	case !(kt > 0): // also catches NaN: no light means all of it is diffuse
		return 1
	case kt <= 0.22:
		return 1 - 0.09*kt
	case kt <= 0.80:
		return 0.9511 + kt*(-0.1604+kt*(4.388+kt*(-16.638+kt*12.336)))
	default:
		return 0.165
	}
}

// lowSunCos is cos 85°: below 5° elevation the horizontal projection cos Z is too small
// to divide by without amplifying measurement error in GHI.
var lowSunCos = math.Cos(85 * math.Pi / 180)

// Erbs splits global horizontal irradiance ghi (W/m²) into direct normal dni and diffuse
// horizontal dhi (W/m²) for a sun at zenithDeg on day doy, with the Erbs et al. (1982)
// diffuse fraction of kt = ghi/(I0 cos Z), I0 from ExtraterrestrialNormal.
//
// Low-sun guard: when the sun is at or below the horizon (zenith ≥ 90°) or ghi ≤ 0,
// dni is 0 and all of ghi (if positive) is diffuse. Above the horizon cos Z is floored at
// cos 85° both in kt and when converting the horizontal beam to normal incidence, and dni
// is capped at I0; dhi is then set to ghi − dni·cos Z, so dhi + dni·cos Z = ghi holds at
// every zenith and no energy is created or lost by the split.
func Erbs(ghi, zenithDeg float64, doy int) (dni, dhi float64) {
	if !(ghi > 0) {
		return 0, 0
	}
	cz := math.Cos(zenithDeg * math.Pi / 180)
	if !(cz > 0) || math.Abs(zenithDeg) >= 90 {
		return 0, ghi
	}
	i0 := ExtraterrestrialNormal(doy)
	czf := math.Max(cz, lowSunCos)
	kt := ghi / (i0 * czf)
	dhi = ErbsDiffuseFraction(kt) * ghi
	dni = math.Min((ghi-dhi)/czf, i0)
	dhi = ghi - dni*cz
	return dni, dhi
}
