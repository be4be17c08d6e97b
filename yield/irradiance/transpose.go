package irradiance

import (
	"errors"
	"fmt"
	"math"
)

// SkyModel selects how sky diffuse light is distributed over the sky dome.
// The zero value is Perez, the default.
type SkyModel int

const (
	// Perez is the anisotropic sky of Perez et al. (1990): isotropic background,
	// circumsolar disc and horizon band, with coefficients binned by sky clearness.
	Perez SkyModel = iota
	// HayDavies splits the diffuse into isotropic and circumsolar parts by the
	// anisotropy index DNI/I0 (Hay & Davies 1980).
	HayDavies
	// Isotropic spreads the diffuse evenly over the dome (Liu & Jordan 1963).
	Isotropic
)

// ErrUnknownSkyModel is returned by ParseSkyModel for a name it does not know.
var ErrUnknownSkyModel = errors.New("irradiance: unknown sky model")

var skyModelNames = [...]string{Perez: "perez", HayDavies: "hay-davies", Isotropic: "isotropic"}

// String returns the name ParseSkyModel accepts, or "SkyModel(n)" for an invalid value.
func (m SkyModel) String() string {
	if m >= 0 && int(m) < len(skyModelNames) {
		return skyModelNames[m]
	}
	return fmt.Sprintf("SkyModel(%d)", int(m))
}

// ParseSkyModel returns the model named "perez", "hay-davies" or "isotropic".
// The empty string gives the default, Perez, so an unset config key means the default.
func ParseSkyModel(s string) (SkyModel, error) {
	if s == "" {
		return Perez, nil
	}
	for i, n := range skyModelNames {
		if n == s {
			return SkyModel(i), nil
		}
	}
	return Perez, fmt.Errorf("%w %q (want perez, hay-davies or isotropic)", ErrUnknownSkyModel, s)
}

// Sky is the state of the sky for one time step, in W/m² and degrees.
// The zero value is a dark sky.
type Sky struct {
	DNI       float64 // direct normal irradiance
	DHI       float64 // diffuse horizontal irradiance
	GHI       float64 // global horizontal irradiance, for the ground-reflected part
	ZenithDeg float64 // solar zenith angle
	DNIExtra  float64 // extraterrestrial normal irradiance (ExtraterrestrialNormal); 0 means SolarConstant
	Albedo    float64 // ground reflectance, 0..1
}

// Components is the irradiance reaching a tilted plane, in W/m², split by where it comes
// from, before shading and incidence-angle losses. The split matters to the shading
// engine: Beam and Circumsolar come from the sun's direction and are blocked with it;
// Horizon comes from a band just above the horizon and is blocked by a raised horizon;
// Isotropic is reduced by the plane's sky-view factor; Ground by obstacles below the
// horizon.
//
// Every component is finite and Beam, Isotropic, Circumsolar and Ground are never negative.
// Horizon keeps its sign: the Perez horizon coefficient F2 is negative for overcast bins,
// where the band near the horizon is darker than the dome; it never darkens more than the
// isotropic background, so Isotropic + Horizon ≥ 0 and the sky diffuse as a whole is never
// below Circumsolar. A shading engine that scales each part by its own view factor can
// still combine them into a negative value where a cell sees more of the horizon band than
// of the dome: OnPlane clamps that. Total adds all five.
type Components struct {
	Beam        float64
	Isotropic   float64
	Circumsolar float64
	Horizon     float64
	Ground      float64
}

// Total returns the plane-of-array irradiance, the sum of all components, in W/m².
func (c Components) Total() float64 {
	return c.Beam + c.Isotropic + c.Circumsolar + c.Horizon + c.Ground
}

// SkyDiffuse returns the diffuse light from the sky dome: Isotropic + Circumsolar + Horizon.
func (c Components) SkyDiffuse() float64 {
	return c.Isotropic + c.Circumsolar + c.Horizon
}

const deg = math.Pi / 180

// perezCoeffs holds F11, F12, F13, F21, F22, F23 for the eight clearness bins, from the
// higher-precision table the authors of Perez et al. (1990) distributed (the paper
// prints three decimals). Bin 4 F23 is negative and bin 7 F22 is −1.1272340; copies with
// the opposite sign or −1.27234 are typos.
var perezCoeffs = [8][6]float64{
	{-0.0083117, 0.5877285, -0.0620636, -0.0596012, 0.0721249, -0.0220216},
	{0.1299457, 0.6825954, -0.1513752, -0.0189325, 0.0659650, -0.0288748},
	{0.3296958, 0.4868735, -0.2210958, 0.0554140, -0.0639588, -0.0260542},
	{0.5682053, 0.1874525, -0.2951290, 0.1088631, -0.1519229, -0.0139754},
	{0.8730280, -0.3920403, -0.3616149, 0.2255647, -0.4620442, 0.0012448},
	{1.1326077, -1.2367284, -0.4118494, 0.2877813, -0.8230357, 0.0558651},
	{1.0601591, -1.5999137, -0.3589221, 0.2642124, -1.1272340, 0.1310694},
	{0.6777470, -0.3272588, -0.2504286, 0.1561313, -1.3765031, 0.2506212},
}

// perezEpsilonEdges are the upper bounds of clearness bins 1..7; bin 8 is open above.
var perezEpsilonEdges = [7]float64{1.065, 1.230, 1.500, 1.950, 2.800, 4.500, 6.200}

// perezKappa is κ in the clearness ε, for the zenith angle in radians.
const perezKappa = 1.041

// perezBin returns the 0-based clearness bin of ε.
func perezBin(eps float64) int {
	for i, e := range perezEpsilonEdges {
		if eps < e {
			return i
		}
	}
	return len(perezEpsilonEdges)
}

// perezF returns the circumsolar and horizon brightening coefficients F1 and F2.
func perezF(s Sky, zenithRad, i0 float64) (f1, f2 float64) {
	z3 := perezKappa * zenithRad * zenithRad * zenithRad
	eps := ((s.DHI+math.Max(0, s.DNI))/s.DHI + z3) / (1 + z3)
	delta := s.DHI * AirMass(zenithRad/deg) / i0
	c := &perezCoeffs[perezBin(eps)]
	// F1 ≥ 0 as Perez et al. (1990) state it. F1 ≤ 1 is our bound: the circumsolar disc
	// cannot hold more than the whole diffuse, and above 1 the isotropic background
	// DHI·(1 − F1) turns negative. The fit exceeds 1 only far outside its data, at the
	// sun's last degrees above the horizon, where the air mass makes Δ large (GHI 67,
	// DNI 45, DHI 65 W/m² at 89.5° zenith gives Δ ≈ 1.8 and F1 ≈ 1.1 in bin 2).
	f1 = math.Min(1, math.Max(0, c[0]+c[1]*delta+c[2]*zenithRad))
	f2 = c[3] + c[4]*delta + c[5]*zenithRad
	return f1, f2
}

// Transpose returns the irradiance components on a plane tilted tiltDeg from horizontal,
// whose normal makes incidenceDeg with the sun's direction, under sky s with model m.
//
// Beam is DNI·max(0, cos θ). Ground is GHI·albedo·(1 − cos β)/2 for every model. The sky
// diffuse follows m:
//   - Isotropic: DHI·(1 + cos β)/2, all in Isotropic.
//   - HayDavies: Ai = DNI/I0; Isotropic DHI·(1 − Ai)(1 + cos β)/2, Circumsolar DHI·Ai·Rb
//     with Rb = max(0, cos θ)/max(cos 85°, cos Z).
//   - Perez: Isotropic DHI·(1 − F1)(1 + cos β)/2, Circumsolar DHI·F1·a/b with
//     a = max(0, cos θ), b = max(cos 85°, cos Z) (the bound on a/b of Perez et al. 1990),
//     Horizon DHI·F2·sin β. F1 lies in [0, 1] (see perezF) and Horizon is raised to
//     −Isotropic where F2 is so negative that the band would be darker than black.
//
// With the sun at or below the horizon (zenith ≥ 90°) Beam and Circumsolar are 0 and the
// whole diffuse is treated as isotropic background (Perez with F1 = 0 and F2 from the
// horizon-clamped zenith). Negative DNI, DHI or GHI are read as 0; an unknown model is
// treated as Perez; albedo is clamped to [0, 1]. The result never contains NaN for
// finite inputs, and no component but Horizon is ever negative.
func Transpose(m SkyModel, s Sky, incidenceDeg, tiltDeg float64) Components {
	s.DNI = math.Max(0, s.DNI)
	s.DHI = math.Max(0, s.DHI)
	s.GHI = math.Max(0, s.GHI)
	albedo := math.Min(1, math.Max(0, s.Albedo))
	i0 := s.DNIExtra
	if !(i0 > 0) {
		i0 = SolarConstant
	}
	cosTilt := math.Cos(tiltDeg * deg)
	sinTilt := math.Sin(tiltDeg * deg)
	sunUp := math.Abs(s.ZenithDeg) < 90
	a := math.Max(0, math.Cos(incidenceDeg*deg))
	if !sunUp {
		a = 0
	}
	b := math.Max(lowSunCos, math.Cos(s.ZenithDeg*deg))

	var c Components
	c.Beam = s.DNI * a
	c.Ground = s.GHI * albedo * (1 - cosTilt) / 2
	viewSky := (1 + cosTilt) / 2
	if s.DHI == 0 {
		return c
	}
	switch m {
	case Isotropic:
		c.Isotropic = s.DHI * viewSky
	case HayDavies:
		ai := 0.0
		if sunUp {
			ai = math.Min(1, s.DNI/i0)
		}
		c.Isotropic = s.DHI * (1 - ai) * viewSky
		c.Circumsolar = s.DHI * ai * a / b
	default:
		zr := math.Min(math.Abs(s.ZenithDeg), 90) * deg
		f1, f2 := perezF(s, zr, i0)
		if !sunUp {
			f1 = 0
		}
		c.Isotropic = s.DHI * (1 - f1) * viewSky
		c.Circumsolar = s.DHI * f1 * a / b
		c.Horizon = math.Max(s.DHI*f2*sinTilt, -c.Isotropic)
	}
	return c
}

// View is how much of each light source a point on a plane sees, as fractions of what an
// unobstructed plane of the same tilt sees (1 = nothing in the way), together with the
// incidence-angle modifiers for each source. The zero value sees nothing.
type View struct {
	Sky, Horizon, Ground float64 // view factors of the dome, the horizon band and the ground
	// IAMBeam applies to Beam and Circumsolar, IAMSky to Isotropic and Horizon, IAMGround to
	// Ground.
	IAMBeam, IAMSky, IAMGround float64
}

// OnPlane returns the irradiance (W/m²) that reaches a point seeing v, split into the part
// that comes from the sun's direction (Beam and Circumsolar, to be scaled by the point's
// sunlit fraction) and the diffuse rest. Both are never negative and finite for finite
// input: a negative Horizon darkens the dome light the point sees but never below zero,
// even where the point sees more of the horizon band than of the dome. Negative view
// factors and modifiers are read as 0.
func (c Components) OnPlane(v View) (direct, diffuse float64) {
	pos := nonNeg
	direct = pos(c.Beam+c.Circumsolar) * pos(v.IAMBeam)
	sky := pos(c.Isotropic*pos(v.Sky)+c.Horizon*pos(v.Horizon)) * pos(v.IAMSky)
	diffuse = sky + pos(c.Ground)*pos(v.Ground)*pos(v.IAMGround)
	return direct, diffuse
}

// nonNeg is math.Max(0, x) (NaN stays NaN, −0 becomes 0) without the call: OnPlane runs for
// every module at every step.
func nonNeg(x float64) float64 {
	if x > 0 {
		return x
	}
	if x <= 0 {
		return 0
	}
	return x // NaN
}
