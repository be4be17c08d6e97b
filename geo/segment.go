package geo

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// Plane geometry on orb points in local metres, shared by validation and module fill.

// cross2 returns the z component of (b−a)×(c−a): positive when c lies left of a→b.
func cross2(a, b, c orb.Point) float64 {
	return (b[0]-a[0])*(c[1]-a[1]) - (b[1]-a[1])*(c[0]-a[0])
}

// collinearTol is the area (m²) below which three points count as collinear: a tenth of a
// square millimetre, far below drawing accuracy but above the rounding of a projection.
const collinearTol = 1e-7

// segmentsCross reports whether segments ab and cd cross at a point inside both; touching at an
// end or running along each other does not count.
func segmentsCross(a, b, c, d orb.Point) bool {
	d1, d2 := cross2(a, b, c), cross2(a, b, d)
	d3, d4 := cross2(c, d, a), cross2(c, d, b)
	return ((d1 > collinearTol && d2 < -collinearTol) || (d1 < -collinearTol && d2 > collinearTol)) &&
		((d3 > collinearTol && d4 < -collinearTol) || (d3 < -collinearTol && d4 > collinearTol))
}

// segmentsTouch reports whether segments ab and cd share any point, ends included.
func segmentsTouch(a, b, c, d orb.Point) bool {
	if segmentsCross(a, b, c, d) {
		return true
	}
	const eps = 1e-6 // metres: a micrometre counts as touching
	return pointSegDist(c, a, b) < eps || pointSegDist(d, a, b) < eps ||
		pointSegDist(a, c, d) < eps || pointSegDist(b, c, d) < eps
}

// pointSegDist returns the distance from p to segment ab.
func pointSegDist(p, a, b orb.Point) float64 {
	dx, dy := b[0]-a[0], b[1]-a[1]
	l2 := dx*dx + dy*dy
	t := 0.0
	if l2 > 0 {
		t = ((p[0]-a[0])*dx + (p[1]-a[1])*dy) / l2
		t = math.Max(0, math.Min(1, t))
	}
	return math.Hypot(p[0]-a[0]-t*dx, p[1]-a[1]-t*dy)
}

// segSegDist returns the shortest distance between segments ab and cd.
func segSegDist(a, b, c, d orb.Point) float64 {
	if segmentsCross(a, b, c, d) {
		return 0
	}
	return math.Min(math.Min(pointSegDist(a, c, d), pointSegDist(b, c, d)),
		math.Min(pointSegDist(c, a, b), pointSegDist(d, a, b)))
}

// ringBoundaryDist returns the distance from p to the nearest edge of the closed ring r.
func ringBoundaryDist(r orb.Ring, p orb.Point) float64 {
	best := math.Inf(1)
	for i := 0; i+1 < len(r); i++ {
		best = math.Min(best, pointSegDist(p, r[i], r[i+1]))
	}
	return best
}

// selfCrossing returns the indices of two edges of the closed ring r that meet although they
// are not neighbours (or neighbours that fold back on each other), or −1, −1.
func selfCrossing(r orb.Ring) (int, int) {
	n := len(r) - 1 // edges
	for i := range n {
		// a spike: the next edge runs back along this one
		j := (i + 1) % n
		a, b, c := r[i], r[i+1], r[j+1]
		if math.Abs(cross2(a, b, c)) <= collinearTol &&
			(b[0]-a[0])*(c[0]-b[0])+(b[1]-a[1])*(c[1]-b[1]) < 0 {
			return i, j
		}
		for k := i + 2; k < n; k++ {
			if i == 0 && k == n-1 {
				continue // neighbours across the closing vertex
			}
			if segmentsTouch(r[i], r[i+1], r[k], r[k+1]) {
				return i, k
			}
		}
	}
	return -1, -1
}

// ringsOverlap reports whether two closed rings cover a common area: edges that cross, or a
// vertex or the centre of one well inside the other. Rings that only share edges or vertices
// (neighbouring roof faces along a ridge or a valley) do not overlap.
func ringsOverlap(a, b orb.Ring, tol float64) bool {
	ba, bb := a.Bound(), b.Bound()
	if ba.Max[0] < bb.Min[0]-tol || bb.Max[0] < ba.Min[0]-tol || ba.Max[1] < bb.Min[1]-tol || bb.Max[1] < ba.Min[1]-tol {
		return false
	}
	for i := 0; i+1 < len(a); i++ {
		for j := 0; j+1 < len(b); j++ {
			if segmentsCross(a[i], a[i+1], b[j], b[j+1]) {
				return true
			}
		}
	}
	inside := func(p orb.Point, r orb.Ring) bool {
		return planar.RingContains(r, p) && ringBoundaryDist(r, p) > tol
	}
	for _, p := range a {
		if inside(p, b) {
			return true
		}
	}
	for _, p := range b {
		if inside(p, a) {
			return true
		}
	}
	return inside(interiorPoint(a), b) || inside(interiorPoint(b), a)
}

// interiorPoint returns a point inside the closed ring r: its area centroid when that lies
// inside, else the midpoint of the widest span of a horizontal line through the centroid.
func interiorPoint(r orb.Ring) orb.Point {
	c, _ := planar.CentroidArea(r)
	if planar.RingContains(r, c) {
		return c
	}
	var xs []float64
	for i := 0; i+1 < len(r); i++ {
		a, b := r[i], r[i+1]
		if (a[1] > c[1]) != (b[1] > c[1]) {
			xs = append(xs, a[0]+(c[1]-a[1])*(b[0]-a[0])/(b[1]-a[1]))
		}
	}
	slices.Sort(xs)
	best, at := -1.0, c
	for i := 0; i+1 < len(xs); i += 2 {
		if w := xs[i+1] - xs[i]; w > best {
			best, at = w, orb.Point{(xs[i] + xs[i+1]) / 2, c[1]}
		}
	}
	return at
}
