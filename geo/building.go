package geo

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// Roof shapes of a building, named as OpenStreetMap's roof:shape tag names them.
const (
	RoofGabled   = "gabled"
	RoofHipped   = "hipped"
	RoofSkillion = "skillion"
	RoofFlat     = "flat"
)

// NearSquareDeg is how far an edge of a footprint may turn from the building's two axes and
// still count as square to them: the error of an outline traced on an aerial image or paced out
// on site (common practice). A corner where the outline turns by less is a point on a straight
// wall.
const NearSquareDeg = 5.0

// lSnapM is the difference between the widths of an L's two wings below which they are taken as
// equal, so that the wings' ridges meet at one height over a hip and a valley.
const lSnapM = 0.10

// Building is a house drawn as its footprint and roof shape. Decode makes its roof faces (in
// Site.Faces, each with Face.Building set to the building's ID) and its walls.
//
// Face ids are the building's id, a hyphen and the compass point (of eight) the face looks
// toward: "house-S", "house-NE". Every shape gives faces looking in different directions, so the
// ids are unique within a building.
type Building struct {
	ID    string
	Index int
	// Footprint is the outline of the walls seen from above, counter-clockwise, closed.
	Footprint       orb.Ring
	RoofShape       string  // RoofGabled, RoofHipped, RoofSkillion or RoofFlat
	PitchDeg        float64 // every face's pitch; 0 for a flat roof
	EaveHeightM     float64 // the eaves (a flat roof: the roof) above ground
	RidgeAzimuthDeg float64 // gabled, hipped: along the ridge; skillion: the face's aspect
	// Walls is the body below the eaves: an obstacle for the other roofs' modules. It never
	// shades the building's own faces, which lie above it.
	Walls Block
	// FaceIDs lists the ids of the faces the roof was made of, in Site.Faces order.
	FaceIDs []string
}

// compassPoint names an azimuth by the nearest of eight compass points.
func compassPoint(azDeg float64) string {
	names := [8]string{"N", "NE", "E", "SE", "S", "SW", "W", "NW"}
	return names[int(math.Round(normDeg(azDeg)/45))%8]
}

// corners returns the ring's corners without the closing vertex, dropping vertices where the
// outline turns by less than NearSquareDeg.
func corners(r orb.Ring) []orb.Point {
	pts := append([]orb.Point(nil), r[:len(r)-1]...)
	for changed := true; changed && len(pts) > 3; {
		changed = false
		for i := range pts {
			a, b, c := pts[(i+len(pts)-1)%len(pts)], pts[i], pts[(i+1)%len(pts)]
			turn := math.Abs(angleDiffDeg(edgeAzimuth(a, b), edgeAzimuth(b, c)))
			if turn < NearSquareDeg {
				pts = append(pts[:i], pts[i+1:]...)
				changed = true
				break
			}
		}
	}
	return pts
}

// edgeAzimuth returns the direction from a to b, clockwise from north, in [0, 360).
func edgeAzimuth(a, b orb.Point) float64 {
	return normDeg(math.Atan2(b[0]-a[0], b[1]-a[1]) * 180 / math.Pi)
}

// axisOff returns how far the direction az lies from the axis ax or its perpendicular, in
// [0, 45].
func axisOff(az, ax float64) float64 {
	d := math.Mod(math.Abs(normDeg(az)-normDeg(ax)), 90)
	return math.Min(d, 90-d)
}

// longestEdge returns the azimuth of the longest edge between the points (a closed loop).
func longestEdge(pts []orb.Point) float64 {
	best, az := -1.0, 0.0
	for i := range pts {
		a, b := pts[i], pts[(i+1)%len(pts)]
		if l := math.Hypot(b[0]-a[0], b[1]-a[1]); l > best+1e-9 {
			best, az = l, edgeAzimuth(a, b)
		}
	}
	return az
}

// squareTo returns the first edge that is not within NearSquareDeg of the axis ax or its
// perpendicular, or −1.
func squareTo(pts []orb.Point, ax float64) int {
	for i := range pts {
		if axisOff(edgeAzimuth(pts[i], pts[(i+1)%len(pts)]), ax) > NearSquareDeg {
			return i
		}
	}
	return -1
}

// unit returns the horizontal unit vector of an azimuth.
func unit(azDeg float64) orb.Point {
	a := azDeg * math.Pi / 180
	return orb.Point{math.Sin(a), math.Cos(a)}
}

func dot(p, q orb.Point) float64 { return p[0]*q[0] + p[1]*q[1] }

// clipHalf keeps the part of the polygon pts (open, convex or nearly so) where p·n ≤ c
// (Sutherland–Hodgman against one half-plane).
func clipHalf(pts []orb.Point, n orb.Point, c float64) []orb.Point {
	var out []orb.Point
	for i := range pts {
		a, b := pts[i], pts[(i+1)%len(pts)]
		da, db := dot(a, n)-c, dot(b, n)-c
		if da <= 0 {
			out = append(out, a)
		}
		if (da < 0 && db > 0) || (da > 0 && db < 0) {
			t := da / (da - db)
			out = append(out, orb.Point{a[0] + t*(b[0]-a[0]), a[1] + t*(b[1]-a[1])})
		}
	}
	return out
}

// closeCCW turns open points into a closed counter-clockwise ring.
func closeCCW(pts []orb.Point) orb.Ring {
	r := append(orb.Ring(nil), pts...)
	r = append(r, r[0])
	if r.Orientation() == orb.CW {
		r.Reverse()
	}
	return r
}

// roofPiece is one face of a generated roof in plan, with the direction it slopes toward.
type roofPiece struct {
	aspectDeg float64
	ring      orb.Ring
}

// roofPieces cuts the building's roof into faces. When the footprint does not suit the shape it
// returns the field to blame and a message saying what would.
func (b *Building) roofPieces(latDeg float64, razGiven bool) ([]roofPiece, string, string) {
	const drawFaces = "draw the roof's faces as roof features instead"
	pts := corners(b.Footprint)
	switch b.RoofShape {
	case RoofFlat:
		// Rows run along the longest wall, on the side that faces the equator.
		az := longestEdge(pts) + 90
		want := 180.0
		if latDeg < 0 {
			want = 0
		}
		if angleDiffDeg(az, want) > 90 {
			az += 180
		}
		return []roofPiece{{normDeg(az), b.Footprint}}, "", ""
	case RoofSkillion:
		return []roofPiece{{b.RidgeAzimuthDeg, b.Footprint}}, "", ""
	}
	switch {
	case len(pts) == 6 && b.RoofShape != RoofGabled:
		return nil, "geometry", fmt.Sprintf("a %s roof is made for a rectangular footprint only (an L-shaped one takes a gabled roof); %s", b.RoofShape, drawFaces)
	case len(pts) != 4 && len(pts) != 6:
		return nil, "geometry", fmt.Sprintf("the footprint has %d corners; a %s roof is made for a rectangular footprint (or an L-shaped one, gabled); %s", len(pts), b.RoofShape, drawFaces)
	}
	ax := longestEdge(pts)
	if razGiven {
		ax = b.RidgeAzimuthDeg
	}
	if i := squareTo(pts, ax); i >= 0 {
		if razGiven && squareTo(pts, longestEdge(pts)) < 0 {
			return nil, "ridge_azimuth_deg", fmt.Sprintf("%g° does not run along the footprint's walls, which run at %.0f° and %.0f°; give the ridge's direction along them",
				b.RidgeAzimuthDeg, math.Mod(longestEdge(pts), 180), math.Mod(longestEdge(pts)+90, 180))
		}
		return nil, "geometry", fmt.Sprintf("a %s roof is made for a footprint with square corners (within %g°), rectangular or L-shaped; this one's wall %d turns off square; %s",
			b.RoofShape, NearSquareDeg, i+1, drawFaces)
	}
	var pieces []roofPiece
	if len(pts) == 4 {
		pieces = b.rectPieces(pts, ax)
	} else {
		pieces = b.lPieces(pts, ax)
	}
	// The face that looks most toward the equator first (the roof order wires it first, as a
	// surveyor drawing the faces would list them), then by aspect: the order does not hang on
	// which way the ridge was given.
	sunny := 180.0
	if latDeg < 0 {
		sunny = 0
	}
	slices.SortStableFunc(pieces, func(p, q roofPiece) int {
		return cmp.Or(cmp.Compare(math.Round(angleDiffDeg(p.aspectDeg, sunny)*1e6), math.Round(angleDiffDeg(q.aspectDeg, sunny)*1e6)),
			cmp.Compare(p.aspectDeg, q.aspectDeg))
	})
	return pieces, "", ""
}

// rectPieces makes a gabled or hipped roof over a near-rectangle. Every face has the same pitch
// and its eave at the footprint's extreme along its downhill direction, so the roof is the
// lowest of the faces' planes and each face is the part of the footprint where its plane is the
// lowest: with two planes a gable, with four a hip (a pyramid on a square).
func (b *Building) rectPieces(pts []orb.Point, ax float64) []roofPiece {
	dirs := []float64{ax + 90, ax + 270}
	if b.RoofShape == RoofHipped {
		dirs = append(dirs, ax, ax+180)
	}
	ext := make([]float64, len(dirs))
	for k, az := range dirs {
		ext[k] = math.Inf(-1)
		for _, p := range pts {
			ext[k] = math.Max(ext[k], dot(p, unit(az)))
		}
	}
	var out []roofPiece
	for k, az := range dirs {
		poly := pts
		for j := range dirs {
			if j == k {
				continue
			}
			// plane k at or below plane j: ext_k − p·d_k ≤ ext_j − p·d_j
			dk, dj := unit(az), unit(dirs[j])
			poly = clipHalf(poly, orb.Point{dj[0] - dk[0], dj[1] - dk[1]}, ext[j]-ext[k])
		}
		if len(poly) < 3 {
			continue
		}
		r := closeCCW(poly)
		if math.Abs(planar.Area(r)) < 0.01 {
			continue
		}
		out = append(out, roofPiece{normDeg(az), r})
	}
	return out
}

// lPieces makes a gabled roof over a near-L: each wing has a gable roof along its length. With
// wings of one width the ridges meet at one height over a hip at the outer corner and a valley
// at the inner one; otherwise the wider wing's roof runs through to the outer wall and the
// narrower wing's lower roof meets it in two valleys. The footprint is squared up first (each
// wall at its mean position), which moves no wall by more than the drawing's own error.
func (b *Building) lPieces(pts []orb.Point, ax float64) []roofPiece {
	r, a := unit(ax), unit(ax+90)
	n := len(pts)
	// Square up: a wall along r keeps its mean v, a wall along a its mean u.
	type uv struct{ u, v float64 }
	wall := make([]float64, n) // edge i from pts[i] to pts[i+1]
	along := make([]bool, n)
	for i := range pts {
		p, q := pts[i], pts[(i+1)%n]
		az := edgeAzimuth(p, q)
		along[i] = angleDiffDeg(az, ax) <= NearSquareDeg || angleDiffDeg(az, ax+180) <= NearSquareDeg
		if along[i] {
			wall[i] = (dot(p, a) + dot(q, a)) / 2
		} else {
			wall[i] = (dot(p, r) + dot(q, r)) / 2
		}
	}
	c := make([]uv, n)
	for i := range pts {
		in, out := (i+n-1)%n, i // the walls meeting at corner i
		if along[in] {
			c[i] = uv{wall[out], wall[in]}
		} else {
			c[i] = uv{wall[in], wall[out]}
		}
	}
	u0, u1, v0, v1 := math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)
	for _, p := range c {
		u0, u1 = math.Min(u0, p.u), math.Max(u1, p.u)
		v0, v1 = math.Min(v0, p.v), math.Max(v1, p.v)
	}
	// The reflex corner is the one strictly inside the bounding box; the box corner that is no
	// corner of the footprint is the missing one, and the outer corner O is opposite it.
	var rc uv
	for _, p := range c {
		if p.u > u0+1e-9 && p.u < u1-1e-9 && p.v > v0+1e-9 && p.v < v1-1e-9 {
			rc = p
		}
	}
	ou, su, ov, sv := u0, 1.0, v0, 1.0
	for _, m := range []uv{{u0, v0}, {u1, v0}, {u0, v1}, {u1, v1}} {
		found := false
		for _, p := range c {
			if math.Abs(p.u-m.u) < 1e-6 && math.Abs(p.v-m.v) < 1e-6 {
				found = true
			}
		}
		if !found {
			if m.u == u0 {
				ou, su = u1, -1
			}
			if m.v == v0 {
				ov, sv = v1, -1
			}
		}
	}
	// Canonical frame: O at the origin, wing A along x (width wA), wing B along y (width wB).
	la, lb := u1-u0, v1-v0
	wB, wA := su*(rc.u-ou), sv*(rc.v-ov)
	swap := false
	if wB > wA+lSnapM {
		// Make A the wider wing by mirroring across x = y.
		swap = true
		la, lb, wA, wB = lb, la, wB, wA
	}
	toWorld := func(x, y float64) orb.Point {
		if swap {
			x, y = y, x
		}
		u, v := ou+su*x, ov+sv*y
		return orb.Point{u*r[0] + v*a[0], u*r[1] + v*a[1]}
	}
	dirWorld := func(dx, dy float64) float64 {
		if swap {
			dx, dy = dy, dx
		}
		du, dv := su*dx, sv*dy
		return normDeg(math.Atan2(du*r[0]+dv*a[0], du*r[1]+dv*a[1]) * 180 / math.Pi)
	}
	type xy = [2]float64
	var faces []struct {
		dx, dy float64
		pts    []xy
	}
	add := func(dx, dy float64, p ...xy) {
		faces = append(faces, struct {
			dx, dy float64
			pts    []xy
		}{dx, dy, p})
	}
	if math.Abs(wA-wB) <= lSnapM {
		w := (wA + wB) / 2
		add(0, -1, xy{0, 0}, xy{la, 0}, xy{la, w / 2}, xy{w / 2, w / 2})
		add(0, 1, xy{w / 2, w / 2}, xy{la, w / 2}, xy{la, w}, xy{w, w})
		add(-1, 0, xy{0, 0}, xy{w / 2, w / 2}, xy{w / 2, lb}, xy{0, lb})
		add(1, 0, xy{w / 2, w / 2}, xy{w, w}, xy{w, lb}, xy{w / 2, lb})
	} else {
		add(0, -1, xy{0, 0}, xy{la, 0}, xy{la, wA / 2}, xy{0, wA / 2})
		add(0, 1, xy{0, wA / 2}, xy{la, wA / 2}, xy{la, wA}, xy{wB, wA}, xy{wB / 2, wA - wB/2}, xy{0, wA})
		add(-1, 0, xy{0, wA}, xy{wB / 2, wA - wB/2}, xy{wB / 2, lb}, xy{0, lb})
		add(1, 0, xy{wB / 2, wA - wB/2}, xy{wB, wA}, xy{wB, lb}, xy{wB / 2, lb})
	}
	out := make([]roofPiece, len(faces))
	for i, f := range faces {
		ps := make([]orb.Point, len(f.pts))
		for k, p := range f.pts {
			ps[k] = toWorld(p[0], p[1])
		}
		out[i] = roofPiece{dirWorld(f.dx, f.dy), closeCCW(ps)}
	}
	return out
}
