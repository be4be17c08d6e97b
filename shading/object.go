package shading

import (
	"fmt"
	"math"
	"time"

	"github.com/paulmach/orb"

	"sunstring/geo"
)

// kind tells the ray test which solid an object is.
type kind uint8

const (
	kindFace kind = iota
	kindBlock
	kindTree
)

func (k kind) String() string {
	switch k {
	case kindFace:
		return "face"
	case kindBlock:
		return "block"
	default:
		return "tree"
	}
}

// farT caps a ray that never leaves a slab; it is far beyond any site a surveyor draws.
const farT = 1e6

// object is one obstruction in a form the ray test can use directly. Faces are planar
// polygons, blocks are vertical prisms (optionally cut by two gable planes, or four for a hip), trees are crowns
// of revolution. Everything is opaque except tree crowns, which pass a month-dependent
// fraction of the beam.
type object struct {
	kind kind
	id   string

	// Bounding sphere: the culling in the fast path only ever compares directions against it.
	centre geo.Vec3
	radius float64

	// Plan outline without its closing vertex (faces and blocks) and its bounding box.
	poly       []orb.Point
	minE, maxE float64
	minN, maxN float64
	minU, maxU float64

	// Face: the plane n·x = k.
	n geo.Vec3
	k float64

	// Block: base and highest top; a gable is the pair of half-spaces
	// z ≤ ridge ∓ slope·((x−c)·across).
	base, top float64
	gable     bool
	ridge     float64
	slope     float64
	ridgeC    orb.Point
	across    orb.Point
	// Hipped block: also z ≤ hipTop ∓ slope·((x−c)·along).
	hip    bool
	hipTop float64
	along  orb.Point
	// A block whose footprint is strictly convex: the footprint as the half-planes
	// a·E + b·N ≤ c, one per edge, so that a ray is clipped to it like to the slab.
	edges       []halfPlane
	crownShape  geo.CrownShape
	crownBase   float64
	trunk       orb.Point
	crownRadius float64
	tree        *geo.Tree
}

// transmittance returns the fraction of the beam that passes the object in month m.
func (o *object) transmittance(m time.Month) float64 {
	if o.kind != kindTree {
		return 0
	}
	return o.tree.Transmittance(m)
}

// meanTransmittance is the crown's transmittance averaged over the twelve months, used for
// diffuse light, which has no single month.
func (o *object) meanTransmittance() float64 {
	if o.kind != kindTree {
		return 0
	}
	s := 0.0
	for m := time.January; m <= time.December; m++ {
		s += o.tree.Transmittance(m)
	}
	return s / 12
}

// openRing drops a ring's closing vertex so that edge loops need no special case.
func openRing(r orb.Ring) []orb.Point {
	n := len(r)
	if n > 1 && r[0] == r[n-1] {
		n--
	}
	return append([]orb.Point(nil), r[:n]...)
}

func (o *object) setPlanBox() {
	o.minE, o.minN = math.Inf(1), math.Inf(1)
	o.maxE, o.maxN = math.Inf(-1), math.Inf(-1)
	for _, p := range o.poly {
		o.minE, o.maxE = min(o.minE, p[0]), max(o.maxE, p[0])
		o.minN, o.maxN = min(o.minN, p[1]), max(o.maxN, p[1])
	}
}

// setSphereFromBox encloses the box [minE,maxE]×[minN,maxN]×[lo,hi].
func (o *object) setSphereFromBox(lo, hi float64) {
	o.minU, o.maxU = lo, hi
	o.centre = geo.Vec3{E: (o.minE + o.maxE) / 2, N: (o.minN + o.maxN) / 2, U: (lo + hi) / 2}
	o.radius = geo.Vec3{E: o.maxE - o.minE, N: o.maxN - o.minN, U: hi - lo}.Norm() / 2
}

func finite(xs ...float64) bool {
	for _, x := range xs {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

func ringFinite(r []orb.Point) bool {
	for _, p := range r {
		if !finite(p[0], p[1]) {
			return false
		}
	}
	return true
}

func faceObject(f *geo.Face) (object, error) {
	o := object{kind: kindFace, id: f.ID, poly: openRing(f.Plan)}
	if len(o.poly) < 3 || !ringFinite(o.poly) || !finite(f.PitchDeg, f.AspectDeg, f.EaveHeightM, f.EaveOffsetM) {
		return o, fmt.Errorf("%w: face %q: needs 3 finite plan vertices and finite pitch, aspect, eave", ErrBadScene, f.ID)
	}
	if f.PitchDeg < 0 || f.PitchDeg >= 90 {
		return o, fmt.Errorf("%w: face %q: pitch %g° outside [0, 90)", ErrBadScene, f.ID, f.PitchDeg)
	}
	o.setPlanBox()
	o.n = f.Normal()
	o.k = o.n.Dot(f.Lift(o.poly[0]))
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, p := range o.poly {
		z := f.HeightAt(p)
		lo, hi = min(lo, z), max(hi, z)
	}
	o.setSphereFromBox(lo, hi)
	return o, nil
}

// obstacleObject turns any kind's obstacle into the solid the ray test knows: a prism or a
// crown. A map kind that is built from these needs nothing here.
func obstacleObject(ob geo.Obstacle) (object, error) {
	switch {
	case ob.Prism != nil:
		return blockObject(ob.Prism)
	case ob.Crown != nil:
		return treeObject(ob.Crown)
	}
	return object{}, fmt.Errorf("%w: %s %q: neither a prism nor a crown", ErrBadScene, ob.Kind, ob.ID)
}

func blockObject(b *geo.Block) (object, error) {
	o := object{kind: kindBlock, id: b.ID, poly: openRing(b.Footprint), base: b.BaseM, top: b.HeightM}
	if len(o.poly) < 3 || !ringFinite(o.poly) || !finite(b.BaseM, b.HeightM, b.RidgeM, b.RidgeAzimuthDeg) {
		return o, fmt.Errorf("%w: block %q: needs 3 finite footprint vertices and finite heights", ErrBadScene, b.ID)
	}
	if b.HeightM < b.BaseM {
		return o, fmt.Errorf("%w: block %q: top %g m below base %g m", ErrBadScene, b.ID, b.HeightM, b.BaseM)
	}
	o.setPlanBox()
	if b.Pitched() {
		// Rebuild geo.Block.TopAt as two planes: its roof is ridge − slope·|distance from the
		// ridge line|, and inside the footprint the distance never exceeds the largest vertex
		// distance, so the clamp in TopAt never acts and the top is the lower of two planes.
		o.top = b.RidgeM
		n := float64(len(o.poly))
		for _, p := range o.poly {
			o.ridgeC[0] += p[0] / n
			o.ridgeC[1] += p[1] / n
		}
		a := b.RidgeAzimuthDeg * math.Pi / 180
		o.across = orb.Point{math.Cos(a), -math.Sin(a)}
		half := 0.0
		for _, p := range o.poly {
			half = max(half, math.Abs((p[0]-o.ridgeC[0])*o.across[0]+(p[1]-o.ridgeC[1])*o.across[1]))
		}
		if half > 0 {
			o.gable = true
			o.ridge = b.RidgeM
			o.slope = (b.RidgeM - b.HeightM) / half
			if b.Hipped {
				o.hip = true
				o.along = orb.Point{math.Sin(a), math.Cos(a)}
				halfL := 0.0
				for _, p := range o.poly {
					halfL = max(halfL, math.Abs((p[0]-o.ridgeC[0])*o.along[0]+(p[1]-o.ridgeC[1])*o.along[1]))
				}
				o.hipTop = b.HeightM + o.slope*halfL
			}
		}
	}
	o.edges = convexEdges(o.poly)
	o.setSphereFromBox(o.base, o.top)
	return o, nil
}

// halfPlane is a·E + b·N ≤ c.
type halfPlane struct{ a, b, c float64 }

// convexEdges returns the half-planes whose intersection is the ring, when the ring is
// strictly convex (every turn the same way, none straight); nil otherwise.
func convexEdges(poly []orb.Point) []halfPlane {
	n := len(poly)
	sign := 0.0
	for i := range n {
		a, b, c := poly[i], poly[(i+1)%n], poly[(i+2)%n]
		t := orient(a[0], a[1], b[0], b[1], c[0], c[1])
		switch {
		case t == 0 || math.IsNaN(t):
			return nil
		case sign == 0:
			sign = math.Copysign(1, t)
		case math.Signbit(t) != math.Signbit(sign):
			return nil
		}
	}
	hp := make([]halfPlane, n)
	for i := range n {
		a, b := poly[i], poly[(i+1)%n]
		// Inside lies to the left of a counter-clockwise edge (sign > 0): −(b−a)⊥·(x−a) ≤ 0.
		ex, ey := b[0]-a[0], b[1]-a[1]
		nx, ny := sign*ey, -sign*ex // outward normal
		hp[i] = halfPlane{nx, ny, nx*a[0] + ny*a[1]}
	}
	return hp
}

func treeObject(t *geo.Tree) (object, error) {
	o := object{kind: kindTree, id: t.ID, tree: t, crownShape: t.Shape, trunk: t.Trunk,
		crownRadius: t.CrownRadiusM, crownBase: t.CrownBaseM, top: t.HeightM}
	if !finite(t.Trunk[0], t.Trunk[1], t.HeightM, t.CrownRadiusM, t.CrownBaseM) {
		return o, fmt.Errorf("%w: tree %q: non-finite size or position", ErrBadScene, t.ID)
	}
	if t.CrownRadiusM <= 0 || t.HeightM <= t.CrownBaseM {
		return o, fmt.Errorf("%w: tree %q: crown needs a positive radius and a top above its base", ErrBadScene, t.ID)
	}
	if t.Shape != geo.CrownEllipsoid && t.Shape != geo.CrownCone {
		return o, fmt.Errorf("%w: tree %q: unknown crown shape %d", ErrBadScene, t.ID, t.Shape)
	}
	o.minE, o.maxE = t.Trunk[0]-t.CrownRadiusM, t.Trunk[0]+t.CrownRadiusM
	o.minN, o.maxN = t.Trunk[1]-t.CrownRadiusM, t.Trunk[1]+t.CrownRadiusM
	o.setSphereFromBox(t.CrownBaseM, t.HeightM)
	return o, nil
}

// boxSlab narrows [lo, hi] to the ts where a ≤ p + t·d ≤ b.
func boxSlab(lo, hi *float64, p, d, a, b float64) bool {
	if d == 0 {
		return p >= a && p <= b
	}
	t0, t1 := (a-p)/d, (b-p)/d
	if t0 > t1 {
		t0, t1 = t1, t0
	}
	*lo, *hi = max(*lo, t0), min(*hi, t1)
	return *lo <= *hi
}

// mayHit reports whether a ray from any point within distance r of p, in direction d, can
// meet the object's bounding box: the box grown by r contains the Minkowski sum of the box
// and the ball, so a false answer is certain, a true one is only possible.
func (o *object) mayHit(p, d geo.Vec3, r float64) bool {
	lo, hi := -r, farT
	return boxSlab(&lo, &hi, p.E, d.E, o.minE-r, o.maxE+r) &&
		boxSlab(&lo, &hi, p.N, d.N, o.minN-r, o.maxN+r) &&
		boxSlab(&lo, &hi, p.U, d.U, o.minU-r, o.maxU+r)
}

// hit reports whether the ray from p in direction d (a unit vector) meets the object at a
// parameter t ≥ 0. The test is exact for the solids described on object; both the fast and
// the brute-force path call it, so they differ only in which objects they ask.
func (o *object) hit(p, d geo.Vec3) bool {
	switch o.kind {
	case kindFace:
		return o.hitFace(p, d)
	case kindBlock:
		return o.hitBlock(p, d)
	default:
		if o.crownShape == geo.CrownCone {
			return o.hitCone(p, d)
		}
		return o.hitEllipsoid(p, d)
	}
}

func (o *object) hitFace(p, d geo.Vec3) bool {
	den := o.n.Dot(d)
	if den == 0 {
		// The ray runs in the face's plane: a face seen edge-on hides nothing.
		return false
	}
	t := (o.k - o.n.Dot(p)) / den
	if t <= 0 {
		return false
	}
	x, y := p.E+t*d.E, p.N+t*d.N
	if x < o.minE || x > o.maxE || y < o.minN || y > o.maxN {
		return false
	}
	return inRing(o.poly, x, y)
}

// clip narrows [lo, hi] to the ts where g0 + g1·t ≤ 0; it reports whether anything is left.
func clip(lo, hi *float64, g0, g1 float64) bool {
	if g1 == 0 {
		return g0 <= 0
	}
	t := -g0 / g1
	if g1 > 0 {
		*hi = min(*hi, t)
	} else {
		*lo = max(*lo, t)
	}
	return *lo <= *hi
}

func (o *object) hitBlock(p, d geo.Vec3) bool {
	lo, hi := 0.0, farT
	// slab base ≤ z ≤ top
	if !clip(&lo, &hi, o.base-p.U, -d.U) || !clip(&lo, &hi, p.U-o.top, d.U) {
		return false
	}
	if o.gable {
		// z − ridge ± slope·w ≤ 0, w = (plan − c)·across
		w0 := (p.E-o.ridgeC[0])*o.across[0] + (p.N-o.ridgeC[1])*o.across[1]
		w1 := d.E*o.across[0] + d.N*o.across[1]
		if !clip(&lo, &hi, p.U-o.ridge+o.slope*w0, d.U+o.slope*w1) ||
			!clip(&lo, &hi, p.U-o.ridge-o.slope*w0, d.U-o.slope*w1) {
			return false
		}
		if o.hip {
			u0 := (p.E-o.ridgeC[0])*o.along[0] + (p.N-o.ridgeC[1])*o.along[1]
			u1 := d.E*o.along[0] + d.N*o.along[1]
			if !clip(&lo, &hi, p.U-o.hipTop+o.slope*u0, d.U+o.slope*u1) ||
				!clip(&lo, &hi, p.U-o.hipTop-o.slope*u0, d.U-o.slope*u1) {
				return false
			}
		}
	}
	// What is left is a plan segment; the solid is hit when the segment meets the footprint.
	ax, ay := p.E+lo*d.E, p.N+lo*d.N
	bx, by := p.E+hi*d.E, p.N+hi*d.N
	if max(ax, bx) < o.minE || min(ax, bx) > o.maxE ||
		max(ay, by) < o.minN || min(ay, by) > o.maxN {
		return false
	}
	if o.edges != nil {
		// A convex footprint: the ray clipped by each edge's half-plane, as by the slab.
		for _, h := range o.edges {
			if !clip(&lo, &hi, h.a*p.E+h.b*p.N-h.c, h.a*d.E+h.b*d.N) {
				return false
			}
		}
		return true
	}
	if inRing(o.poly, ax, ay) || inRing(o.poly, bx, by) {
		return true
	}
	return segmentCrossesRing(o.poly, ax, ay, bx, by)
}

// quadNonPositive reports whether a·t² + b·t + c ≤ 0 somewhere on [lo, hi]: the minimum of a
// quadratic on an interval lies at an end or, for an upward parabola, at its vertex.
func quadNonPositive(a, b, c, lo, hi float64) bool {
	if lo > hi {
		return false
	}
	q := func(t float64) float64 { return (a*t+b)*t + c }
	if q(lo) <= 0 || q(hi) <= 0 {
		return true
	}
	if a > 0 {
		if t := -b / (2 * a); t > lo && t < hi {
			return q(t) <= 0
		}
	}
	return false
}

func (o *object) hitEllipsoid(p, d geo.Vec3) bool {
	// Scale the crown to the unit sphere.
	hz := (o.top - o.crownBase) / 2
	r := o.crownRadius
	px, py, pz := (p.E-o.trunk[0])/r, (p.N-o.trunk[1])/r, (p.U-o.crownBase-hz)/hz
	dx, dy, dz := d.E/r, d.N/r, d.U/hz
	return quadNonPositive(dx*dx+dy*dy+dz*dz, 2*(px*dx+py*dy+pz*dz), px*px+py*py+pz*pz-1, 0, farT)
}

func (o *object) hitCone(p, d geo.Vec3) bool {
	lo, hi := 0.0, farT
	if !clip(&lo, &hi, o.crownBase-p.U, -d.U) || !clip(&lo, &hi, p.U-o.top, d.U) {
		return false
	}
	// Inside: |plan − trunk|² ≤ k²·(top − z)², and top − z ≥ 0 holds in the slab, which
	// excludes the mirror nappe above the apex.
	k := o.crownRadius / (o.top - o.crownBase)
	k2 := k * k
	px, py, pz := p.E-o.trunk[0], p.N-o.trunk[1], o.top-p.U
	a := d.E*d.E + d.N*d.N - k2*d.U*d.U
	b := 2 * (px*d.E + py*d.N + k2*pz*d.U)
	c := px*px + py*py - k2*pz*pz
	return quadNonPositive(a, b, c, lo, hi)
}

// inRing reports whether (x, y) lies inside the polygon (even-odd rule; orientation does not
// matter, so mirrored scenes need no re-winding).
func inRing(poly []orb.Point, x, y float64) bool {
	in := false
	j := len(poly) - 1
	for i := range poly {
		xi, yi := poly[i][0], poly[i][1]
		xj, yj := poly[j][0], poly[j][1]
		if (yi > y) != (yj > y) && x < (xj-xi)*(y-yi)/(yj-yi)+xi {
			in = !in
		}
		j = i
	}
	return in
}

// segmentCrossesRing reports whether segment ab properly crosses an edge of the polygon.
func segmentCrossesRing(poly []orb.Point, ax, ay, bx, by float64) bool {
	j := len(poly) - 1
	for i := range poly {
		if segmentsCross(ax, ay, bx, by, poly[j][0], poly[j][1], poly[i][0], poly[i][1]) {
			return true
		}
		j = i
	}
	return false
}

func orient(ax, ay, bx, by, cx, cy float64) float64 {
	return (bx-ax)*(cy-ay) - (by-ay)*(cx-ax)
}

func segmentsCross(ax, ay, bx, by, cx, cy, dx, dy float64) bool {
	d1 := orient(cx, cy, dx, dy, ax, ay)
	d2 := orient(cx, cy, dx, dy, bx, by)
	d3 := orient(ax, ay, bx, by, cx, cy)
	d4 := orient(ax, ay, bx, by, dx, dy)
	return ((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0))
}
