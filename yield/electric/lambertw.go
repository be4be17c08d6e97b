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
	return fritsch(L, w, 1e-15)
}

// fritsch refines a guess w of W(e^L) with the iteration of Fritsch, Shafer
// & Crowley (1973) until the relative step is below tol (at most 6 steps).
func fritsch(L, w, tol float64) float64 {
	for range 6 {
		z := L - math.Log(w) - w
		q := 2 * (1 + w) * (1 + w + 2*z/3)
		eps := z / (1 + w) * (q - z) / (q - 2*z)
		w *= 1 + eps
		if math.Abs(eps) < tol {
			break
		}
	}
	return w
}

// warmTol is the relative step below which lambertWExpNear stops. The
// iteration converges with the fourth power of the error: a step ε leaves an
// error below 2ε⁴ (measured from L = −5 to 1e5 in TestFritschOrder), so a
// step below 1e-4 leaves less than 2e-16, float64's own rounding.
const warmTol = 1e-4

// lambertWExpNear returns W(e^L) like lambertWExp, starting from a nearby
// solution wp = W(e^Lp). Along a curve's current grid L moves in steps, and
// the Taylor guess w = wp·(1 + g2), g2 = g + g·g/(2(1+wp)), g = (L−Lp)/(1+wp)
// (dW/dL = W/(1+W), d²W/dL² = W/(1+W)³) has a relative error of about
// |g|³/(3(1+wp)): small even for large g when W is large, as it is in
// forward bias. Its logarithm needs no math.Log for small g: ln wp = Lp − wp
// by definition, so ln w = Lp − wp + log1p(g2), a short series. One step of
// the iteration then usually meets warmTol; otherwise it continues to
// lambertWExp's own criterion. Where the guess would be worse than
// lambertWExp's (about 1 %), or W falls by more than a factor 3, it starts
// from lambertWExp's guesses instead.
func lambertWExpNear(L, Lp, wp float64) float64 {
	if L < -40 {
		return math.Exp(L)
	}
	r := 1 / (1 + wp)
	g := (L - Lp) * r
	g2 := g + 0.5*g*g*r
	if !(wp > 0) || !(g2 > -0.7) || !(g*g*math.Abs(g)*r < 0.03) {
		return lambertWExp(L)
	}
	w := wp * (1 + g2)
	var l1 float64
	if g2 <= 0.11 && g2 >= -0.11 {
		l1 = log1pSmall(g2)
	} else {
		l1 = math.Log1p(g2)
	}
	// The step of fritsch, with its two divisions merged into one.
	z := L - (Lp - wp + l1) - w
	q := 2 * (1 + w) * (1 + w + 2*z/3)
	eps := z * (q - z) / ((1 + w) * (q - 2*z))
	w *= 1 + eps
	if eps < warmTol && eps > -warmTol {
		return w
	}
	return fritsch(L, w, 1e-15)
}

// log1pSmall returns ln(1+x) for |x| ≤ 0.11 from 2·atanh(y), y = x/(2+x)
// ≤ 0.053, through the y¹³ term: the first term left out, 2y¹⁵/15, is below
// 1e-20.
func log1pSmall(x float64) float64 {
	y := x / (2 + x)
	y2 := y * y
	return 2 * y * (1 + y2*(1.0/3+y2*(1.0/5+y2*(1.0/7+y2*(1.0/9+y2*(1.0/11+y2*(1.0/13)))))))
}
