package report

import (
	"fmt"
	"image/color"
	"math"

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
	// Inputs is the inverter input (1-based) of each string; may be nil.
	Inputs []int
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

// PlanModule is one module's outline seen from above and its annual shade loss.
type PlanModule struct {
	ID           string
	Corners      [4][2]float64
	ShadeLossPct float64
}

// ShadeBins are the upper bounds (%, exclusive) of the shade-loss classes of the plan chart;
// the last class is open. Classes, not a continuous scale, so that a reader can match a
// module to the legend at a glance.
var ShadeBins = []float64{2, 5, 10, 20}

// shadeColours runs from a pale tint of the accent (little loss) to a dark shade of it (much
// loss): darker reads as "more shade" in print and in grey.
var shadeColours = []color.RGBA{
	{R: 0xe4, G: 0xf1, B: 0xf2, A: 0xff},
	{R: 0xa9, G: 0xd3, B: 0xd8, A: 0xff},
	{R: 0x5f, G: 0xa3, B: 0xac, A: 0xff},
	{R: 0x1b, G: 0x6f, B: 0x7a, A: 0xff},
	{R: 0x0b, G: 0x33, B: 0x39, A: 0xff},
}

// ShadeClass returns the index of the shade-loss class of pct in ShadeBins.
func ShadeClass(pct float64) int {
	for i, b := range ShadeBins {
		if pct < b {
			return i
		}
	}
	return len(ShadeBins)
}

func shadeClassLabel(i int) string {
	switch {
	case i == 0:
		return fmt.Sprintf("below %g %%", ShadeBins[0])
	case i == len(ShadeBins):
		return fmt.Sprintf("%g %% or more", ShadeBins[i-1])
	default:
		return fmt.Sprintf("%g to %g %%", ShadeBins[i-1], ShadeBins[i])
	}
}

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

// planBase draws the faces, blocks, avoid areas and trees, and returns the extents of the
// faces and modules: the drawing is framed on the roof, and a tree or a neighbour's house
// farther away is cut at the frame (the sun-path chart shows those).
func planBase(pl *Plan, p *plot.Plot) (minX, maxX, minY, maxY float64) {
	minX, minY = math.Inf(1), math.Inf(1)
	maxX, maxY = math.Inf(-1), math.Inf(-1)
	grow := func(x, y float64) {
		minX, maxX = math.Min(minX, x), math.Max(maxX, x)
		minY, maxY = math.Min(minY, y), math.Max(maxY, y)
	}
	for _, t := range pl.Trees {
		addPolygon(p, circleXYs(t.X, t.Y, t.CrownRadiusM), treeFill, blockFill, vg.Points(0.6))
		addPolygon(p, circleXYs(t.X, t.Y, math.Min(0.25, t.CrownRadiusM/4)), blockFill, nil, 0)
	}
	for _, f := range pl.Faces {
		addPolygon(p, ringXYs(f.Ring), faceFill, Ink, vg.Points(0.8))
		for _, q := range f.Ring {
			grow(q[0], q[1])
		}
	}
	for _, b := range pl.Blocks {
		addPolygon(p, ringXYs(b.Ring), blockFill, Ink, vg.Points(0.5))
	}
	for _, a := range pl.Avoids {
		if pg := addPolygon(p, ringXYs(a.Ring), white, Ink, vg.Points(0.6)); pg != nil {
			pg.LineStyle.Dashes = []vg.Length{vg.Points(2), vg.Points(2)}
		}
	}
	for _, m := range pl.Modules {
		for _, q := range m.Corners {
			grow(q[0], q[1])
		}
	}
	if math.IsInf(minX, 0) {
		return 0, 1, 0, 1
	}
	return minX, maxX, minY, maxY
}

// planFrame sets equal scales on both axes for a w×h picture, leaves room on the right for
// the legend (legendFrac of the width) and under the drawing for the scale bar, and draws
// the north arrow and the scale bar.
func planFrame(p *plot.Plot, minX, maxX, minY, maxY float64, w, h vg.Length, legendFrac float64) {
	p.HideAxes()
	p.BackgroundColor = white
	dx, dy := math.Max(maxX-minX, 1), math.Max(maxY-minY, 1)
	pad := 0.06 * math.Max(dx, dy)
	minX, maxX, minY, maxY = minX-pad, maxX+pad, minY-pad-0.12*dy, maxY+pad
	dx = (maxX - minX) / (1 - legendFrac)
	maxX = minX + dx
	dy = maxY - minY
	// The plot area is the picture less the title (about two lines of 12 pt).
	ratio := float64(w) / float64(h-vg.Points(34))
	if dx/dy > ratio {
		extra := dx/ratio - dy
		minY -= extra / 2
		maxY += extra / 2
	} else {
		extra := dy*ratio - dx
		maxX += extra
	}
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = minX, maxX, minY, maxY
	dx, dy = maxX-minX, maxY-minY

	// Scale bar: a round length near a fifth of the drawing's width.
	L := niceLength(0.2 * (1 - legendFrac) * dx)
	x0, y0 := minX+0.03*dx, minY+0.05*dy
	bar, _ := plotter.NewLine(plotter.XYs{{X: x0, Y: y0 + 0.012*dy}, {X: x0, Y: y0}, {X: x0 + L, Y: y0}, {X: x0 + L, Y: y0 + 0.012*dy}})
	bar.LineStyle.Width, bar.LineStyle.Color = vg.Points(1.2), Ink
	p.Add(bar)
	lab := fmt.Sprintf("%g m", L)
	addLabels(p, plotter.XYs{{X: x0 + L/2, Y: y0 + 0.02*dy}}, []string{lab}, 8, Ink, text.XCenter, text.YBottom)

	// North arrow, bottom right: the local frame's +y is true north.
	ax, ay := maxX-0.05*dx, minY+0.04*dy
	al := 0.09 * dy
	head := plotter.XYs{{X: ax, Y: ay + al}, {X: ax - 0.012*dx, Y: ay + al - 0.04*dy}, {X: ax + 0.012*dx, Y: ay + al - 0.04*dy}}
	addPolygon(p, head, Ink, nil, 0)
	shaft, _ := plotter.NewLine(plotter.XYs{{X: ax, Y: ay}, {X: ax, Y: ay + al - 0.03*dy}})
	shaft.LineStyle.Width, shaft.LineStyle.Color = vg.Points(1.2), Ink
	p.Add(shaft)
	addLabels(p, plotter.XYs{{X: ax - 0.02*dx, Y: ay + al/2}}, []string{"N"}, 9, Ink, text.XRight, text.YCenter)
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

func addLabels(p *plot.Plot, xy plotter.XYs, ls []string, size float64, c color.Color, xa text.XAlignment, ya text.YAlignment) {
	l, err := plotter.NewLabels(plotter.XYLabels{XYs: xy, Labels: ls})
	if err != nil {
		return
	}
	for i := range l.TextStyle {
		l.TextStyle[i].Font.Size = vg.Points(size)
		l.TextStyle[i].Font.Variant = sans
		l.TextStyle[i].Color = c
		l.TextStyle[i].XAlign = xa
		l.TextStyle[i].YAlign = ya
	}
	p.Add(l)
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

// PlanChart draws the roof from above with each module coloured by its annual shade loss
// (ShadeBins classes), the blocks, trees and avoid areas, a north arrow and a scale bar, for
// a w×h picture (the scales of both axes are equal only at that size). Modules are labelled
// with their loss when there are few enough to read.
func PlanChart(pl *Plan, w, h vg.Length) *plot.Plot {
	p := plot.New()
	styleTitle(p, "Roof plan: annual shade loss of each module")
	minX, maxX, minY, maxY := planBase(pl, p)
	used := make([]bool, len(shadeColours))
	var xy plotter.XYs
	var ls []string
	var lc []color.Color
	for _, m := range pl.Modules {
		k := ShadeClass(m.ShadeLossPct)
		used[k] = true
		addPolygon(p, ringXYs(m.Corners[:]), shadeColours[k], white, vg.Points(0.6))
		x, y := centre(m.Corners)
		xy = append(xy, plotter.XY{X: x, Y: y})
		ls = append(ls, Thousands(m.ShadeLossPct, 0)+"%")
		if k >= 3 {
			lc = append(lc, white)
		} else {
			lc = append(lc, Ink)
		}
	}
	if len(pl.Modules) <= 80 && len(xy) > 0 {
		l, err := plotter.NewLabels(plotter.XYLabels{XYs: xy, Labels: ls})
		if err == nil {
			for i := range l.TextStyle {
				l.TextStyle[i].Font.Size = vg.Points(6)
				l.TextStyle[i].Font.Variant = sans
				l.TextStyle[i].Color = lc[i]
				l.TextStyle[i].XAlign, l.TextStyle[i].YAlign = text.XCenter, text.YCenter
			}
			p.Add(l)
		}
	}
	p.Legend.Top = true
	for k, c := range shadeColours {
		if !used[k] {
			continue
		}
		sw, _ := plotter.NewPolygon(plotter.XYs{{}, {X: 1}, {X: 1, Y: 1}})
		sw.Color, sw.LineStyle.Width = c, 0
		p.Legend.Add("shade loss "+shadeClassLabel(k), sw)
	}
	if len(pl.Blocks) > 0 {
		sw, _ := plotter.NewPolygon(plotter.XYs{{}, {X: 1}, {X: 1, Y: 1}})
		sw.Color, sw.LineStyle.Width = blockFill, 0
		p.Legend.Add("chimney, wall, building", sw)
	}
	if len(pl.Trees) > 0 {
		sw, _ := plotter.NewPolygon(plotter.XYs{{}, {X: 1}, {X: 1, Y: 1}})
		sw.Color, sw.LineStyle.Width = treeFill, 0
		p.Legend.Add("tree crown", sw)
	}
	planFrame(p, minX, maxX, minY, maxY, w, h, 0.3)
	return p
}

// StringsChart draws the chosen layout: each string's modules in the string's colour
// (StringColours), a line through them in wiring order and each module's position along the
// string, for a w×h picture.
func StringsChart(pl *Plan, w, h vg.Length) *plot.Plot {
	p := plot.New()
	styleTitle(p, "Strings of the chosen layout, in wiring order\n"+WiringCaution)
	minX, maxX, minY, maxY := planBase(pl, p)
	inString := make([]bool, len(pl.Modules))
	for _, s := range pl.Strings {
		for _, i := range s {
			if i >= 0 && i < len(pl.Modules) {
				inString[i] = true
			}
		}
	}
	for i, m := range pl.Modules {
		if !inString[i] {
			addPolygon(p, ringXYs(m.Corners[:]), white, Muted, vg.Points(0.6))
		}
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
			path = append(path, plotter.XY{X: x, Y: y})
			nums = append(nums, fmt.Sprint(n+1))
		}
		if len(path) == 0 {
			continue
		}
		ln, _ := plotter.NewLine(path)
		ln.LineStyle.Color, ln.LineStyle.Width = c, vg.Points(1.6)
		p.Add(ln)
		dots, _ := plotter.NewScatter(path)
		dots.GlyphStyle.Shape = draw.CircleGlyph{}
		dots.GlyphStyle.Color = c
		dots.GlyphStyle.Radius = vg.Points(5)
		p.Add(dots)
		addLabels(p, path, nums, 6, white, text.XCenter, text.YCenter)
		name := fmt.Sprintf("string %d: %d modules", k+1, len(path))
		if k < len(pl.Inputs) {
			name = fmt.Sprintf("string %d, input %d: %d modules", k+1, pl.Inputs[k], len(path))
		}
		p.Legend.Add(name, ln)
	}
	planFrame(p, minX, maxX, minY, maxY, w, h, 0.3)
	return p
}
