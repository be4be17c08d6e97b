package electric

import "math"

// cellGrid evaluates one cell's voltage on an increasing current grid cur[k]
// in increasing k, on demand: a substring whose bypass diode already conducts
// needs no further points of its cells.
//
// The points form two interleaved chains (even and odd k), each point
// starting from the point two before it, so that the processor works on two
// independent dependency chains at once. In forward bias a point takes one
// step of Halley's iteration on u = ln W (warmStep), which needs no
// logarithm and one division; elsewhere (near the knee, in reverse bias, at
// the start) it falls back to lambertWExpNear from the previous point or to
// lambertWExp.
type cellGrid struct {
	p      Params
	c0, rA float64   // log(I0·Rsh/A) and Rsh/A: L = c0 + (IL+I0−I)·rA
	cur    []float64 // cell current of each point (A)
	n      int       // points computed so far
	v      []float64 // voltages of points 0..n−1
	// Per chain (k mod 2), at its last point: L, W(e^L), u = ln W and
	// r ≈ 1/(1+W).
	cL, cw, cu, cr [2]float64
}

// reset starts the grid for parameters p; buf (reused) must hold every
// point that will be asked for.
func (g *cellGrid) reset(p Params, cur []float64, buf []float64) {
	*g = cellGrid{p: p, c0: math.Log(p.I0 * p.Rsh / p.A), rA: p.Rsh / p.A, cur: cur, v: buf}
}

// at returns the voltage at point k, computing the points up to k (and,
// room permitting, k+1, so that both chains advance together).
func (g *cellGrid) at(k int) float64 {
	if g.n <= k {
		g.fill(min(k+1, len(g.v)-1))
	}
	return g.v[k]
}

// fill computes points g.n..k.
func (g *cellGrid) fill(k int) {
	p := g.p
	for n := g.n; n <= k; n++ {
		i := g.cur[n]
		d := p.IL + p.I0 - i
		L := g.c0 + d*g.rA
		j := n & 1
		if n >= 2 {
			if w, u, r, ok := warmStep(L, g.cL[j], g.cw[j], g.cu[j], g.cr[j]); ok {
				g.cL[j], g.cw[j], g.cu[j], g.cr[j] = L, w, u, r
				g.v[n] = p.A*(u-g.c0) - i*p.Rs
				continue
			}
		}
		var w float64
		if n == 0 {
			w = lambertWExp(L)
		} else {
			w = lambertWExpNear(L, g.cL[1-j], g.cw[1-j])
		}
		g.cL[j], g.cw[j], g.cu[j], g.cr[j] = L, w, L-w, 1/(1+w)
		g.v[n] = d*p.Rsh - i*p.Rs - p.A*w
	}
	g.n = k + 1
}

// warmStepTol bounds the Halley correction warmStep accepts. Halley's
// iteration is of third order; for f(u) = u + e^u − L its error constant
// |(f”/(2f'))² − f”'/(6f')| is below 1/4 (f' = 1+W, f” = f”' = W), so a
// correction below 1e-5 leaves less than 2.5e-16 in u = ln W and, relative,
// in W (TestWarmStep checks against lambertWExp). A bound of 1e-4 left 1e-13
// relative in W, which a later fallback point turns into an absolute error
// W·1e-13 of ln W = L − W (1e-12 V a cell).
const warmStepTol = 1e-5

// warmStep returns W(e^L), its logarithm u and r ≈ 1/(1+W) from a solution
// (Lp, wp, up = ln wp, rp ≈ 1/(1+wp)) nearby, and reports whether it
// succeeded. It extrapolates u along L with its Taylor series to fourth
// order (u' = 1/(1+W), u” = −W/(1+W)³, u”' = W(2W−1)/(1+W)⁵,
// u”” = W(−6W²+8W−1)/(1+W)⁷), takes
// W = wp·e^δ with e^δ from its series (|δ| ≤ 1/8), and corrects with one
// Halley step on f(u) = u + e^u − L whose one division also gives the next
// r. It fails, leaving the work to lambertWExpNear, where the extrapolation
// is too far (the knee of the curve, reverse bias) or the correction exceeds
// warmStepTol. u is returned from the iteration itself, not as L − W, so a
// voltage A·(u − ln(I0·Rsh/A)) − I·Rs carries no cancellation.
func warmStep(L, Lp, wp, up, rp float64) (w, u, r float64, ok bool) {
	t := (L - Lp) * rp
	a := wp * rp
	delta := t * (1 - t*(0.5*a-t*a*((2*a-rp)*(1.0/6)+t*(-6*a*a+8*a*rp-rp*rp)*(1.0/24))))
	if !(delta <= 0.125 && delta >= -0.125) {
		return 0, 0, 0, false
	}
	// e^δ through δ⁹/9!: the first term left out is below 0.125¹⁰/10! < 3e-16.
	e := 1 + delta*(1+delta*(1.0/2+delta*(1.0/6+delta*(1.0/24+delta*(1.0/120+delta*(1.0/720+delta*(1.0/5040+delta*(1.0/40320+delta*(1.0/362880)))))))))
	w0 := wp * e
	u0 := up + delta
	r = 1 / (1 + w0)
	f := u0 + w0 - L
	// Halley: Δ = f/f' / (1 − f·f''/(2f'²)), the last factor to first order
	// (the next term changes Δ by Δ·(f·W·r²/2)² < Δ³/4 < 3e-16).
	dl := f * r * (1 + 0.5*f*w0*r*r)
	if !(dl <= warmStepTol && dl >= -warmStepTol) {
		return 0, 0, 0, false
	}
	u = u0 - dl
	w = w0 * (1 - dl*(1-dl*(0.5-dl*(1.0/6))))
	return w, u, r, true
}
