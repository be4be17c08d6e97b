package shading

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync"

	"sunstring/geo"
)

// ErrBadScene is wrapped by NewScene's errors about the site or the modules.
var ErrBadScene = errors.New("shading: bad scene")

// SceneError is a problem with an object or module handed to NewScene.
type SceneError struct{ Err error }

func (e *SceneError) Error() string { return e.Err.Error() }
func (e *SceneError) Unwrap() error { return e.Err }

// BadInput reports whether the error comes from the user's drawing (always).
func (e *SceneError) BadInput() bool { return true }

// rayOffsetM lifts every ray origin off the module along its normal so that the module's own
// roof face, which the module lies on, never registers as a hit through rounding.
const rayOffsetM = 0.01

// Options tunes a Scene. The zero value uses geo.DefaultGrid (the one default cell grid of
// the project, also the module fill's), a flat far horizon, one worker per
// available CPU and the fast path.
type Options struct {
	Grid       geo.CellGrid // cells per module; zero means geo.DefaultGrid
	Horizon    *Horizon     // far horizon; nil means flat at elevation 0
	Workers    int          // parallel modules; 0 means GOMAXPROCS
	BruteForce bool         // one exact ray per cell per step against every object (the reference)
}

// Scene is a site prepared for shading: obstructions turned into ray-testable solids and, per
// module, the cell ray origins and the angular bounds of every object that can reach it. A
// Scene is safe for concurrent use.
type Scene struct {
	objs    []object
	mods    []geo.Module
	preps   []modPrep
	grid    geo.CellGrid
	horizon *Horizon
	workers int
	brute   bool

	diffOnce []sync.Once
	diff     []Diffuse
}

// cone is a set of directions: those within angle α of axis, stored as cos α. Every ray
// from anywhere in a module (or from one cell) that meets an object points into the cone
// of the object's bounding sphere, so a sun outside the cone cannot be blocked by it.
type cone struct {
	axis geo.Vec3
	cos  float64
}

func (c cone) contains(d geo.Vec3) bool { return c.axis.Dot(d) >= c.cos }

// coneTo returns the cone of directions from a ball (from, fromR) to a ball (to, toR).
func coneTo(from geo.Vec3, fromR float64, to geo.Vec3, toR float64) (c cone, sin float64) {
	v := to.Sub(from)
	dist := v.Norm()
	r := fromR + toR
	if dist <= r*(1+1e-9) {
		return cone{axis: geo.Vec3{U: 1}, cos: -2}, 1 // every direction
	}
	s := r / dist
	// A hair of slack so that rounding in the dot product never culls a grazing ray that the
	// exact test would count.
	return cone{axis: v.Scale(1 / dist), cos: math.Sqrt(1-s*s) - 1e-9}, s
}

// modPrep is what the fast path needs of one module.
type modPrep struct {
	normal geo.Vec3
	cells  []geo.Vec3 // ray origins: cell centres lifted by rayOffsetM
	centre geo.Vec3   // lifted module centre
	rad    float64    // radius of a ball around the lifted module

	objs    []int32  // objects that can shade the module at all
	cones   []cone   // per objs entry: directions from the module to the object
	front   []bool   // per objs entry: a face whose plane the whole module lies in front of
	cellCon [][]cone // per objs entry, per cell
}

// NewScene prepares the site's faces and obstacles (geo.Site.Obstacles) and the modules for Compute. A nil site
// has no obstructions. Modules are addressed by their index in mods.
func NewScene(site *geo.Site, mods []geo.Module, opt Options) (*Scene, error) {
	sc := &Scene{mods: append([]geo.Module(nil), mods...), grid: opt.Grid, horizon: opt.Horizon,
		workers: opt.Workers, brute: opt.BruteForce}
	if sc.grid == (geo.CellGrid{}) {
		sc.grid = geo.DefaultGrid
	}
	if sc.grid.Cols <= 0 || sc.grid.Rows <= 0 || sc.grid.Len() > 1<<16 {
		return nil, &SceneError{fmt.Errorf("%w: cell grid %d×%d", ErrBadScene, sc.grid.Cols, sc.grid.Rows)}
	}
	if sc.workers <= 0 {
		sc.workers = runtime.GOMAXPROCS(0)
	}
	if site != nil {
		for i := range site.Faces {
			o, err := faceObject(&site.Faces[i])
			if err != nil {
				return nil, &SceneError{err}
			}
			sc.objs = append(sc.objs, o)
		}
		for _, ob := range site.Obstacles() {
			o, err := obstacleObject(ob)
			if err != nil {
				return nil, &SceneError{err}
			}
			sc.objs = append(sc.objs, o)
		}
	}
	sc.preps = make([]modPrep, len(sc.mods))
	for i := range sc.mods {
		if err := sc.prepare(i); err != nil {
			return nil, &SceneError{err}
		}
	}
	sc.diffOnce = make([]sync.Once, len(sc.mods))
	sc.diff = make([]Diffuse, len(sc.mods))
	return sc, nil
}

func (sc *Scene) prepare(i int) error {
	m := &sc.mods[i]
	n := m.Normal()
	if !(m.WidthM > 0 && m.LengthM > 0) || !finite(m.WidthM, m.LengthM, m.Origin.E, m.Origin.N, m.Origin.U, n.E, n.N, n.U) ||
		math.Abs(n.Norm()-1) > 1e-6 {
		return fmt.Errorf("%w: module %q: needs a positive size, finite corners and non-parallel U, V", ErrBadScene, m.ID)
	}
	lift := n.Scale(rayOffsetM)
	p := modPrep{normal: n, centre: m.Center().Add(lift), rad: math.Hypot(m.WidthM, m.LengthM) / 2}
	for _, c := range m.CellCenters(sc.grid) {
		p.cells = append(p.cells, c.Add(lift))
	}
	corners := m.Corners()
	for j := range sc.objs {
		o := &sc.objs[j]
		c, sin := coneTo(p.centre, p.rad, o.centre, o.radius)
		// An object whose cone lies wholly below the horizontal or wholly behind the module
		// can never stand between the module and a sun that is up and in front.
		if c.axis.U <= -sin || c.axis.Dot(n) <= -sin {
			continue
		}
		front := false
		if o.kind == kindFace {
			front = true
			for _, q := range corners {
				if o.n.Dot(q.Add(lift)) <= o.k {
					front = false
				}
			}
		}
		p.objs = append(p.objs, int32(j))
		p.cones = append(p.cones, c)
		p.front = append(p.front, front)
		cc := make([]cone, len(p.cells))
		for k, q := range p.cells {
			cc[k], _ = coneTo(q, 0, o.centre, o.radius)
		}
		p.cellCon = append(p.cellCon, cc)
	}
	sc.preps[i] = p
	return nil
}

// Modules returns the number of modules in the scene.
func (sc *Scene) Modules() int { return len(sc.mods) }

// Grid returns the cell grid in use.
func (sc *Scene) Grid() geo.CellGrid { return sc.grid }
