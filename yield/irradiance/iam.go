package irradiance

import "math"

// IAMASHRAE returns the incidence-angle modifier 1 − b0·(1/cos θ − 1) of the ASHRAE form
// (Souka & Safwat 1966) for a ray at thetaDeg from the module normal; b0 ≈ 0.05 for
// glass-fronted modules. The expression crosses zero at the cutoff angle
// θc = acos(b0/(1 + b0)) (87.3° for b0 = 0.05); from there to 90° and beyond it returns
// 0. Negative angles are read as their absolute value; b0 ≤ 0 gives no loss.
func IAMASHRAE(thetaDeg, b0 float64) float64 {
	c := math.Cos(math.Abs(thetaDeg) * deg)
	if !(c > 0) || math.Abs(thetaDeg) >= 90 {
		return 0
	}
	if !(b0 > 0) {
		return 1
	}
	return math.Max(0, 1-b0*(1/c-1))
}

// IAMMartinRuiz returns the incidence-angle modifier
// (1 − exp(−cos θ/ar))/(1 − exp(−1/ar)) of Martin & Ruiz (2001) for a ray at thetaDeg
// from the module normal; ar ≈ 0.16 for clean glass. It is 1 at normal incidence and 0 at
// and beyond 90°. Negative angles are read as their absolute value; ar ≤ 0 gives no loss
// (the limit ar → 0).
func IAMMartinRuiz(thetaDeg, ar float64) float64 {
	c := math.Cos(math.Abs(thetaDeg) * deg)
	if !(c > 0) || math.Abs(thetaDeg) >= 90 {
		return 0
	}
	if !(ar > 0) {
		return 1
	}
	return -math.Expm1(-c/ar) / -math.Expm1(-1/ar)
}

// Martin & Ruiz (2001) closed-form coefficients for isotropic diffuse and albedo light.
// c1 = 4/(3π) and c2 = 0.5·ar − 0.154, from memory of the paper's eqs. for the diffuse
// and albedo angular losses.
const martinRuizC1 = 4 / (3 * math.Pi)

// DiffuseIAMMartinRuiz returns the incidence-angle modifiers of Martin & Ruiz (2001) for
// isotropic sky diffuse (sky) and isotropic ground-reflected light (ground) on a plane
// tilted tiltDeg from horizontal, for the angular-loss coefficient ar:
//
//	IAM = 1 − exp(−(c1·x + c2·x²)/ar), c1 = 4/(3π), c2 = 0.5·ar − 0.154,
//	x_sky    = sin β + (π − β − sin β)/(1 + cos β),
//	x_ground = sin β + (β − sin β)/(1 − cos β).
//
// On a horizontal plane the ground term's 0/0 takes its limit (x_ground → 0, so
// ground = 0: a horizontal plane sees no ground); at 180° the sky term does likewise.
// Tilt is clamped to [0, 180]; ar ≤ 0 gives no loss (1, 1).
func DiffuseIAMMartinRuiz(tiltDeg, ar float64) (sky, ground float64) {
	if !(ar > 0) {
		return 1, 1
	}
	b := math.Min(180, math.Max(0, tiltDeg)) * deg
	c2 := 0.5*ar - 0.154
	sb := math.Sin(b)
	iam := func(x float64) float64 {
		return -math.Expm1(-(martinRuizC1*x + c2*x*x) / ar)
	}
	// (β − sin β)/(1 − cos β) → β/3 as β → 0; below 1e-4 rad the series is exact to
	// rounding while the direct form loses all digits to cancellation.
	var gx float64
	if b < 1e-4 {
		gx = sb + b/3
	} else {
		gx = sb + (b-sb)/(1-math.Cos(b))
	}
	p := math.Pi - b // the sky term is the ground term at the supplementary tilt
	var sx float64
	if p < 1e-4 {
		sx = math.Sin(p) + p/3
	} else {
		sx = math.Sin(p) + (p-math.Sin(p))/(1-math.Cos(p))
	}
	return iam(sx), iam(gx)
}
