package geo

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// Orientation says which way modules lie on a roof face.
type Orientation int

// Orientations. The zero value is Portrait, the installer's default.
const (
	Portrait  Orientation = iota // long side up the slope
	Landscape                    // long side along the eave
	Best                         // whichever places more modules on each face (portrait on a tie)
)

// String returns the orientation's configuration name.
func (o Orientation) String() string {
	switch o {
	case Landscape:
		return "landscape"
	case Best:
		return "best"
	}
	return "portrait"
}

// ParseOrientation reads "portrait", "landscape" or "best" (any case).
func ParseOrientation(s string) (Orientation, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "portrait":
		return Portrait, nil
	case "landscape":
		return Landscape, nil
	case "best":
		return Best, nil
	}
	return 0, optionError(fmt.Sprintf("geo: orientation %q: use portrait, landscape or best", s))
}

// optionError is a bad fill setting: the user's input, so BadInput.
type optionError string

func (e optionError) Error() string { return string(e) }

// BadInput reports whether the error is the user's input (always true).
func (e optionError) BadInput() bool { return true }

// Default module, used when FillOptions gives no size: a 120 half-cell module of about 400 W
// (common practice).
const (
	DefaultLengthM = 1.72
	DefaultWidthM  = 1.13
)

// DefaultGrid is the cell grid used when FillOptions gives none: 120 half cells, 6 across by 20
// along (common practice).
var DefaultGrid = CellGrid{Cols: 6, Rows: 20}

// FillOptions says how to fill roof faces with modules. The zero value places default modules
// (DefaultLengthM × DefaultWidthM, DefaultGrid) in portrait, edge to edge, with no setback and
// no clearance, on every face where at least one fits.
type FillOptions struct {
	LengthM, WidthM    float64  // module size, long and short side; both 0 → the defaults
	Grid               CellGrid // cell arrangement; zero → DefaultGrid
	Orientation        Orientation
	SetbackM           float64 // clear margin, on the roof surface, from every edge of a face
	GapM               float64 // between neighbouring modules, both ways
	ObstacleClearanceM float64 // clear margin around avoid areas and block footprints
	MinModules         int     // a face where fewer fit is skipped with a note; ≤ 1 → any
}

func (o FillOptions) normalized() (FillOptions, error) {
	if o.LengthM == 0 && o.WidthM == 0 {
		o.LengthM, o.WidthM = DefaultLengthM, DefaultWidthM
	}
	if o.Grid == (CellGrid{}) {
		o.Grid = DefaultGrid
	}
	var bad []string
	if !(o.WidthM > 0 && o.LengthM >= o.WidthM && o.LengthM < 10) {
		bad = append(bad, fmt.Sprintf("module size %g × %g m: the length must be the long side, both above 0 and below 10 m", o.LengthM, o.WidthM))
	}
	if o.Grid.Cols <= 0 || o.Grid.Rows <= 0 {
		bad = append(bad, fmt.Sprintf("cell grid %d × %d: both counts must be positive", o.Grid.Cols, o.Grid.Rows))
	}
	if o.Orientation < Portrait || o.Orientation > Best {
		bad = append(bad, fmt.Sprintf("orientation %d: use Portrait, Landscape or Best", o.Orientation))
	}
	for _, v := range []struct {
		name string
		x    float64
	}{{"setback", o.SetbackM}, {"gap", o.GapM}, {"obstacle clearance", o.ObstacleClearanceM}} {
		if !(v.x >= 0 && v.x < 10) {
			bad = append(bad, fmt.Sprintf("%s %g m: must be at least 0 and below 10 m", v.name, v.x))
		}
	}
	if len(bad) > 0 {
		return o, optionError("geo: fill: " + strings.Join(bad, "; "))
	}
	return o, nil
}

// frame is a roof face's own coordinates: s along the eave, left to right seen from below the
// eave looking up the slope, and w up the slope on the roof surface, 0 at the eave.
type frame struct {
	face       *Face
	d, r       orb.Point // downhill and rightward unit vectors in plan
	cosB       float64
	up, right  Vec3 // 3-D unit vectors up the slope and along the eave
	outline    orb.Ring
	smin, smax float64
	wmax       float64
}

func newFrame(f *Face) *frame {
	fr := &frame{face: f, d: f.Downhill()}
	// Facing uphill (−d), the right hand points along −d turned clockwise.
	fr.r = orb.Point{-fr.d[1], fr.d[0]}
	b := f.PitchDeg * math.Pi / 180
	fr.cosB = math.Cos(b)
	fr.up = Vec3{-fr.d[0] * math.Cos(b), -fr.d[1] * math.Cos(b), math.Sin(b)}
	fr.right = Vec3{fr.r[0], fr.r[1], 0}
	fr.outline = fr.ring(f.Plan)
	bd := fr.outline.Bound()
	fr.smin, fr.smax, fr.wmax = bd.Min[0], bd.Max[0], bd.Max[1]
	return fr
}

// slope maps a plan point into the face frame.
func (fr *frame) slope(p orb.Point) orb.Point {
	s := p[0]*fr.r[0] + p[1]*fr.r[1]
	t := fr.face.EaveOffsetM - (p[0]*fr.d[0] + p[1]*fr.d[1])
	return orb.Point{s, t / fr.cosB}
}

// lift maps a face-frame point to 3-D on the face.
func (fr *frame) lift(q orb.Point) Vec3 {
	t := q[1] * fr.cosB
	o := fr.face.EaveOffsetM - t
	p := orb.Point{q[0]*fr.r[0] + o*fr.d[0], q[0]*fr.r[1] + o*fr.d[1]}
	return fr.face.Lift(p)
}

// ring maps a plan ring into the face frame. The map from plan to frame is a rotation and a
// stretch, so orientation is kept.
func (fr *frame) ring(r orb.Ring) orb.Ring {
	out := make(orb.Ring, len(r))
	for i, p := range r {
		out[i] = fr.slope(p)
	}
	if out.Orientation() == orb.CW {
		out.Reverse()
	}
	return out
}

// layout is the free area of one face in its frame.
type layout struct {
	fr        *frame
	setback   float64
	clearance float64
	obstacles []orb.Ring
}

// fitEps is the slack in fit tests: a millimetre, which no installer measures, absorbs the
// slight skew that drawing in longitude/latitude leaves on a rectangle.
const fitEps = 1e-3

// offsetStep is the largest step of the row offset search: a centimetre, finer than any
// installer sets out rails.
const offsetStep = 0.01

// place fills the face with modules of ds along the eave by dw up the slope and returns the
// lower-left corners per row, rows from the eave upward, each row left to right.
//
// Rows are pitched dw + gap apart. Where the first row starts matters on faces that widen
// upward (beside a valley), on faces with a chimney or a roof window that one row or two must
// dodge, and on eaves that are not quite straight, so every start from the setback line up to
// one pitch higher is tried, in steps of pitch/N ≤ offsetStep, and the start that places the
// most modules wins; on a tie the lowest start, which keeps the rows at the eave as an
// installer would (on a hip or a gable end, which narrow upward, that is also the best). The
// steps divide the pitch exactly, so every row that any start uses lies on one grid of
// heights and is worked out once.
func (l *layout) place(ds, dw, gap float64) [][]orb.Point {
	pitch := dw + gap
	n := int(math.Ceil(pitch/offsetStep - 1e-9))
	step := pitch / float64(n)
	bd := l.fr.outline.Bound()
	base, top := bd.Min[1]+l.setback, bd.Max[1]-l.setback+fitEps
	rp := newRowPlanner(l)
	// rows[j] holds the left edges of the row whose lower edge is at base + j·step.
	var rows [][]float64
	for j := 0; base+float64(j)*step+dw <= top; j++ {
		w0 := base + float64(j)*step
		rows = append(rows, pack(rp.free(w0, w0+dw, ds), ds, gap, nil))
	}
	best, bestN := 0, -1
	for j0 := 0; j0 < n && j0 < len(rows); j0++ {
		c := 0
		for j := j0; j < len(rows); j += n {
			c += len(rows[j])
		}
		if c > bestN {
			best, bestN = j0, c
		}
	}
	var out [][]orb.Point
	for j := best; j < len(rows); j += n {
		if len(rows[j]) == 0 {
			continue
		}
		w0 := base + float64(j)*step
		row := make([]orb.Point, len(rows[j]))
		for k, s0 := range rows[j] {
			row[k] = orb.Point{s0, w0}
		}
		out = append(out, row)
	}
	return out
}

// module builds the placed module whose lower-left corner in the frame is q.
func (fr *frame) module(q orb.Point, row, col int, portrait bool, o FillOptions) Module {
	m := Module{
		ID:   fmt.Sprintf("%s.%d.%d", fr.face.ID, row, col),
		Face: fr.face.ID, Row: row, Col: col, Portrait: portrait,
		WidthM: o.WidthM, LengthM: o.LengthM, Grid: o.Grid,
	}
	if portrait {
		// U along the eave to the right, V up the slope: U×V points out of the roof.
		m.U, m.V = fr.right, fr.up
		m.Origin = fr.lift(q)
	} else {
		// V along the eave to the right, U down the slope, so the origin is the upper left.
		m.U, m.V = fr.up.Scale(-1), fr.right
		m.Origin = fr.lift(orb.Point{q[0], q[1] + o.WidthM})
	}
	return m
}

// Fill places modules on every roof face of the site, and turns hand-drawn panels into modules
// on their face (a face with panels gets no automatic fill). Automatic modules are set in rows
// parallel to the eave, from the eave upward; whole modules only, inside the face outline less
// the setback, clear of avoid areas and of the footprints of blocks that rise above the face,
// each grown by the obstacle clearance. The rows' start up the slope is searched over one row
// pitch for the most modules (the lowest start on a tie); within a row each free stretch, found
// exactly, takes as many modules as fit, centred on it. The result depends on the input only.
//
// Ids are "<face>.<row>.<column>", row 1 at the eave, column 1 at the left. Hand-drawn panels
// get the same scheme by position (rows grouped by their lower edge, then left to right) and
// keep their own id in Module.Source, so that string layouts written against either work.
//
// Notes say what a surveyor should know: faces skipped, panels over obstacles.
func Fill(site *Site, opt FillOptions) (mods []Module, notes []string, err error) {
	if site == nil {
		return nil, nil, errors.New("geo: fill: no site")
	}
	opt, err = opt.normalized()
	if err != nil {
		return nil, nil, err
	}
	minN := max(opt.MinModules, 1)
	panelsOn := map[int][]Panel{}
	for _, p := range site.Panels {
		if i := faceAt(site.Faces, interiorPoint(p.Outline)); i >= 0 {
			panelsOn[i] = append(panelsOn[i], p)
		} else {
			notes = append(notes, fmt.Sprintf("panel %q lies on no roof face; ignored", p.ID))
		}
	}
	for i := range site.Faces {
		f := &site.Faces[i]
		if f.KeepEmpty {
			if len(panelsOn[i]) > 0 {
				notes = append(notes, fmt.Sprintf("face %q is marked keep_empty, but %d panel(s) are drawn on it; they are ignored", f.ID, len(panelsOn[i])))
			}
			continue // the surveyor's choice: no module, and nothing to warn about
		}
		fr := newFrame(f)
		obstacles, names := faceObstacles(site, f, fr)
		if ps := panelsOn[i]; len(ps) > 0 {
			ms, ns := panelModules(fr, ps, obstacles, names, opt)
			mods = append(mods, ms...)
			notes = append(notes, ns...)
			continue
		}
		l := &layout{fr: fr, setback: opt.SetbackM, clearance: opt.ObstacleClearanceM, obstacles: obstacles}
		var rows [][]orb.Point
		portrait := opt.Orientation != Landscape
		if opt.Orientation != Landscape {
			rows = l.place(opt.WidthM, opt.LengthM, opt.GapM)
		}
		if opt.Orientation != Portrait {
			lr := l.place(opt.LengthM, opt.WidthM, opt.GapM)
			if count(lr) > count(rows) {
				rows, portrait = lr, false
			}
		}
		n := count(rows)
		switch {
		case n == 0:
			notes = append(notes, fmt.Sprintf("face %q: no module fits inside the %.2f m setback and clear of obstacles", f.ID, opt.SetbackM))
			continue
		case n < minN:
			notes = append(notes, fmt.Sprintf("face %q: only %d modules fit, fewer than the minimum of %d; face skipped", f.ID, n, minN))
			continue
		}
		for r, row := range rows {
			for c, q := range row {
				mods = append(mods, fr.module(q, r+1, c+1, portrait, opt))
			}
		}
	}
	return mods, notes, nil
}

func count(rows [][]orb.Point) int {
	n := 0
	for _, r := range rows {
		n += len(r)
	}
	return n
}

// faceObstacles returns, in the face frame, the avoid areas and the footprints of prisms that
// rise above the face, with a name for each. A block wholly under the roof plane (a wall inside
// the house) is no obstacle.
func faceObstacles(site *Site, f *Face, fr *frame) ([]orb.Ring, []string) {
	var out []orb.Ring
	var names []string
	for _, a := range site.Avoids {
		if ringsOverlap(a.Area, f.Plan, 0) {
			out = append(out, fr.ring(a.Area))
			names = append(names, fmt.Sprintf("avoid area %q", a.ID))
		}
	}
	for _, ob := range site.Obstacles() {
		b := ob.Prism
		if b == nil || ob.Kind == "building" && ob.ID == f.Building {
			continue // a building's own walls stand under its roof
		}
		above := false
		for _, p := range b.Footprint {
			if b.TopAt(p) > f.HeightAt(p) {
				above = true
				break
			}
		}
		if above && ringsOverlap(b.Footprint, f.Plan, 0) {
			out = append(out, fr.ring(b.Footprint))
			names = append(names, fmt.Sprintf("%s %q", ob.Kind, ob.ID))
		}
	}
	return out, names
}

// panelModules turns hand-drawn panels on one face into modules: each panel becomes the
// rectangle bounding it in the face frame, numbered by position.
func panelModules(fr *frame, ps []Panel, obstacles []orb.Ring, names []string, opt FillOptions) ([]Module, []string) {
	type box struct {
		p      Panel
		lo, hi orb.Point
	}
	var notes []string
	bs := make([]box, len(ps))
	for i, p := range ps {
		r := fr.ring(p.Outline)
		bd := r.Bound()
		bs[i] = box{p, bd.Min, bd.Max}
		if a, ba := planar.Area(r), (bd.Max[0]-bd.Min[0])*(bd.Max[1]-bd.Min[1]); a < 0.9*ba {
			notes = append(notes, fmt.Sprintf("panel %q on face %q is not a rectangle aligned with the eave; its bounding rectangle is used", p.ID, fr.face.ID))
		}
		for k, ob := range obstacles {
			if ringsOverlap(r, ob, fitEps) {
				notes = append(notes, fmt.Sprintf("panel %q on face %q sits on %s", p.ID, fr.face.ID, names[k]))
			}
		}
	}
	slices.SortStableFunc(bs, func(a, b box) int {
		if a.lo[1] != b.lo[1] {
			if a.lo[1] < b.lo[1] {
				return -1
			}
			return 1
		}
		if a.lo[0] < b.lo[0] {
			return -1
		}
		if a.lo[0] > b.lo[0] {
			return 1
		}
		return 0
	})
	// Rows: a panel starts a new row when its lower edge is above the middle of the current
	// row's first panel.
	var rows [][]box
	for _, b := range bs {
		if k := len(rows); k > 0 {
			first := rows[k-1][0]
			if b.lo[1] < (first.lo[1]+first.hi[1])/2 {
				rows[k-1] = append(rows[k-1], b)
				continue
			}
		}
		rows = append(rows, []box{b})
	}
	var mods []Module
	for r, row := range rows {
		slices.SortStableFunc(row, func(a, b box) int {
			switch {
			case a.lo[0] < b.lo[0]:
				return -1
			case a.lo[0] > b.lo[0]:
				return 1
			}
			return 0
		})
		for c, b := range row {
			ds, dw := b.hi[0]-b.lo[0], b.hi[1]-b.lo[1]
			o := opt
			o.WidthM, o.LengthM = math.Min(ds, dw), math.Max(ds, dw)
			m := fr.module(b.lo, r+1, c+1, dw >= ds, o)
			m.Source = b.p.ID
			mods = append(mods, m)
		}
	}
	return mods, notes
}
