package report

import (
	"fmt"
	"image/color"
	"math"
	"slices"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/recorder"
)

// nameKind is what a plan name belongs to, which decides where it may go.
type nameKind int

const (
	faceName nameKind = iota
	blockName
	avoidName
	treeName
)

// planName is an object's name that the plan places beside the object (see layoutPlan).
type planName struct {
	kind nameKind
	id   string // the object's id, listed in the key when its name finds no room
	text string
	size float64 // points
	// The object's extent, m; a tree's is its crown's.
	x0, y0, x1, y1 float64
	// A tree's trunk and the radius of its mark, m.
	tx, ty, trunk float64
	// A face's label point (the middle of its highest edge, or lowest when below); its
	// extent is its outline's.
	at    plotter.XY
	below bool
}

// textKind says what a placed text is, for the tests and the draw style.
type textKind int

const (
	nameText   textKind = iota // an object's name beside it
	numberText                 // a number standing for an object's name, listed in the key
	rowText                    // a row number beside a face
	colText                    // a column number below a face
)

// placedText is one text of the plan's names and numbers, where the layout put it.
type placedText struct {
	kind textKind
	id   string // the object named or numbered; the face of a row or column number
	text string
	sty  text.Style
	at   plotter.XY // the data point it was placed from
	off  vg.Point   // its centre's offset from at, points
	back bool       // drawn on a light backing box, so that it reads over modules
	lead bool       // joined to at by a thin line (a number placed away from its object)
}

// planLayout is where the plan's names and numbers go on a w×h picture.
type planLayout struct {
	texts []placedText
	boxes []vg.Rectangle // the texts' boxes, points on the w×h canvas, in texts' order
	// keyed lists the objects shown by a number, the number of keyed[k] being k+1.
	keyed []string
	// rowsThinned and colsThinned report whether some rows or columns went unnumbered.
	rowsThinned, colsThinned bool
	legend                   vg.Rectangle   // kept free for the legend, points
	frame                    []vg.Rectangle // the scale bar and the north arrow, points
}

// Type sizes of the plan's texts, points.
const (
	gridSize   = 5.0
	numberSize = 5.5
)

// backing is the box behind a name: white, a little see-through so the module under it
// still shows its colour at the edges of the letters.
var backing = color.NRGBA{R: 0xff, G: 0xff, B: 0xff, A: 0xe6}

// backPad is how far the backing box reaches beyond the text, points.
const backPad = 0.8

// textStyle is the house style of a plan text of the given size, centred on its point.
func textStyle(size float64) text.Style {
	l := labelsOf(plotter.XYs{{}}, []string{"x"}, size, Ink, text.XCenter, text.YCenter)
	return l.TextStyle[0]
}

// planTexts draws the placed names and numbers over everything else on the plan.
type planTexts struct{ texts []placedText }

// Plot implements plot.Plotter.
func (t *planTexts) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	// The lines first, so that every box and text covers them.
	for _, pt := range t.texts {
		if pt.lead {
			a := vg.Point{X: trX(pt.at.X), Y: trY(pt.at.Y)}
			c.StrokeLine2(draw.LineStyle{Color: Ink, Width: vg.Points(0.5)}, a.X, a.Y, a.X+pt.off.X, a.Y+pt.off.Y)
		}
	}
	for _, pt := range t.texts {
		at := vg.Point{X: trX(pt.at.X), Y: trY(pt.at.Y)}.Add(pt.off)
		if pt.back || pt.kind == numberText {
			r := grow(pt.sty.Rectangle(pt.text).Add(at), backPad)
			if pt.kind == rowText || pt.kind == colText {
				// Row and column numbers stand in a tight line: their box only hides the
				// face's outline under the digits.
				r = digitBox(pt.sty, pt.text, at)
			}
			c.SetColor(backing)
			c.Fill(r.Path())
			if pt.kind == numberText {
				c.StrokeLines(draw.LineStyle{Color: Ink, Width: vg.Points(0.5)}, []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}, r.Min})
			}
		}
		c.FillText(pt.sty, at, pt.text)
	}
}

// keyThumb is the key's mark of a numbered object: its number boxed as on the plan.
type keyThumb struct{ n string }

// Thumbnail implements plot.Thumbnailer.
func (k keyThumb) Thumbnail(c *draw.Canvas) {
	sty := textStyle(numberSize)
	at := c.Center()
	r := grow(sty.Rectangle(k.n).Add(at), backPad)
	c.SetColor(white)
	c.Fill(r.Path())
	c.StrokeLines(draw.LineStyle{Color: Ink, Width: vg.Points(0.5)}, []vg.Point{r.Min, {X: r.Max.X, Y: r.Min.Y}, r.Max, {X: r.Min.X, Y: r.Max.Y}, r.Min})
	c.FillText(sty, at, k.n)
}

// keyHeading heads the key of numbered objects in the legend.
const keyHeading = "numbered on the plan"

// addKey lists the numbered objects in the legend, one a line with its number boxed as on
// the plan; where that would run the legend past the bottom of the drawing (a w×h picture),
// several a line, "1 vent-2  2 vent-4", as many as the legend's width holds.
func addKey(p *plot.Plot, keyed []string, w, h vg.Length) {
	if len(keyed) == 0 {
		return
	}
	c := p.DataCanvas(draw.NewCanvas(&recorder.Canvas{}, w, h))
	rowH := p.Legend.TextStyle.Rectangle("X").Size().Y + p.Legend.Padding
	used := p.Legend.Rectangle(c).Size()
	// The north arrow and the scale bar keep the drawing's bottom sixth (see planFrame).
	rows := int((c.Size().Y*5/6 - used.Y) / rowH)
	p.Legend.Add(keyHeading)
	if len(keyed) < rows {
		for k, id := range keyed {
			p.Legend.Add(Printable(id), keyThumb{fmt.Sprint(k + 1)})
		}
		return
	}
	width := max(used.X, vg.Length(legendFrac)*c.Size().X) - p.Legend.ThumbnailWidth
	line := ""
	for k, id := range keyed {
		e := fmt.Sprintf("%d %s", k+1, Printable(id))
		if line != "" && p.Legend.TextStyle.Width(line+"   "+e) > width {
			p.Legend.Add(line)
			line = ""
		}
		if line != "" {
			line += "   "
		}
		line += e
	}
	p.Legend.Add(line)
}

// layoutPlan places the plan's names and numbers on a w×h picture of p, which must hold
// everything else already (title, frame, legend): the row and column numbers first, beside
// the faces and never over a module, thinned to every 5th, the first and last of a face
// where they would run together; then the faces' names; then the objects' names beside
// their objects, clear of every other text, of the blocks and of the legend, and clear of
// the modules where they can be. An object whose name finds no room gets a number on or
// beside it instead, which the legend's key names. fixed are texts already on the plot
// (the modules' labels, the scale bar's) and marks the data boxes (x0, y0, x1, y1) of the
// scale bar and the north arrow, which the layout keeps clear of.
func layoutPlan(p *plot.Plot, w, h vg.Length, pl *Plan, names []planName, fixed []*plotter.Labels, marks [][4]float64, grid bool) planLayout {
	full := draw.NewCanvas(&recorder.Canvas{}, w, h)
	dc := p.DataCanvas(full)
	trX, trY := p.Transforms(&dc)
	pt := func(x, y float64) vg.Point { return vg.Point{X: trX(x), Y: trY(y)} }
	board := labelBoard{bounds: dc.Rectangle, gap: vg.Points(0.75)}
	var out planLayout

	// The legend's column, down to where the legend could reach with every object in its key.
	lc := full
	if p.Title.Text != "" {
		lc.Max.Y -= p.Title.TextStyle.Rectangle(p.Title.Text).Size().Y + p.Title.Padding
	}
	// (Legend.Rectangle gives the legend's size; it puts a right-hand legend on the left.)
	lsz := p.Legend.Rectangle(lc).Size()
	rowH := vg.Length(1.25) * p.Legend.TextStyle.Font.Size
	lr := vg.Rectangle{Min: vg.Point{X: lc.Max.X - lsz.X, Y: lc.Max.Y - lsz.Y}, Max: lc.Max}
	lr.Min.X = min(lr.Min.X, lc.Max.X-vg.Length(legendFrac)*(lc.Max.X-lc.Min.X))
	lr.Min.Y -= vg.Length(len(names)+1) * rowH
	out.legend = lr
	board.hard = append(board.hard, occupied{r: lr})

	for _, m := range marks {
		r := vg.Rectangle{Min: pt(m[0], m[1]), Max: pt(m[2], m[3])}
		board.hard = append(board.hard, occupied{r: r})
		out.frame = append(out.frame, r)
	}
	for _, l := range fixed {
		for i, s := range l.Labels {
			at := pt(l.XYs[i].X, l.XYs[i].Y).Add(l.Offset)
			board.hard = append(board.hard, occupied{r: l.TextStyle[i].Rectangle(s).Add(at)})
		}
	}
	var modules []vg.Rectangle
	for _, m := range pl.Modules {
		var r vg.Rectangle
		for k, q := range m.Corners {
			v := pt(q[0], q[1])
			if k == 0 {
				r = vg.Rectangle{Min: v, Max: v}
			}
			r.Min.X, r.Min.Y = min(r.Min.X, v.X), min(r.Min.Y, v.Y)
			r.Max.X, r.Max.Y = max(r.Max.X, v.X), max(r.Max.Y, v.Y)
		}
		board.soft = append(board.soft, occupied{r: r})
		modules = append(modules, r)
	}
	// A name over a module or across a face's outline gets a light box behind it, to read
	// over the module's colour and not be struck through by the line.
	var edges [][2]vg.Point
	for _, fc := range pl.Faces {
		for k := 1; k < len(fc.Ring); k++ {
			edges = append(edges, [2]vg.Point{pt(fc.Ring[k-1][0], fc.Ring[k-1][1]), pt(fc.Ring[k][0], fc.Ring[k][1])})
		}
	}
	overModule := func(r vg.Rectangle) bool {
		return slices.ContainsFunc(modules, func(m vg.Rectangle) bool { return overlaps(m, r) }) ||
			slices.ContainsFunc(edges, func(e [2]vg.Point) bool { return crosses(e[0], e[1], r) })
	}
	// Objects: blocks stay in sight (hard), tree trunks too; crowns and avoid areas are soft.
	// Owners are 1-based indices into names.
	boxOf := func(n planName) vg.Rectangle {
		return vg.Rectangle{Min: pt(n.x0, n.y0), Max: pt(n.x1, n.y1)}
	}
	for i, n := range names {
		switch n.kind {
		case blockName:
			board.hard = append(board.hard, occupied{r: boxOf(n), owner: i + 1})
		case avoidName:
			board.soft = append(board.soft, occupied{r: boxOf(n), owner: i + 1})
		case treeName:
			board.soft = append(board.soft, occupied{r: boxOf(n), owner: i + 1})
			tr := vg.Rectangle{Min: pt(n.tx-n.trunk, n.ty-n.trunk), Max: pt(n.tx+n.trunk, n.ty+n.trunk)}
			board.hard = append(board.hard, occupied{r: tr, owner: i + 1})
		}
	}

	add := func(t placedText, centre vg.Point) {
		t.off = centre.Sub(pt(t.at.X, t.at.Y))
		out.texts = append(out.texts, t)
		r := t.sty.Rectangle(t.text).Add(centre)
		switch {
		case t.kind == rowText || t.kind == colText:
			r = digitBox(t.sty, t.text, centre)
		case t.kind == nameText && t.back || t.kind == numberText:
			r = grow(r, backPad)
		}
		out.boxes = append(out.boxes, r)
	}
	// Each object's own place, which its name must stand nearer to than to any other
	// object's, so that a name on a crowded roof is not read as its neighbour's: a tree's
	// trunk, a block's or avoid area's extent.
	own := make([]vg.Rectangle, len(names))
	for i, n := range names {
		own[i] = boxOf(n)
		if n.kind == treeName {
			own[i] = vg.Rectangle{Min: pt(n.tx-n.trunk, n.ty-n.trunk), Max: pt(n.tx+n.trunk, n.ty+n.trunk)}
		}
	}
	nearest := func(i int, c vg.Point) bool {
		d := distTo(own[i], c)
		for j, n := range names {
			if j != i && n.kind != faceName && distTo(own[j], c) < d {
				return false
			}
		}
		return true
	}

	if grid {
		gsty := textStyle(gridSize)
		rows, cols := gridMarks(pl)
		for _, set := range []struct {
			marks   []gridMark
			kind    textKind
			thinned *bool
		}{{rows, rowText, &out.rowsThinned}, {cols, colText, &out.colsThinned}} {
			keep := thinMarks(set.marks, gsty, pt)
			// One reach for a whole face where one serves all its numbers, so that they stand
			// in a line; else each at its nearest free one.
			common := map[string]int{}
			for i, m := range set.marks {
				if _, ok := common[m.face]; ok || !keep[i] {
					continue
				}
				common[m.face] = -1
				for r := range gridReach {
					all := true
					for j, e := range set.marks {
						if keep[j] && e.face == m.face && !board.free(e.box(gsty, pt, r), 0, true) {
							all = false
							break
						}
					}
					if all {
						common[m.face] = r
						break
					}
				}
			}
			for i, m := range set.marks {
				if !keep[i] {
					*set.thinned = true
					continue
				}
				var cands []vg.Rectangle
				reach := []int{common[m.face]}
				if reach[0] < 0 {
					reach = reach[:0]
					for r := range gridReach {
						reach = append(reach, r)
					}
				}
				for _, r := range reach {
					cands = append(cands, m.box(gsty, pt, r))
				}
				j := board.place(cands, 0, true)
				if j < 0 {
					*set.thinned = true
					continue
				}
				k := gridReach[reach[j]]
				add(placedText{kind: set.kind, id: m.face, text: fmt.Sprint(m.n), sty: gsty, at: plotter.XY{X: m.x, Y: m.y}, back: true},
					pt(m.x-k*m.dx, m.y-k*m.dy))
			}
		}
	}

	for i, n := range names {
		sty := textStyle(n.size)
		box := sty.Rectangle(n.text)
		if n.kind != faceName {
			box = grow(box, backPad)
		}
		sz := box.Size()
		var centres []vg.Point
		var anchor plotter.XY
		switch n.kind {
		case faceName:
			anchor = n.at
			a := pt(n.at.X, n.at.Y)
			dir := vg.Length(1)
			if n.below {
				dir = -1
			}
			for k := range 3 {
				y := a.Y + dir*(board.gap+sz.Y/2+vg.Length(k)*sz.Y)
				for _, dx := range []float64{0, -0.35, 0.35, -0.7, 0.7} {
					centres = append(centres, vg.Point{X: a.X + vg.Length(dx)*sz.X, Y: y})
				}
			}
			// Then beside the face, where the edge it is named at is crowded.
			centres = append(centres, around(boxOf(n), sz, board.gap, n.below, nameRings)...)
		case treeName:
			anchor = plotter.XY{X: n.tx, Y: n.ty}
			a := pt(n.tx, n.ty)
			tr := trY(n.ty+n.trunk) - a.Y
			centres = append(centres,
				vg.Point{X: a.X, Y: a.Y - tr - board.gap - sz.Y/2},
				vg.Point{X: a.X, Y: a.Y + tr + board.gap + sz.Y/2})
			centres = append(centres, around(boxOf(n), sz, board.gap, false, nameRings)...)
		default:
			anchor = plotter.XY{X: (n.x0 + n.x1) / 2, Y: (n.y0 + n.y1) / 2}
			o := boxOf(n)
			inside := n.kind == blockName && float64(sz.X) <= 0.9*float64(o.Size().X) && sz.Y <= o.Size().Y
			below := n.kind == avoidName
			if inside {
				centres = append(centres, pt(anchor.X, anchor.Y))
			}
			centres = append(centres, around(o, sz, board.gap, below, nameRings)...)
		}
		if n.kind != faceName {
			centres = slices.DeleteFunc(centres, func(c vg.Point) bool { return !nearest(i, c) })
		}
		cands := make([]vg.Rectangle, len(centres))
		for k, c := range centres {
			cands[k] = box.Add(c)
		}
		if j := board.place(cands, i+1, false); j >= 0 {
			add(placedText{kind: nameText, id: n.id, text: n.text, sty: sty, at: anchor, back: n.kind != faceName && overModule(cands[j])}, centres[j])
			continue
		}
		if n.kind == faceName {
			// A face keeps its name at its first place: faces are few and large, and a
			// number would be a poorer way to tell them apart.
			board.hard = append(board.hard, occupied{r: cands[0]})
			add(placedText{kind: nameText, id: n.id, text: n.text, sty: sty, at: anchor}, centres[0])
			continue
		}
		// No room for the name: a number on the object, or beside it, and the name in the key.
		num := fmt.Sprint(len(out.keyed) + 1)
		out.keyed = append(out.keyed, n.id)
		nsty := textStyle(numberSize)
		nbox := grow(nsty.Rectangle(num), backPad)
		o := boxOf(n)
		centres = around(o, nbox.Size(), board.gap, false, 3)
		centres = slices.DeleteFunc(centres, func(c vg.Point) bool { return !nearest(i, c) })
		centres = append([]vg.Point{pt(anchor.X, anchor.Y)}, centres...)
		cands = cands[:0]
		for _, c := range centres {
			cands = append(cands, nbox.Add(c))
		}
		// On the object first, modules under it or not: that is where a reader looks.
		j := board.place(cands[:1], i+1, false)
		if j < 0 {
			if j = board.place(cands[1:], i+1, false); j >= 0 {
				j++
			}
		}
		lead := false
		if j < 0 {
			// A crowd: farther out, with a line to the object, so that it is not read as a
			// neighbour's.
			far := around(o, nbox.Size(), board.gap+3*nbox.Size().Y, false, leadRings)
			fc := make([]vg.Rectangle, len(far))
			for k, c := range far {
				fc[k] = nbox.Add(c)
			}
			if k := board.place(fc, i+1, false); k >= 0 {
				centres, j, lead = far, k, true
			}
		}
		if j < 0 {
			// Nowhere clear: on the object all the same, so that every object is identified.
			j = 0
			board.hard = append(board.hard, occupied{r: cands[0]})
		}
		add(placedText{kind: numberText, id: n.id, text: num, sty: nsty, at: anchor, lead: lead}, centres[j])
	}
	return out
}

// crosses reports whether the segment ab passes through the rectangle r (clipped to it,
// Liang–Barsky, by the parameter range the segment spends inside each slab).
func crosses(a, b vg.Point, r vg.Rectangle) bool {
	t0, t1 := 0.0, 1.0
	for _, s := range [][3]float64{
		{float64(a.X), float64(b.X - a.X), 0}, {float64(a.Y), float64(b.Y - a.Y), 1},
	} {
		lo, hi := float64(r.Min.X), float64(r.Max.X)
		if s[2] == 1 {
			lo, hi = float64(r.Min.Y), float64(r.Max.Y)
		}
		p, d := s[0], s[1]
		if d == 0 {
			if p < lo || p > hi {
				return false
			}
			continue
		}
		u0, u1 := (lo-p)/d, (hi-p)/d
		if u0 > u1 {
			u0, u1 = u1, u0
		}
		t0, t1 = math.Max(t0, u0), math.Min(t1, u1)
		if t0 > t1 {
			return false
		}
	}
	return true
}

// distTo is the distance from p to the rectangle r (0 inside it), points.
func distTo(r vg.Rectangle, p vg.Point) vg.Length {
	dx := max(r.Min.X-p.X, 0, p.X-r.Max.X)
	dy := max(r.Min.Y-p.Y, 0, p.Y-r.Max.Y)
	return vg.Length(math.Hypot(float64(dx), float64(dy)))
}

// leadRings is how many rings beyond the first three a number is tried in, with a line to
// its object.
const leadRings = 6

// nameRings is how many rings around its object a name is tried in: farther out, a name on
// a crowded roof could be read as another object's.
const nameRings = 2

// around lists the centres of a sz box around the object's box o, nearest first: above (or
// below first, when below), below, right, left, the corners, then a line farther out, for
// rings rings.
func around(o vg.Rectangle, sz vg.Point, gap vg.Length, below bool, rings int) []vg.Point {
	cx, cy := (o.Min.X+o.Max.X)/2, (o.Min.Y+o.Max.Y)/2
	var out []vg.Point
	for k := range rings {
		d := gap + vg.Length(k)*sz.Y
		up := vg.Point{X: cx, Y: o.Max.Y + d + sz.Y/2}
		down := vg.Point{X: cx, Y: o.Min.Y - d - sz.Y/2}
		if below {
			up, down = down, up
		}
		out = append(out, up, down,
			vg.Point{X: o.Max.X + d + sz.X/2, Y: cy},
			vg.Point{X: o.Min.X - d - sz.X/2, Y: cy},
			vg.Point{X: o.Max.X + d/2 + sz.X/2, Y: o.Max.Y + d/2 + sz.Y/2},
			vg.Point{X: o.Min.X - d/2 - sz.X/2, Y: o.Max.Y + d/2 + sz.Y/2},
			vg.Point{X: o.Max.X + d/2 + sz.X/2, Y: o.Min.Y - d/2 - sz.Y/2},
			vg.Point{X: o.Min.X - d/2 - sz.X/2, Y: o.Min.Y - d/2 - sz.Y/2})
	}
	return out
}

// gridReach are the distances, in module pitches from the face's first row or column, at
// which a row or column number is tried, nearest first.
var gridReach = []float64{0.85, 1, 1.15, 1.3, 1.5, 1.8}

// box is the mark's text box at the r-th of gridReach, points.
func (m gridMark) box(sty text.Style, pt func(x, y float64) vg.Point, r int) vg.Rectangle {
	k := gridReach[r]
	return digitBox(sty, fmt.Sprint(m.n), pt(m.x-k*m.dx, m.y-k*m.dy))
}

// digitHeight is the height of a digit in Liberation Sans, in ems (from memory; about its
// capital letters' height).
const digitHeight = 0.72

// digitBox is the ink of the digits s centred at c: from the baseline to the digits' top,
// not the whole line a name needs with its descenders, so that the numbers of rows a
// little more than a digit apart still fit beside them.
func digitBox(sty text.Style, s string, c vg.Point) vg.Rectangle {
	r := sty.Rectangle(s).Add(c)
	base := r.Min.Y + sty.FontExtents().Descent
	return vg.Rectangle{Min: vg.Point{X: r.Min.X, Y: base}, Max: vg.Point{X: r.Max.X, Y: base + vg.Length(digitHeight)*sty.Font.Size}}
}

// gridMark is a row or column number of a face: n at (x, y) less k steps of (dx, dy) (see
// gridReach), in the line of its row or column and just beyond the face's first column or
// row, m.
type gridMark struct {
	face         string
	n            int
	x, y, dx, dy float64
	first, last  bool // the face's first or last row (column)
}

// gridMarks returns the row and column numbers of every face whose modules carry their
// row.column, the rows beside the face's first column and the columns below its first row,
// each in the order of the modules.
func gridMarks(pl *Plan) (rows, cols []gridMark) {
	type key struct {
		face string
		n    int
	}
	rowFirst, colFirst := map[key]int{}, map[key]int{}
	rc := make([][2]int, len(pl.Modules))
	lo := map[string][2]int{} // the face's first row and column
	hi := map[string][2]int{}
	var rowKeys, colKeys []key
	for i, m := range pl.Modules {
		var r, c int
		if _, err := fmt.Sscanf(m.Label(), "%d.%d", &r, &c); err != nil || m.Label() != fmt.Sprintf("%d.%d", r, c) {
			continue // drawn by hand: no row and column
		}
		rc[i] = [2]int{r, c}
		l, seen := lo[m.Face]
		g := hi[m.Face]
		if !seen {
			l, g = [2]int{r, c}, [2]int{r, c}
		}
		lo[m.Face] = [2]int{min(l[0], r), min(l[1], c)}
		hi[m.Face] = [2]int{max(g[0], r), max(g[1], c)}
		if j, ok := rowFirst[key{m.Face, r}]; !ok || c < rc[j][1] {
			if !ok {
				rowKeys = append(rowKeys, key{m.Face, r})
			}
			rowFirst[key{m.Face, r}] = i
		}
		if j, ok := colFirst[key{m.Face, c}]; !ok || r < rc[j][0] {
			if !ok {
				colKeys = append(colKeys, key{m.Face, c})
			}
			colFirst[key{m.Face, c}] = i
		}
	}
	at := map[[3]int]int{}
	faceNo := map[string]int{}
	for i, m := range pl.Modules {
		if _, ok := faceNo[m.Face]; !ok {
			faceNo[m.Face] = len(faceNo)
		}
		if rc[i][0] > 0 {
			at[[3]int{faceNo[m.Face], rc[i][0], rc[i][1]}] = i
		}
	}
	// step is the centre-to-centre vector from module i to its neighbour dr rows and dc
	// columns on (the module's own size when it has none).
	step := func(i, dr, dc int) (float64, float64) {
		m := pl.Modules[i]
		x, y := centre(m.Corners)
		if j, ok := at[[3]int{faceNo[m.Face], rc[i][0] + dr, rc[i][1] + dc}]; ok {
			x2, y2 := centre(pl.Modules[j].Corners)
			return x2 - x, y2 - y
		}
		w, h := extent(m.Corners[:])
		if dc != 0 {
			return w, 0
		}
		return 0, h
	}
	// back is how many steps (dx, dy) module i stands beyond the face's module that is
	// farthest back along them: a row that starts late (beside an obstacle) is numbered at
	// the face's edge, not over the modules before it. (Numbers count the modules of their
	// own row, so the column number says nothing of where a module stands.)
	back := func(i int, dx, dy float64) float64 {
		l2 := dx*dx + dy*dy
		if l2 == 0 {
			return 0
		}
		x, y := centre(pl.Modules[i].Corners)
		b := 0.0
		for j, m := range pl.Modules {
			if m.Face == pl.Modules[i].Face && rc[j][0] > 0 {
				mx, my := centre(m.Corners)
				b = math.Max(b, ((x-mx)*dx+(y-my)*dy)/l2)
			}
		}
		return math.Round(b*100) / 100
	}
	for _, k := range rowKeys {
		i := rowFirst[k]
		x, y := centre(pl.Modules[i].Corners)
		dx, dy := step(i, 0, 1)
		dx, dy = pitch(pl.Modules[i], dx, dy)
		b := back(i, dx, dy)
		rows = append(rows, gridMark{face: k.face, n: k.n, x: x - b*dx, y: y - b*dy, dx: dx, dy: dy,
			first: k.n == lo[k.face][0], last: k.n == hi[k.face][0]})
	}
	for _, k := range colKeys {
		i := colFirst[k]
		x, y := centre(pl.Modules[i].Corners)
		dx, dy := step(i, 1, 0)
		// Rows need not start level, so the module of the same number in the next row may
		// stand aside: keep the step across the rows only.
		if rx, ry := step(i, 0, 1); rx != 0 || ry != 0 {
			a := (dx*rx + dy*ry) / (rx*rx + ry*ry)
			dx, dy = dx-a*rx, dy-a*ry
		}
		dx, dy = pitch(pl.Modules[i], dx, dy)
		b := back(i, dx, dy)
		cols = append(cols, gridMark{face: k.face, n: k.n, x: x - b*dx, y: y - b*dy, dx: dx, dy: dy,
			first: k.n == lo[k.face][1], last: k.n == hi[k.face][1]})
	}
	return rows, cols
}

// pitch shortens a step (dx, dy) from module m to its neighbour that reaches over a gap
// (the fill counts on past an obstacle) to the module's own span along it and a little
// more, the usual room between modules, so that numbers stay beside the face's edge.
func pitch(m PlanModule, dx, dy float64) (float64, float64) {
	l := math.Hypot(dx, dy)
	if l == 0 {
		return dx, dy
	}
	ux, uy := dx/l, dy/l
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, q := range m.Corners {
		v := q[0]*ux + q[1]*uy
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	if span := 1.05 * (hi - lo); l > 1.5*span {
		return span * ux, span * uy
	}
	return dx, dy
}

// thinMarks reports which of a face's numbers to keep: all of them when none would touch
// another at its nearest place; else, face by face, the first, the last and every 5th that
// keeps clear of those two.
func thinMarks(ms []gridMark, sty text.Style, pt func(x, y float64) vg.Point) []bool {
	keep := make([]bool, len(ms))
	boxes := make([]vg.Rectangle, len(ms))
	for i, m := range ms {
		boxes[i] = grow(m.box(sty, pt, 0), vg.Points(0.25))
		keep[i] = true
	}
	crowded := map[string]bool{}
	for i := range ms {
		for j := i + 1; j < len(ms); j++ {
			if ms[i].face == ms[j].face && overlaps(boxes[i], boxes[j]) {
				crowded[ms[i].face] = true
			}
		}
	}
	for i, m := range ms {
		if !crowded[m.face] || m.first || m.last {
			continue
		}
		keep[i] = m.n%5 == 0
		for j, e := range ms {
			if keep[i] && e.face == m.face && (e.first || e.last) && overlaps(boxes[i], boxes[j]) {
				keep[i] = false
			}
		}
	}
	return keep
}
