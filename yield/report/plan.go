package report

import (
	"fmt"
	"image/color"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Plan is the roof seen from above in local east-north metres (x east, y north), the input
// of the plan and strings charts. It holds plain coordinates so that the charts do not
// depend on how the site was drawn.
type Plan struct {
	Faces   []Shape
	Blocks  []Shape
	Avoids  []Shape
	Trees   []TreeMark
	Modules []PlanModule
	// Strings lists, for each string of the chosen layout, indices into Modules in wiring
	// order.
	Strings [][]int
	// Inputs is the inverter input (1-based) of each string; may be nil. With several
	// inverters (Inverters above 1) InverterOf is each string's inverter (1-based).
	Inputs     []int
	Inverters  int
	InverterOf []int
}

// Shape is a named outline, a closed ring of east-north points in metres.
type Shape struct {
	ID   string
	Ring [][2]float64
}

// TreeMark is a tree seen from above: its trunk and crown radius, metres.
type TreeMark struct {
	ID           string
	X, Y         float64
	CrownRadiusM float64
}

// PlanModule is one module's outline seen from above. Face, SunKWhM2, UnshadedKWhM2 and
// ShadeLossPct are filled in from the summary's module results (by ID) when the charts are
// made, so that the drawings show summary.json's figures.
type PlanModule struct {
	ID            string
	Corners       [4][2]float64
	Face          string
	SunKWhM2      float64 // annual plane-of-array irradiation with shade
	UnshadedKWhM2 float64 // the same without shade
	ShadeLossPct  float64 // share of the module's light lost to shade
}

// Label is the module's name on the drawings: row.column when the id is the face id,
// row and column (ids from the fill), else the id itself.
func (m PlanModule) Label() string {
	if m.Face != "" && strings.HasPrefix(m.ID, m.Face+".") {
		return m.ID[len(m.Face)+1:]
	}
	return m.ID
}

// SunBins are the lower bounds of the plan chart's sunlight classes, in % of the
// sunniest module's irradiation without shade on this roof; below the last one is the last
// class. Classes, not a continuous scale, so that a reader can match a module to the
// legend at a glance; relative to the roof's best so that a poorly facing face reads as
// poor whether shade or its orientation is the cause.
var SunBins = []float64{95, 90, 80, 70}

// sunColours run from the accent (most sunlight) to a pale grey (least): the strong colour
// is where the energy is, in print and in grey.
var sunColours = []color.RGBA{
	{R: 0x1b, G: 0x6f, B: 0x7a, A: 0xff},
	{R: 0x4f, G: 0x92, B: 0x9b, A: 0xff},
	{R: 0x8a, G: 0xb9, B: 0xbf, A: 0xff},
	{R: 0xc3, G: 0xdc, B: 0xdf, A: 0xff},
	{R: 0xec, G: 0xef, B: 0xf0, A: 0xff},
}

// emptyClass marks a sunlight class of the legend that no connected module falls in.
const emptyClass = " (no module)"

// sunLegend returns the legend's label of every sunlight class (under sunHeading), in the order of sunColours,
// the classes no connected module falls in (used[k] false) marked emptyClass: every class,
// so that the scale reads the same on every roof and a reader comparing two plans finds each
// colour at the same place. Without a module (ref 0) there is no best to scale by, and no
// scale.
func sunLegend(used []bool, ref float64) []string {
	if ref <= 0 {
		return nil
	}
	out := make([]string, len(sunColours))
	for k := range sunColours {
		out[k] = sunClassLabel(k, ref)
		if !used[k] {
			out[k] += emptyClass
		}
	}
	return out
}

// SunClass returns the sunlight class of a module that gets share % of the roof's best.
func SunClass(share float64) int {
	for i, b := range SunBins {
		if share >= b {
			return i
		}
	}
	return len(SunBins)
}

// sunClassLabel names class i with the roof's best irradiation ref (kWh/m² a year), the unit
// left to the legend's heading (sunHeading).
func sunClassLabel(i int, ref float64) string {
	kwh := func(pct float64) string { return Thousands(ref*pct/100, 0) }
	switch {
	case i == 0:
		return fmt.Sprintf("%s or more", kwh(SunBins[0]))
	case i == len(SunBins):
		return fmt.Sprintf("below %s", kwh(SunBins[i-1]))
	default:
		return fmt.Sprintf("%s to %s", kwh(SunBins[i]), kwh(SunBins[i-1]))
	}
}

// sunHeading heads the sunlight classes in the plan's legend: the unit once, so that the
// classes' labels stay short enough for the legend's share of the picture.
const sunHeading = "sunlight a year, kWh/m²"

// StringColours are the string colours of the strings chart: the accent first, then hues
// of similar weight that stay apart for readers with red-green colour blindness; they
// repeat after the eighth string.
var StringColours = []color.RGBA{
	{R: 0x1b, G: 0x6f, B: 0x7a, A: 0xff}, // accent teal
	{R: 0xc9, G: 0x8a, B: 0x1b, A: 0xff}, // amber
	{R: 0x5b, G: 0x5f, B: 0xa8, A: 0xff}, // slate violet
	{R: 0xa8, G: 0x45, B: 0x3a, A: 0xff}, // brick
	{R: 0x6f, G: 0x7f, B: 0x2a, A: 0xff}, // olive
	{R: 0x8a, G: 0x4d, B: 0x7a, A: 0xff}, // plum
	{R: 0x3f, G: 0x6f, B: 0x9f, A: 0xff}, // steel
	{R: 0x7a, G: 0x6a, B: 0x52, A: 0xff}, // umber
}

var (
	faceFill  = color.RGBA{R: 0xf2, G: 0xf3, B: 0xf4, A: 0xff}
	blockFill = color.RGBA{R: 0x8d, G: 0x94, B: 0x99, A: 0xff}
	treeFill  = color.RGBA{R: 0xd5, G: 0xd9, B: 0xdb, A: 0xff}
	white     = color.RGBA{R: 0xff, G: 0xff, B: 0xff, A: 0xff}
)

// tint mixes c with white: f = 0 gives c, f = 1 white.
func tint(c color.RGBA, f float64) color.RGBA {
	m := func(v uint8) uint8 { return uint8(math.Round(float64(v) + (255-float64(v))*f)) }
	return color.RGBA{R: m(c.R), G: m(c.G), B: m(c.B), A: 0xff}
}

func ringXYs(r [][2]float64) plotter.XYs {
	xy := make(plotter.XYs, len(r))
	for i, p := range r {
		xy[i].X, xy[i].Y = p[0], p[1]
	}
	return xy
}

func circleXYs(x, y, r float64) plotter.XYs {
	const n = 48
	xy := make(plotter.XYs, n)
	for i := range xy {
		a := 2 * math.Pi * float64(i) / n
		xy[i].X, xy[i].Y = x+r*math.Cos(a), y+r*math.Sin(a)
	}
	return xy
}

func centre(c [4][2]float64) (x, y float64) {
	for _, p := range c {
		x += p[0] / 4
		y += p[1] / 4
	}
	return x, y
}

func addPolygon(p *plot.Plot, xy plotter.XYs, fill color.Color, line color.Color, w vg.Length) *plotter.Polygon {
	pg, err := plotter.NewPolygon(xy)
	if err != nil {
		return nil // fewer than three points: nothing to draw
	}
	pg.Color = fill
	pg.LineStyle.Color = line
	pg.LineStyle.Width = w
	if line == nil {
		pg.LineStyle.Width = 0
	}
	p.Add(pg)
	return pg
}

// reachM is how far from the roof the plan draws an obstacle: farther ones shade only at
// low sun and would shrink the roof to a few pixels (the sun-path chart shows them).
const reachM = 40.0

// framed is what the plan's frame holds: the roof's extents grown by every obstacle
// within reach, and the obstacles left out.
type framed struct {
	minX, maxX, minY, maxY float64
	left                   []string // ids of obstacles beyond reach, not drawn
	mPerPt                 float64  // metres per point of the picture, once fitted
}

// fit grows the frame to the proportions of a w×h picture with legendFrac of its width
// kept for the legend on the right and a margin under the drawing for the scale bar.
func (f *framed) fit(w, h vg.Length, legendFrac float64) {
	dx, dy := math.Max(f.maxX-f.minX, 1), math.Max(f.maxY-f.minY, 1)
	pad := 0.04 * math.Max(dx, dy)
	f.minX, f.maxX, f.minY, f.maxY = f.minX-pad, f.maxX+pad, f.minY-pad-0.1*dy, f.maxY+pad
	dx, dy = f.maxX-f.minX, f.maxY-f.minY
	// The plot area is the picture less the title (about three lines of 12 pt); the
	// drawing takes its left part, centred there, the legend the rest.
	ratio := float64(w) / float64(h-vg.Points(46))
	total := dx / (1 - legendFrac)
	if total/dy > ratio {
		extra := total/ratio - dy
		f.minY -= extra / 2
		f.maxY += extra / 2
	} else {
		total = dy * ratio
		f.minX -= (total*(1-legendFrac) - dx) / 2
	}
	f.maxX = f.minX + total
	f.mPerPt = (f.maxX - f.minX) / float64(w)
}

// textM is the width in metres of s at size points on the fitted drawing (Liberation Sans
// averages a little over half an em per character).
func (f framed) textM(s string, size float64) float64 {
	return float64(len([]rune(s))) * 0.56 * size * f.mPerPt
}

// extent is the width and height of a ring's bounding box.
func extent(r [][2]float64) (w, h float64) {
	if len(r) == 0 {
		return 0, 0
	}
	x0, x1, y0, y1 := r[0][0], r[0][0], r[0][1], r[0][1]
	for _, q := range r {
		x0, x1 = math.Min(x0, q[0]), math.Max(x1, q[0])
		y0, y1 = math.Min(y0, q[1]), math.Max(y1, q[1])
	}
	return x1 - x0, y1 - y0
}

// frameOf takes the faces and modules, then every block and tree crown within reach of
// them (reachM; 0: only those standing on the roof's own extent), so that what casts shade
// on the roof is drawn whole.
func frameOf(pl *Plan, reach float64) framed {
	f := framed{minX: math.Inf(1), minY: math.Inf(1), maxX: math.Inf(-1), maxY: math.Inf(-1)}
	grow := func(x, y float64) {
		f.minX, f.maxX = math.Min(f.minX, x), math.Max(f.maxX, x)
		f.minY, f.maxY = math.Min(f.minY, y), math.Max(f.maxY, y)
	}
	for _, fc := range pl.Faces {
		for _, q := range fc.Ring {
			grow(q[0], q[1])
		}
	}
	for _, m := range pl.Modules {
		for _, q := range m.Corners {
			grow(q[0], q[1])
		}
	}
	if math.IsInf(f.minX, 0) {
		return framed{minX: 0, maxX: 1, minY: 0, maxY: 1}
	}
	roof := f
	dist := func(x, y float64) float64 {
		dx := math.Max(0, math.Max(roof.minX-x, x-roof.maxX))
		dy := math.Max(0, math.Max(roof.minY-y, y-roof.maxY))
		return math.Hypot(dx, dy)
	}
	for _, b := range pl.Blocks {
		near := false
		for _, q := range b.Ring {
			near = near || dist(q[0], q[1]) <= reach
		}
		if reach == 0 {
			// On the roof only: every corner within its extent.
			for _, q := range b.Ring {
				near = near && dist(q[0], q[1]) == 0
			}
		}
		if !near {
			f.left = append(f.left, b.ID)
			continue
		}
		for _, q := range b.Ring {
			grow(q[0], q[1])
		}
	}
	for _, t := range pl.Trees {
		if d := dist(t.X, t.Y); (reach > 0 && d-t.CrownRadiusM > reach) || (reach == 0 && (d > 0 || t.CrownRadiusM > 0)) {
			f.left = append(f.left, t.ID)
			continue
		}
		grow(t.X-t.CrownRadiusM, t.Y-t.CrownRadiusM)
		grow(t.X+t.CrownRadiusM, t.Y+t.CrownRadiusM)
	}
	return f
}

// ringCentre is the mean of a closed ring's vertices (the closing one counted once).
func ringCentre(r [][2]float64) (x, y float64) {
	n := len(r)
	if n > 1 && r[0] == r[n-1] {
		n--
	}
	if n == 0 {
		return 0, 0
	}
	for _, q := range r[:n] {
		x += q[0] / float64(n)
		y += q[1] / float64(n)
	}
	return x, y
}

// planBase draws the faces, blocks, avoid areas and trees, and returns the frame, fitted
// to a w×h picture (the roof and every obstacle within reach, see frameOf), with the names
// of what it drew for layoutPlan to place.
func planBase(pl *Plan, p *plot.Plot, w, h vg.Length, reach float64) (framed, []planName) {
	f := frameOf(pl, reach)
	f.fit(w, h, legendFrac)
	skip := map[string]bool{}
	for _, id := range f.left {
		skip[id] = true
	}
	var names []planName
	for _, t := range pl.Trees {
		if skip[t.ID] {
			continue
		}
		addPolygon(p, circleXYs(t.X, t.Y, t.CrownRadiusM), treeFill, blockFill, vg.Points(0.6))
		trunk := math.Min(0.25, t.CrownRadiusM/4)
		addPolygon(p, circleXYs(t.X, t.Y, trunk), blockFill, nil, 0)
		r := t.CrownRadiusM
		names = append(names, planName{kind: treeName, id: t.ID, text: Printable(t.ID), size: 6.5,
			x0: t.X - r, y0: t.Y - r, x1: t.X + r, y1: t.Y + r, tx: t.X, ty: t.Y, trunk: trunk})
	}
	for _, fc := range pl.Faces {
		addPolygon(p, ringXYs(fc.Ring), faceFill, Ink, vg.Points(0.8))
	}
	box := func(n planName, r [][2]float64) planName {
		n.x0, n.y0, n.x1, n.y1 = r[0][0], r[0][1], r[0][0], r[0][1]
		for _, q := range r {
			n.x0, n.x1 = math.Min(n.x0, q[0]), math.Max(n.x1, q[0])
			n.y0, n.y1 = math.Min(n.y0, q[1]), math.Max(n.y1, q[1])
		}
		return n
	}
	for i, sp := range faceLabelSpots(pl.Faces) {
		if !sp.skip {
			names = append(names, box(planName{kind: faceName, id: pl.Faces[i].ID, text: "face " + Printable(pl.Faces[i].ID), size: 8, at: sp.at, below: sp.below}, pl.Faces[i].Ring))
		}
	}
	for _, b := range pl.Blocks {
		if skip[b.ID] || len(b.Ring) == 0 {
			continue
		}
		addPolygon(p, ringXYs(b.Ring), blockFill, Ink, vg.Points(0.5))
		names = append(names, box(planName{kind: blockName, id: b.ID, text: Printable(b.ID), size: 6}, b.Ring))
	}
	for _, a := range pl.Avoids {
		if pg := addPolygon(p, ringXYs(a.Ring), white, Ink, vg.Points(0.6)); pg != nil {
			pg.LineStyle.Dashes = avoidDashes
		}
		if len(a.Ring) > 0 {
			names = append(names, box(planName{kind: avoidName, id: a.ID, text: Printable(a.ID), size: 5.5}, a.Ring))
		}
	}
	return f, names
}

// labelSpot is where a face's label goes: at a point, above it or (below) under it.
type labelSpot struct {
	at          plotter.XY
	below, skip bool
}

// faceLabelSpots places the label of every face (see faceLabels).
func faceLabelSpots(faces []Shape) []labelSpot {
	out := make([]labelSpot, len(faces))
	for i, fc := range faces {
		if len(fc.Ring) == 0 {
			out[i].skip = true
			continue
		}
		top, bottom := edgeMiddle(fc.Ring, 1), edgeMiddle(fc.Ring, -1)
		if onOtherFace(faces, i, top[0], top[1]+labelProbeM) && !onOtherFace(faces, i, bottom[0], bottom[1]-labelProbeM) {
			out[i] = labelSpot{at: plotter.XY{X: bottom[0], Y: bottom[1]}, below: true}
			continue
		}
		out[i] = labelSpot{at: plotter.XY{X: top[0], Y: top[1]}}
	}
	return out
}

// labelProbeM is how far beyond a face's edge faceLabels looks for another face, m; edges
// within it of the extreme count as that edge (a traced outline is never exactly level).
const labelProbeM = 0.1

// edgeMiddle returns the middle of a ring's highest (dir 1) or lowest (dir -1) edge on the
// drawing: the midpoint of the points within labelProbeM of that extreme, at the extreme.
func edgeMiddle(ring [][2]float64, dir float64) [2]float64 {
	ext := ring[0][1] * dir
	for _, q := range ring {
		ext = math.Max(ext, q[1]*dir)
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, q := range ring {
		if q[1]*dir >= ext-labelProbeM {
			lo, hi = math.Min(lo, q[0]), math.Max(hi, q[0])
		}
	}
	return [2]float64{(lo + hi) / 2, ext * dir}
}

// onOtherFace reports whether (x, y) lies inside a face other than faces[self] (even-odd
// ray casting).
func onOtherFace(faces []Shape, self int, x, y float64) bool {
	for i, fc := range faces {
		if i == self {
			continue
		}
		in := false
		for k, n := 0, len(fc.Ring); k < n; k++ {
			a, b := fc.Ring[k], fc.Ring[(k+1)%n]
			if (a[1] > y) != (b[1] > y) && x < a[0]+(y-a[1])*(b[0]-a[0])/(b[1]-a[1]) {
				in = !in
			}
		}
		if in {
			return true
		}
	}
	return false
}

// Outlines: an avoid area dotted, a module left unconnected dashed.
var (
	avoidDashes       = []vg.Length{vg.Points(0.8), vg.Points(1.6)}
	unconnectedDashes = []vg.Length{vg.Points(2.5), vg.Points(1.5)}
)

// swatch is a legend entry's filled square, outlined with dashes when they are given.
func swatch(fill, line color.Color, dashes []vg.Length) *plotter.Polygon {
	sw, _ := plotter.NewPolygon(plotter.XYs{{}, {X: 1}, {X: 1, Y: 1}})
	sw.Color = fill
	sw.LineStyle.Width = 0
	if line != nil {
		sw.LineStyle.Color, sw.LineStyle.Width = line, vg.Points(0.8)
		sw.LineStyle.Dashes = dashes
	}
	return sw
}

// obstacleLegend adds the legend entries of what planBase drew.
func obstacleLegend(pl *Plan, p *plot.Plot, f framed, unconnected bool) {
	if unconnected {
		p.Legend.Add("placed, not connected", swatch(white, Ink, unconnectedDashes))
	}
	left := map[string]bool{}
	for _, id := range f.left {
		left[id] = true
	}
	drawn := func(ids []string) bool {
		for _, id := range ids {
			if !left[id] {
				return true
			}
		}
		return false
	}
	var blocks, trees []string
	for _, b := range pl.Blocks {
		blocks = append(blocks, b.ID)
	}
	for _, t := range pl.Trees {
		trees = append(trees, t.ID)
	}
	if drawn(blocks) {
		p.Legend.Add("chimney, dormer, building", swatch(blockFill, nil, nil))
	}
	if drawn(trees) {
		p.Legend.Add("tree crown", swatch(treeFill, nil, nil))
	}
	if len(pl.Avoids) > 0 {
		p.Legend.Add("kept free of modules", swatch(white, Ink, avoidDashes))
	}
}

// connected reports, per module, whether a string of the plan holds it; all modules when
// the plan has no strings.
func connected(pl *Plan) []bool {
	in := make([]bool, len(pl.Modules))
	if len(pl.Strings) == 0 {
		for i := range in {
			in[i] = true
		}
		return in
	}
	for _, s := range pl.Strings {
		for _, i := range s {
			if i >= 0 && i < len(in) {
				in[i] = true
			}
		}
	}
	return in
}

// legendFrac is the share of the plan pictures' width kept for the legend.
const legendFrac = 0.3

// planFrame sets the fitted frame on the plot (equal scales on both axes) and draws the
// north arrow and the scale bar; it returns their texts and, as data boxes (x0, y0, x1, y1),
// the bar and the arrow, which the names keep clear of.
func planFrame(p *plot.Plot, f framed) ([]*plotter.Labels, [][4]float64) {
	p.HideAxes()
	p.BackgroundColor = white
	minX, maxX, minY, maxY := f.minX, f.maxX, f.minY, f.maxY
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = minX, maxX, minY, maxY
	dx, dy := maxX-minX, maxY-minY

	// Scale bar: a round length near a fifth of the drawing's width.
	L := niceLength(0.2 * (1 - legendFrac) * dx)
	x0, y0 := minX+0.03*dx, minY+0.05*dy
	bar, _ := plotter.NewLine(plotter.XYs{{X: x0, Y: y0 + 0.012*dy}, {X: x0, Y: y0}, {X: x0 + L, Y: y0}, {X: x0 + L, Y: y0 + 0.012*dy}})
	bar.LineStyle.Width, bar.LineStyle.Color = vg.Points(1.2), Ink
	p.Add(bar)
	lab := fmt.Sprintf("%g m", L)
	scale := addLabels(p, plotter.XYs{{X: x0 + L/2, Y: y0 + 0.02*dy}}, []string{lab}, 8, Ink, text.XCenter, text.YBottom)

	// North arrow, bottom right: the local frame's +y is true north.
	ax, ay := maxX-0.05*dx, minY+0.04*dy
	al := 0.09 * dy
	head := plotter.XYs{{X: ax, Y: ay + al}, {X: ax - 0.012*dx, Y: ay + al - 0.04*dy}, {X: ax + 0.012*dx, Y: ay + al - 0.04*dy}}
	addPolygon(p, head, Ink, nil, 0)
	shaft, _ := plotter.NewLine(plotter.XYs{{X: ax, Y: ay}, {X: ax, Y: ay + al - 0.03*dy}})
	shaft.LineStyle.Width, shaft.LineStyle.Color = vg.Points(1.2), Ink
	p.Add(shaft)
	north := addLabels(p, plotter.XYs{{X: ax - 0.02*dx, Y: ay + al/2}}, []string{"N"}, 9, Ink, text.XRight, text.YCenter)
	marks := [][4]float64{{x0, y0, x0 + L, y0 + 0.012*dy}, {ax - 0.012*dx, ay, ax + 0.012*dx, ay + al}}
	return []*plotter.Labels{scale, north}, marks
}

// niceLength returns the largest of 1, 2, 5 × 10ⁿ metres not above x.
func niceLength(x float64) float64 {
	if x <= 0 {
		return 1
	}
	e := math.Pow(10, math.Floor(math.Log10(x)))
	for _, m := range []float64{5, 2, 1} {
		if m*e <= x {
			return m * e
		}
	}
	return e
}

func addLabels(p *plot.Plot, xy plotter.XYs, ls []string, size float64, c color.Color, xa text.XAlignment, ya text.YAlignment) *plotter.Labels {
	l := labelsOf(xy, ls, size, c, xa, ya)
	if l != nil {
		p.Add(l)
	}
	return l
}

// labelsOf is the labels addLabels adds, nil when there are none to draw.
func labelsOf(xy plotter.XYs, ls []string, size float64, c color.Color, xa text.XAlignment, ya text.YAlignment) *plotter.Labels {
	l, err := plotter.NewLabels(plotter.XYLabels{XYs: xy, Labels: ls})
	if err != nil {
		return nil
	}
	for i := range l.TextStyle {
		l.TextStyle[i].Font.Size = vg.Points(size)
		l.TextStyle[i].Font.Variant = sans
		l.TextStyle[i].Color = c
		l.TextStyle[i].XAlign = xa
		l.TextStyle[i].YAlign = ya
	}
	return l
}

// sans is the font variant of every chart: Liberation Sans, the proposal's own type.
const sans = "Sans"

// styleTitle sets the house type on a plot: the title, axis labels, ticks and legend.
// WiringCaution goes on every chart that shows strings: a layout is a plan, not a design.
const WiringCaution = "Estimate only: local codes and a licensed installer decide the wiring."

func styleTitle(p *plot.Plot, title string) {
	p.Title.Text = title
	p.Title.TextStyle.Color = Ink
	p.Title.TextStyle.Font.Size = vg.Points(12)
	p.Title.Padding = vg.Points(6)
	p.Title.TextStyle.Font.Variant = sans
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		a.Label.TextStyle.Font.Variant = sans
		a.Tick.Label.Font.Variant = sans
	}
	p.Legend.TextStyle.Font.Variant = sans
	p.Legend.TextStyle.Font.Size = vg.Points(8)
	p.Legend.TextStyle.Color = Ink
}

// leftOut is the chart's note on obstacles too far away to draw.
func leftOut(f framed) string {
	if len(f.left) == 0 {
		return ""
	}
	ids := make([]string, len(f.left))
	for i, id := range f.left {
		ids[i] = Printable(id)
	}
	return fmt.Sprintf("\nNot drawn, farther than %g m from the roof: %s", reachM, strings.Join(ids, ", "))
}

// PlanChart draws the roof from above with each module coloured by the sunlight it gets in
// a year (SunBins classes of the roof's best), labelled with its row.column and the share
// of its light lost to shade; each face's id, the blocks, trees and avoid areas with their
// ids; a north arrow and a scale bar, for a w×h picture (the scales of both axes are equal
// only at that size). Unconnected modules are outlined, not filled. The names go where
// they fit, drawn last over a light box; an object whose name finds no room is numbered,
// and the legend names the numbers (see layoutPlan).
func PlanChart(pl *Plan, w, h vg.Length) *plot.Plot {
	p, _ := planChart(pl, w, h)
	return p
}

// planChart is PlanChart, with where its names and numbers went.
func planChart(pl *Plan, w, h vg.Length) (*plot.Plot, planLayout) {
	p := plot.New()
	f, names := planBase(pl, p, w, h, reachM)
	ref := 0.0
	for _, m := range pl.Modules {
		ref = math.Max(ref, m.UnshadedKWhM2)
	}
	on := connected(pl)
	used := make([]bool, len(sunColours))
	var xy plotter.XYs
	var ls []string
	var lc []color.Color
	unconnected := false
	for i, m := range pl.Modules {
		k := 0
		if ref > 0 {
			k = SunClass(100 * m.SunKWhM2 / ref)
		}
		lab := Printable(m.Label()) + "\n" + Thousands(m.ShadeLossPct, 0) + "%"
		if !on[i] {
			unconnected = true
			if pg := addPolygon(p, ringXYs(m.Corners[:]), white, Ink, vg.Points(0.7)); pg != nil {
				pg.LineStyle.Dashes = unconnectedDashes
			}
			lc = append(lc, Ink)
		} else {
			used[k] = true
			addPolygon(p, ringXYs(m.Corners[:]), sunColours[k], white, vg.Points(0.6))
			if k <= 1 {
				lc = append(lc, white)
			} else {
				lc = append(lc, Ink)
			}
		}
		x, y := centre(m.Corners)
		xy = append(xy, plotter.XY{X: x, Y: y})
		ls = append(ls, lab)
	}
	var fixed []*plotter.Labels
	size, lines := moduleLabelSize(pl, f)
	if len(xy) > 0 && lines > 0 {
		if lines == 1 {
			for i, m := range pl.Modules {
				ls[i] = Printable(m.Label())
			}
		}
		l, err := plotter.NewLabels(plotter.XYLabels{XYs: xy, Labels: ls})
		if err == nil {
			for i := range l.TextStyle {
				l.TextStyle[i].Font.Size = vg.Points(size)
				l.TextStyle[i].Font.Variant = sans
				l.TextStyle[i].Color = lc[i]
				l.TextStyle[i].XAlign, l.TextStyle[i].YAlign = text.XCenter, text.YCenter
			}
			p.Add(l)
			fixed = append(fixed, l)
		}
	}
	p.Legend.Top = true
	if ref > 0 {
		p.Legend.Add(sunHeading)
	}
	for k, label := range sunLegend(used, ref) {
		p.Legend.Add(label, swatch(sunColours[k], nil, nil))
	}
	obstacleLegend(pl, p, f, unconnected)
	frame, marks := planFrame(p, f)
	fixed = append(fixed, frame...)

	grid := len(xy) > 0 && lines == 0
	title := func(lay planLayout, keyLine bool) string {
		t := "Roof plan: sunlight on each module in a year\n"
		if grid {
			t += gridNote(lay)
		} else {
			t += "labels: row.column of the face, and the share of its light lost to shade"
		}
		if keyLine {
			t += "\n" + keyNote
		}
		return t + leftOut(f)
	}
	return p, finishPlan(p, w, h, pl, names, fixed, marks, grid, title)
}

// finishPlan lays out a plan's names and numbers (layoutPlan), titles it and adds them
// and the key of numbered objects. title gives the title for a layout, with the line on
// numbered objects when keyLine.
func finishPlan(p *plot.Plot, w, h vg.Length, pl *Plan, names []planName, fixed []*plotter.Labels, marks [][4]float64, grid bool, title func(lay planLayout, keyLine bool) string) planLayout {
	// The title's lines take from the drawing's height: lay out with the lines it will have.
	styleTitle(p, title(planLayout{}, false))
	lay := layoutPlan(p, w, h, pl, names, fixed, marks, grid)
	keyLine := len(lay.keyed) > 0
	if keyLine {
		// The line stays even if the smaller drawing happens to fit every name: it still
		// says how names are shown.
		p.Title.Text = title(planLayout{}, true)
		lay = layoutPlan(p, w, h, pl, names, fixed, marks, grid)
	}
	p.Title.Text = title(lay, keyLine)
	p.Add(&planTexts{texts: lay.texts})
	addKey(p, lay.keyed, w, h)
	return lay
}

// keyNote is the plan's subtitle line when some objects are numbered.
const keyNote = "objects named where the names fit, else numbered as in the legend"

// gridNote is the plan's subtitle line on its row and column numbers.
func gridNote(lay planLayout) string {
	switch {
	case lay.rowsThinned && lay.colsThinned:
		return "rows beside each face and columns below it: every 5th, first and last"
	case lay.colsThinned:
		return "rows numbered beside each face, columns below it: every 5th, first and last"
	case lay.rowsThinned:
		return "columns numbered below each face, rows beside it: every 5th, first and last"
	}
	return "rows numbered beside each face, columns below it"
}

// planPictureW and planPictureH are the size of the plan and strings pictures in the
// documents and the PNGs.
const (
	planPictureW = 16 * vg.Centimeter
	planPictureH = 13 * vg.Centimeter
)

// modulesLabelled reports whether the plan chart of a w×h picture writes each module's
// row.column on it (else it numbers the rows and columns beside the faces).
func modulesLabelled(pl *Plan, w, h vg.Length) bool {
	f := frameOf(pl, reachM)
	f.fit(w, h, legendFrac)
	_, lines := moduleLabelSize(pl, f)
	return lines > 0
}

// moduleLabelSize picks the largest type, 6 pt down to 4 pt, at which the plan's module
// labels fit their modules: two lines (id and shade) when they fit, else the id alone
// (lines 1), else none (lines 0).
func moduleLabelSize(pl *Plan, f framed) (size float64, lines int) {
	if len(pl.Modules) == 0 || f.mPerPt <= 0 {
		return 0, 0
	}
	a, b := moduleSides(pl)
	w, h := 0.9*a, 0.9*b
	longest := func(two bool) string {
		s := ""
		for _, m := range pl.Modules {
			for _, t := range []string{m.Label(), Thousands(m.ShadeLossPct, 0) + "%"} {
				if len([]rune(t)) > len([]rune(s)) {
					s = t
				}
				if !two {
					break
				}
			}
		}
		return s
	}
	for _, n := range []int{2, 1} {
		t := longest(n == 2)
		for sz := 6.0; sz >= 4; sz -= 0.5 {
			if f.textM(t, sz) <= w && float64(n)*1.15*sz*f.mPerPt <= h {
				return sz, n
			}
		}
	}
	return 0, 0
}

// StringsChart draws the chosen layout on the roof: each string's modules in the string's
// colour (StringColours), a line through them in wiring order and each module's position
// along the string, the faces' ids and module ids, for a w×h picture. It is framed on the
// roof; only obstacles standing on it are drawn.
func StringsChart(pl *Plan, w, h vg.Length) *plot.Plot {
	p, _ := stringsChart(pl, w, h)
	return p
}

// stringsChart is StringsChart, with where its names and numbers went.
func stringsChart(pl *Plan, w, h vg.Length) (*plot.Plot, planLayout) {
	p := plot.New()
	f, names := planBase(pl, p, w, h, 0)
	// The wiring is on the roof: the drawing keeps to it (the plan shows what stands around).
	styleTitle(p, "")
	// The wiring mark sits in each module's lower half and its id in the upper half, both
	// sized to the module as drawn.
	short, long := moduleSides(pl)
	off := func(m PlanModule) float64 {
		lo, hi := m.Corners[0][1], m.Corners[0][1]
		for _, q := range m.Corners {
			lo, hi = math.Min(lo, q[1]), math.Max(hi, q[1])
		}
		return 0.22 * math.Min(long, hi-lo)
	}
	radius := vg.Points(5)
	if f.mPerPt > 0 {
		radius = vg.Points(math.Max(2.5, math.Min(5, 0.3*short/f.mPerPt)))
	}
	on := connected(pl)
	unconnected := false
	var wiring []*plotter.Labels // the positions along the strings, kept clear of
	var ix plotter.XYs
	var il []string
	for i, m := range pl.Modules {
		if !on[i] {
			unconnected = true
			if pg := addPolygon(p, ringXYs(m.Corners[:]), white, Ink, vg.Points(0.7)); pg != nil {
				pg.LineStyle.Dashes = unconnectedDashes
			}
		}
		x, y := centre(m.Corners)
		ix = append(ix, plotter.XY{X: x, Y: y + off(m)})
		il = append(il, Printable(m.Label()))
	}
	p.Legend.Top = true
	for k, s := range pl.Strings {
		c := StringColours[k%len(StringColours)]
		var path plotter.XYs
		var nums []string
		for n, i := range s {
			if i < 0 || i >= len(pl.Modules) {
				continue
			}
			m := pl.Modules[i]
			addPolygon(p, ringXYs(m.Corners[:]), tint(c, 0.6), white, vg.Points(0.6))
			x, y := centre(m.Corners)
			path = append(path, plotter.XY{X: x, Y: y - off(m)})
			nums = append(nums, fmt.Sprint(n+1))
		}
		if len(path) == 0 {
			continue
		}
		ln, _ := plotter.NewLine(path)
		ln.LineStyle.Color, ln.LineStyle.Width = c, vg.Points(1.4)
		p.Add(ln)
		dots, _ := plotter.NewScatter(path)
		dots.GlyphStyle.Shape = draw.CircleGlyph{}
		dots.GlyphStyle.Color = c
		dots.GlyphStyle.Radius = radius
		p.Add(dots)
		if l := addLabels(p, path, nums, math.Min(6, 1.15*float64(radius)), white, text.XCenter, text.YCenter); l != nil {
			wiring = append(wiring, l)
		}
		name := fmt.Sprintf("string %d: %s", k+1, Count(len(path), "module", "modules"))
		if k < len(pl.Inputs) {
			inv := 1
			if k < len(pl.InverterOf) {
				inv = pl.InverterOf[k]
			}
			name = fmt.Sprintf("string %d, %s: %s", k+1, InputLabel(pl.Inverters, inv, pl.Inputs[k]), Count(len(path), "module", "modules"))
			if pl.Inverters > 1 {
				// "inverter 2, input 6" makes the legend wider than the room kept for it:
				// inputs are written inverter.input, as the legend's first line says.
				name = fmt.Sprintf("string %d, input %d.%d: %s", k+1, inv, pl.Inputs[k], Count(len(path), "module", "modules"))
			}
		}
		if k == 0 && pl.Inverters > 1 {
			p.Legend.Add("input: inverter.input")
		}
		p.Legend.Add(name, ln)
	}
	var fixed []*plotter.Labels
	size, lines := moduleLabelSize(pl, f)
	if lines > 0 {
		if l := addLabels(p, ix, il, math.Min(size, 5), Ink, text.XCenter, text.YCenter); l != nil {
			fixed = append(fixed, l)
		}
	}
	fixed = append(fixed, wiring...)
	obstacleLegend(pl, p, f, unconnected)
	frame, marks := planFrame(p, f)
	fixed = append(fixed, frame...)
	grid := lines == 0 && len(pl.Modules) > 0
	title := func(lay planLayout, keyLine bool) string {
		t := "Strings of the chosen layout, in wiring order\n" + WiringCaution
		if grid {
			t += "\n" + gridNote(lay)
		}
		if keyLine {
			t += "\n" + keyNote
		}
		return t
	}
	return p, finishPlan(p, w, h, pl, names, fixed, marks, grid, title)
}

// moduleSides returns the first module's short and long side, metres.
func moduleSides(pl *Plan) (short, long float64) {
	if len(pl.Modules) == 0 {
		return 1, 1.7
	}
	m := pl.Modules[0]
	a := math.Hypot(m.Corners[1][0]-m.Corners[0][0], m.Corners[1][1]-m.Corners[0][1])
	b := math.Hypot(m.Corners[2][0]-m.Corners[1][0], m.Corners[2][1]-m.Corners[1][1])
	return math.Min(a, b), math.Max(a, b)
}
