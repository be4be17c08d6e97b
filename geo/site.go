package geo

import (
	"math"
	"time"

	"github.com/paulmach/orb"
)

// Site is the surveyor's drawing in local east-north-up metres. U is height above the site's
// ground datum.
type Site struct {
	Proj  *ENU
	Faces []Face
	// Buildings are houses drawn by footprint and roof shape; their roof faces are in Faces.
	Buildings []Building
	Blocks    []Block
	Trees     []Tree
	Avoids    []Avoid
	Panels    []Panel
	// Warnings are problems that do not stop a survey (for the surveyor to read).
	Warnings []string
	// Notes are remarks for the record: what the reading settled by itself (a small overlap
	// between faces trimmed).
	Notes []string
}

// Face is a planar roof face.
type Face struct {
	ID    string
	Index int // feature index in the map file

	// Plan is the outline seen from above, counter-clockwise, closed.
	Plan orb.Ring

	PitchDeg  float64 // slope from horizontal
	AspectDeg float64 // direction the slope faces (downhill), clockwise from north

	// EaveHeightM is the height of the face's lowest point(s) above ground.
	EaveHeightM float64
	// EaveOffsetM is the coordinate, along the downhill direction, of the eave; the height at
	// a plan point p is EaveHeightM + (EaveOffsetM − downhill·p)·tan(pitch).
	EaveOffsetM float64

	// Building is the id of the building whose roof the face is; empty for a face drawn by hand.
	Building string

	// KeepEmpty reports whether the surveyor wants no module on the face (map property
	// keep_empty: true): it still shades and is still drawn, but Fill leaves it alone.
	KeepEmpty bool
}

// Downhill returns the horizontal unit vector the face slopes toward.
func (f *Face) Downhill() orb.Point {
	a := f.AspectDeg * math.Pi / 180
	return orb.Point{math.Sin(a), math.Cos(a)}
}

// HeightAt returns the height of the face's plane above a plan point.
func (f *Face) HeightAt(p orb.Point) float64 {
	d := f.Downhill()
	along := p[0]*d[0] + p[1]*d[1]
	return f.EaveHeightM + (f.EaveOffsetM-along)*math.Tan(f.PitchDeg*math.Pi/180)
}

// Lift returns the 3-D point of the face's plane above a plan point.
func (f *Face) Lift(p orb.Point) Vec3 { return Vec3{p[0], p[1], f.HeightAt(p)} }

// Normal returns the face's outward (upward) unit normal.
func (f *Face) Normal() Vec3 {
	b := f.PitchDeg * math.Pi / 180
	d := f.Downhill()
	return Vec3{d[0] * math.Sin(b), d[1] * math.Sin(b), math.Cos(b)}
}

// SetEave places the eave at the outline's lowest point: EaveOffsetM becomes the largest
// downhill coordinate of the outline.
func (f *Face) SetEave() {
	d := f.Downhill()
	best := math.Inf(-1)
	for _, p := range f.Plan {
		best = math.Max(best, p[0]*d[0]+p[1]*d[1])
	}
	f.EaveOffsetM = best
}

// Block is a vertical prism: a chimney, a dormer, a wall, a neighbouring building.
type Block struct {
	ID        string
	Index     int
	Footprint orb.Ring // counter-clockwise, closed, local metres
	BaseM     float64  // bottom above ground
	HeightM   float64  // top of the walls (the eaves, for a pitched block) above ground
	// AboveRoofM is the height above the roof the surveyor gave (height_above_roof_m), 0 when
	// HeightM was given; HeightM is then the roof's highest point under the footprint plus it.
	AboveRoofM float64

	// RidgeM is the ridge height above ground of a gable-roofed block; 0 means a flat top at
	// HeightM. The ridge runs through the footprint's centroid in direction RidgeAzimuthDeg
	// (clockwise from north); the roof falls linearly from the ridge to HeightM at the
	// footprint vertex farthest from the ridge line.
	RidgeM          float64
	RidgeAzimuthDeg float64
	// Hipped reports whether a pitched top also falls toward both ends of the ridge, at the same
	// slope as toward the sides (a hipped roof; a pyramid when the ends are as far as the sides).
	Hipped bool

	// Source names the file an imported obstacle came from; empty for one drawn in the map.
	Source string
}

// Pitched reports whether the block has a gable roof above its walls.
func (b *Block) Pitched() bool { return b.RidgeM > b.HeightM }

// TopAt returns the height of the block's top above a plan point inside its footprint.
func (b *Block) TopAt(p orb.Point) float64 {
	if !b.Pitched() {
		return b.HeightM
	}
	c, half := b.ridgeLine()
	a := b.RidgeAzimuthDeg * math.Pi / 180
	// distance from the ridge line: component across the ridge direction
	d := math.Abs((p[0]-c[0])*math.Cos(a) - (p[1]-c[1])*math.Sin(a))
	if half <= 0 {
		return b.RidgeM
	}
	top := b.RidgeM - (b.RidgeM-b.HeightM)*math.Min(1, d/half)
	if b.Hipped {
		slope := (b.RidgeM - b.HeightM) / half
		u := math.Abs((p[0]-c[0])*math.Sin(a) + (p[1]-c[1])*math.Cos(a))
		top = math.Min(top, b.HeightM+slope*math.Max(0, b.hipHalf(c)-u))
	}
	return top
}

// hipHalf returns the largest distance of a footprint vertex from c along the ridge: where the
// hipped ends reach the walls.
func (b *Block) hipHalf(c orb.Point) float64 {
	a := b.RidgeAzimuthDeg * math.Pi / 180
	half := 0.0
	for _, p := range b.Footprint {
		half = math.Max(half, math.Abs((p[0]-c[0])*math.Sin(a)+(p[1]-c[1])*math.Cos(a)))
	}
	return half
}

// ridgeLine returns a point on the ridge (the footprint's vertex centroid) and the largest
// distance of a footprint vertex from the ridge line.
func (b *Block) ridgeLine() (orb.Point, float64) {
	var c orb.Point
	n := len(b.Footprint)
	if n > 1 && b.Footprint[0] == b.Footprint[n-1] {
		n--
	}
	if n == 0 {
		return c, 0
	}
	for _, p := range b.Footprint[:n] {
		c[0] += p[0] / float64(n)
		c[1] += p[1] / float64(n)
	}
	a := b.RidgeAzimuthDeg * math.Pi / 180
	half := 0.0
	for _, p := range b.Footprint[:n] {
		half = math.Max(half, math.Abs((p[0]-c[0])*math.Cos(a)-(p[1]-c[1])*math.Sin(a)))
	}
	return c, half
}

// CrownShape is the form of a tree's crown.
type CrownShape int

// Crown shapes. The zero value is a sphere-like ellipsoid filling the crown's height.
const (
	CrownEllipsoid CrownShape = iota
	CrownCone
	// CrownSphere is a sphere of CrownRadiusM touching HeightM; its base is HeightM − 2·radius.
	CrownSphere
)

// String returns the shape's map name.
func (s CrownShape) String() string {
	switch s {
	case CrownCone:
		return "cone"
	case CrownSphere:
		return "sphere"
	}
	return "ellipsoid"
}

// Tree is a tree with a trunk point and a crown of revolution between CrownBaseM and HeightM.
type Tree struct {
	ID    string
	Index int
	Trunk orb.Point
	// BaseM, HeightM and CrownBaseM are all above the site's ground datum (like Vec3.U):
	// BaseM is the ground under the trunk, for ground that is not level.
	BaseM        float64 // ground under the trunk
	HeightM      float64 // top of the crown above ground
	CrownRadiusM float64
	CrownBaseM   float64 // bottom of the crown above ground
	Shape        CrownShape
	// Source names the file an imported tree came from; empty for one drawn in the map.
	Source string

	// Deciduous reports whether the tree drops its leaves; then LeafOffTransmittance of the
	// beam passes the crown in LeafOffMonths. An evergreen crown passes nothing.
	Deciduous            bool
	LeafOffTransmittance float64
	LeafOffMonths        []time.Month
}

// Transmittance returns the fraction of a beam that passes the crown in month m.
func (t *Tree) Transmittance(m time.Month) float64 {
	if !t.Deciduous {
		return 0
	}
	for _, o := range t.LeafOffMonths {
		if o == m {
			return t.LeafOffTransmittance
		}
	}
	return 0
}

// Avoid is an area on a roof where no module may go.
type Avoid struct {
	ID    string
	Index int
	Area  orb.Ring
}

// Panel is a module drawn by hand.
type Panel struct {
	ID      string
	Index   int
	Outline orb.Ring
}
