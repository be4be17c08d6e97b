package electric

import "math"

// lambertWExp returns W(e^L), the principal branch of the Lambert W function
// at x = e^L, for any real L. Working with L instead of x keeps the explicit
// single-diode solutions finite when the exponent would overflow a float64
// (Jain & Kapoor 2004 point out that the argument is often astronomically
// large for modules with a high shunt resistance).
//
// It solves w + ln w = L with Fritsch's iteration (Fritsch, Shafer & Crowley
// 1973, Commun. ACM 16:123), which converges to full double precision in one
// or two steps from the starting guesses below; the loop is bounded and stops
// as soon as the relative step is below 1e-15.
func lambertWExp(L float64) float64 {
	var w float64
	switch {
	case L < -40:
		// W(x) = x - x² + ... and x < 5e-18: the first term is exact in float64.
		return math.Exp(L)
	case L < 1.5:
		// Winitzki's approximation for moderate x (relative error < 1e-2).
		x := math.Exp(L)
		lx := math.Log1p(x)
		w = lx * (1 - math.Log1p(lx)/(2+lx))
	default:
		// Asymptotic expansion for large x.
		ll := math.Log(L)
		w = L - ll + ll/L
	}
	for range 6 {
		z := L - math.Log(w) - w
		q := 2 * (1 + w) * (1 + w + 2*z/3)
		eps := z / (1 + w) * (q - z) / (q - 2*z)
		w *= 1 + eps
		if math.Abs(eps) < 1e-15 {
			break
		}
	}
	return w
}
