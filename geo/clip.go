package geo

import (
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// Boolean operations on two simple polygons in the local metric plane, for trimming a sliver
// that one roof face shares with another. Both outlines are cut at every point where their
// edges meet, each piece of edge is sorted by where it lies (inside the other outline,
// outside it, or along an edge of it, running the same way or the opposite way), the pieces
// that bound the result are kept and joined again into rings. Working on whole edge pieces
// rather than on crossings alone is what lets outlines that share an edge or a corner, the
// usual case between roof faces, come out right: those are the cases that trip the textbook
// crossing-walk methods.

// clipEps is how close (m) two points, or a point and an edge, must be to count as one: a
// micrometre, far below drawing accuracy and far above the rounding of the projection.
const clipEps = 1e-6

// clipOp selects the boolean operation.
type clipOp int

const (
	opDifference   clipOp = iota // a less b
	opIntersection               // what a and b share
)

// ringDifference returns the parts of the simple ring a that lie outside the simple ring b,
// each a closed counter-clockwise ring without repeated or collinear corners; none when b
// covers a. ok is false when the result has a hole (b inside a without reaching its edge),
// which a ring cannot hold.
func ringDifference(a, b orb.Ring) (out []orb.Ring, ok bool) {
	return clipRings(a, b, opDifference)
}

// ringIntersection returns the area the simple rings a and b share, as closed
// counter-clockwise rings (several where the outlines meet more than once); none when they
// only touch.
func ringIntersection(a, b orb.Ring) []orb.Ring {
	out, _ := clipRings(a, b, opIntersection)
	return out
}

// pointSet numbers points, treating points closer than clipEps as one, so that a corner
// reached from two edges (or from both outlines) is one vertex when the pieces are joined.
type pointSet struct{ pts []orb.Point }

func (s *pointSet) id(p orb.Point) int {
	for i, q := range s.pts {
		if math.Abs(p[0]-q[0]) < clipEps && math.Abs(p[1]-q[1]) < clipEps {
			return i
		}
	}
	s.pts = append(s.pts, p)
	return len(s.pts) - 1
}

// openCCW returns the ring's corners without the closing one and without repeats,
// counter-clockwise.
func openCCW(r orb.Ring) []orb.Point {
	var out []orb.Point
	for _, p := range r {
		if n := len(out); n > 0 && math.Abs(p[0]-out[n-1][0]) < clipEps && math.Abs(p[1]-out[n-1][1]) < clipEps {
			continue
		}
		out = append(out, p)
	}
	for len(out) > 1 && math.Abs(out[0][0]-out[len(out)-1][0]) < clipEps && math.Abs(out[0][1]-out[len(out)-1][1]) < clipEps {
		out = out[:len(out)-1]
	}
	if signedArea(out) < 0 {
		slices.Reverse(out)
	}
	return out
}

// signedArea is the shoelace area of an open polygon, positive counter-clockwise.
func signedArea(p []orb.Point) float64 {
	s := 0.0
	for i := range p {
		q := p[(i+1)%len(p)]
		s += p[i][0]*q[1] - q[0]*p[i][1]
	}
	return s / 2
}

// lineDist returns the signed distance of c from the line through a and b, positive on the
// left.
func lineDist(a, b, c orb.Point) float64 {
	l := math.Hypot(b[0]-a[0], b[1]-a[1])
	if l == 0 {
		return math.Hypot(c[0]-a[0], c[1]-a[1])
	}
	return cross2(a, b, c) / l
}

// crossing returns the point where segments ab and cd cross, when each one's ends lie
// clearly (more than clipEps) on both sides of the other's line; ends closer than that are
// found as corners lying on an edge instead.
func crossing(a, b, c, d orb.Point) (orb.Point, bool) {
	d1, d2 := lineDist(a, b, c), lineDist(a, b, d)
	d3, d4 := lineDist(c, d, a), lineDist(c, d, b)
	if !(d1 > clipEps && d2 < -clipEps || d1 < -clipEps && d2 > clipEps) ||
		!(d3 > clipEps && d4 < -clipEps || d3 < -clipEps && d4 > clipEps) {
		return orb.Point{}, false
	}
	t := d3 / (d3 - d4)
	return orb.Point{a[0] + t*(b[0]-a[0]), a[1] + t*(b[1]-a[1])}, true
}

// along returns where p projects on ab, 0 at a and 1 at b.
func along(a, b, p orb.Point) float64 {
	dx, dy := b[0]-a[0], b[1]-a[1]
	return ((p[0]-a[0])*dx + (p[1]-a[1])*dy) / (dx*dx + dy*dy)
}

// cutEdges cuts every edge of p where the other outline q meets it (q's corners on it and the
// crossings, xs[i][j] the crossing of p's edge i with q's edge j or nil) and returns the pieces
// as pairs of point ids, in order around p.
func cutEdges(p, q []orb.Point, xs [][]*orb.Point, ids *pointSet) [][2]int {
	type cut struct {
		t  float64
		id int
	}
	var out [][2]int
	for i := range p {
		a, b := p[i], p[(i+1)%len(p)]
		cuts := []cut{{0, ids.id(a)}, {1, ids.id(b)}}
		for j, c := range q {
			if pointSegDist(c, a, b) < clipEps {
				cuts = append(cuts, cut{along(a, b, c), ids.id(c)})
			}
			if x := xs[i][j]; x != nil {
				cuts = append(cuts, cut{along(a, b, *x), ids.id(*x)})
			}
		}
		slices.SortStableFunc(cuts, func(u, v cut) int {
			switch {
			case u.t < v.t:
				return -1
			case u.t > v.t:
				return 1
			}
			return 0
		})
		for k := 0; k+1 < len(cuts); k++ {
			if cuts[k].id != cuts[k+1].id {
				out = append(out, [2]int{cuts[k].id, cuts[k+1].id})
			}
		}
	}
	return out
}

// clipRings computes a op b; ok is false when the result would need a hole.
func clipRings(ra, rb orb.Ring, op clipOp) (out []orb.Ring, ok bool) {
	a, b := openCCW(ra), openCCW(rb)
	if len(a) < 3 || len(b) < 3 {
		if op == opDifference && len(a) >= 3 {
			return []orb.Ring{closeRing(a)}, true
		}
		return nil, true
	}
	ids := &pointSet{}
	for _, p := range a {
		ids.id(p)
	}
	for _, p := range b {
		ids.id(p)
	}
	// Each crossing is worked out once, from a's edge, so that both outlines are cut at the
	// very same point.
	xa := make([][]*orb.Point, len(a))
	xb := make([][]*orb.Point, len(b))
	for j := range b {
		xb[j] = make([]*orb.Point, len(a))
	}
	for i := range a {
		xa[i] = make([]*orb.Point, len(b))
		for j := range b {
			if x, ok := crossing(a[i], a[(i+1)%len(a)], b[j], b[(j+1)%len(b)]); ok {
				xa[i][j], xb[j][i] = &x, &x
			}
		}
	}
	ea := cutEdges(a, b, xa, ids)
	eb := cutEdges(b, a, xb, ids)
	inB := map[[2]int]bool{}
	for _, e := range eb {
		inB[e] = true
	}
	inA := map[[2]int]bool{}
	for _, e := range ea {
		inA[e] = true
	}
	closedA, closedB := closeRing(a), closeRing(b)
	mid := func(e [2]int) orb.Point {
		p, q := ids.pts[e[0]], ids.pts[e[1]]
		return orb.Point{(p[0] + q[0]) / 2, (p[1] + q[1]) / 2}
	}
	var keep [][2]int
	for _, e := range ea {
		same, opposite := inB[e], inB[[2]int{e[1], e[0]}]
		switch {
		case same:
			// Both interiors lie on the same side: the piece bounds what they share.
			if op == opIntersection {
				keep = append(keep, e)
			}
		case opposite:
			// The interiors lie on either side: the piece bounds a less b.
			if op == opDifference {
				keep = append(keep, e)
			}
		case planar.RingContains(closedB, mid(e)) == (op == opIntersection):
			keep = append(keep, e)
		}
	}
	for _, e := range eb {
		if inA[e] || inA[[2]int{e[1], e[0]}] || !planar.RingContains(closedA, mid(e)) {
			continue
		}
		if op == opDifference {
			e = [2]int{e[1], e[0]} // b's edge inside a bounds a less b with the interior on its left
		}
		keep = append(keep, e)
	}
	return joinPieces(keep, ids.pts)
}

// joinPieces joins directed edge pieces into closed rings. Where several pieces leave one
// point (two parts of the result touching at a corner), the one turning furthest left is
// taken, which keeps each ring tight around its own interior. Rings of no area are dropped;
// ok is false when a ring runs clockwise (a hole).
func joinPieces(es [][2]int, pts []orb.Point) (out []orb.Ring, ok bool) {
	from := map[int][]int{}
	for k, e := range es {
		from[e[0]] = append(from[e[0]], k)
	}
	used := make([]bool, len(es))
	ok = true
	for s := range es {
		if used[s] {
			continue
		}
		var ring []orb.Point
		k := s
		for !used[k] {
			used[k] = true
			e := es[k]
			ring = append(ring, pts[e[0]])
			p, q := pts[e[0]], pts[e[1]]
			din := orb.Point{q[0] - p[0], q[1] - p[1]}
			next, best := -1, math.Inf(-1)
			for _, c := range from[e[1]] {
				if used[c] && c != s {
					continue
				}
				r := pts[es[c][1]]
				dout := orb.Point{r[0] - q[0], r[1] - q[1]}
				turn := math.Atan2(din[0]*dout[1]-din[1]*dout[0], din[0]*dout[0]+din[1]*dout[1])
				if turn > best {
					next, best = c, turn
				}
			}
			if next < 0 {
				break // an open chain: cannot happen for pieces of two closed outlines
			}
			k = next
		}
		ring = dropCollinear(ring)
		if len(ring) < 3 {
			continue
		}
		area := signedArea(ring)
		if math.Abs(area) < clipEps*clipEps {
			continue
		}
		if area < 0 {
			ok = false
			continue
		}
		out = append(out, closeRing(ring))
	}
	// Largest first, so that the order does not depend on where the walk started.
	slices.SortStableFunc(out, func(p, q orb.Ring) int {
		ap, aq := planar.Area(p), planar.Area(q)
		switch {
		case ap > aq:
			return -1
		case ap < aq:
			return 1
		}
		return 0
	})
	return out, ok
}

// dropCollinear removes corners that lie on the straight line between their neighbours (the
// cuts the operation made along an edge that stayed whole).
func dropCollinear(r []orb.Point) []orb.Point {
	for changed := true; changed && len(r) >= 3; {
		changed = false
		for i := 0; i < len(r) && len(r) >= 3; i++ {
			p, q, s := r[(i+len(r)-1)%len(r)], r[i], r[(i+1)%len(r)]
			if math.Abs(lineDist(p, s, q)) < clipEps && along(p, s, q) > 0 && along(p, s, q) < 1 {
				r = slices.Delete(r, i, i+1)
				changed = true
				i--
			}
		}
	}
	return r
}

// closeRing returns the open polygon p as a closed ring.
func closeRing(p []orb.Point) orb.Ring {
	r := make(orb.Ring, 0, len(p)+1)
	r = append(r, p...)
	return append(r, p[0])
}
