package electric

import "math"

// cellGrid evaluates one cell's voltage on a current grid i0 + k·h in
// increasing k, on demand: a substring whose bypass diode already conducts
// needs no further points of its cells. Each point warm-starts the Lambert-W
// iteration from the previous one (lambertWExpNear) and reuses log(I0·Rsh/A),
// so a point costs about one logarithm instead of four for VoltageAt.
type cellGrid struct {
	p      Params
	c0, rA float64 // log(I0·Rsh/A) and Rsh/A: L = c0 + (IL+I0−I)·rA
	i0, h  float64
	n      int       // points computed so far
	L, w   float64   // at point n−1
	v      []float64 // voltages of points 0..n−1
}

// reset starts the grid for parameters p; buf (reused) must hold every
// point that will be asked for.
func (g *cellGrid) reset(p Params, i0, h float64, buf []float64) {
	*g = cellGrid{p: p, c0: math.Log(p.I0 * p.Rsh / p.A), rA: p.Rsh / p.A, i0: i0, h: h, v: buf}
}

// at returns the voltage at point k, computing the points up to k.
func (g *cellGrid) at(k int) float64 {
	for g.n <= k {
		i := g.i0 + float64(g.n)*g.h
		d := g.p.IL + g.p.I0 - i
		L := g.c0 + d*g.rA
		var w float64
		if g.n == 0 {
			w = lambertWExp(L)
		} else {
			w = lambertWExpNear(L, g.L, g.w)
		}
		g.L, g.w = L, w
		g.v[g.n] = d*g.p.Rsh - i*g.p.Rs - g.p.A*w
		g.n++
	}
	return g.v[k]
}
