package report

import (
	"fmt"
	"image/color"
	"math"
	"strings"

	"golang.org/x/text/width"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// LayoutAdviceChart draws what differs between the ranked layouts: each layout's annual
// energy behind the best (kWh a year) as a horizontal bar on an axis scaled to those
// differences, the equivalence band (EquivalenceMarginPct of the best's energy) shaded
// behind the bars with the equivalent layouts in the accent colour and the chosen one
// marked; and above them the strings of the first three layouts as small plans side by side
// (each string in its colour, unconnected modules outlined), so that a surveyor sees how the
// layouts differ, not only by how much. pl may be nil (no plans drawn).
func LayoutAdviceChart(s *Summary, pl *Plan) *plot.Plot {
	p := plot.New()
	styleTitle(p, "String layouts compared: energy behind the best\n"+WiringCaution)
	ls := s.Layouts
	n := len(ls)
	if n == 0 {
		return p
	}
	best := ls[0].AnnualACkWh
	band := best * s.EquivalenceMarginPct / 100
	maxBehind := band
	for _, l := range ls {
		maxBehind = math.Max(maxBehind, l.BehindBestKWh)
	}
	xMax := math.Max(1.35*maxBehind, 1)
	chosen := ""
	if s.LayoutAdvice != nil {
		chosen = s.LayoutAdvice.Chosen
	}
	// Plans above the bars: rows 0..n-1 hold the bars, the plans take the data range
	// [n-0.4, n-0.4+planRows].
	plans := 0
	if pl != nil && len(pl.Modules) > 0 {
		plans = min(3, n)
	}
	const planRows = 3.0
	if band > 0 {
		addPolygon(p, plotter.XYs{{X: 0, Y: -0.6}, {X: band, Y: -0.6}, {X: band, Y: float64(n) - 0.4}, {X: 0, Y: float64(n) - 0.4}},
			tint(AccentSoft, 0.5), nil, 0)
		addLabels(p, plotter.XYs{{X: band, Y: -0.55}}, []string{fmt.Sprintf(" equivalent: within %s of the best", Pct(s.EquivalenceMarginPct))},
			7, Accent, text.XLeft, text.YBottom)
	}
	names := make([]string, n)
	var lxy plotter.XYs
	var lls []string
	for i, l := range ls {
		y := float64(n - 1 - i)
		name := fmt.Sprintf("%d. %s", i+1, l.Name)
		if l.Name == chosen {
			name = "► " + name
		}
		// A long structural name would take the width the bars need (their axis labels ran
		// together); the technical sheet's table gives every name in full.
		names[n-1-i] = Printable(shorten(name, maxRowName))
		c := color.Color(Muted)
		if l.EquivalentToBest {
			c = Accent
		}
		w := math.Max(l.BehindBestKWh, xMax*0.004) // the best's bar: a hairline at zero
		addPolygon(p, barRect(0, w, y), c, nil, 0)
		lab := "best"
		if i > 0 {
			lab = fmt.Sprintf("%s kWh a year behind (%s)", Thousands(l.BehindBestKWh, 0), Pct(100*l.BehindBestKWh/best))
		}
		if l.Name == chosen {
			lab += ", chosen: easiest to wire"
		}
		lxy = append(lxy, plotter.XY{X: w + 0.01*xMax, Y: y})
		lls = append(lls, lab)
	}
	addLabels(p, lxy, lls, 7, Ink, text.XLeft, text.YCenter)
	if plans > 0 {
		p.Add(smallPlans{pl: pl, ls: ls[:plans], chosen: chosen, names: names, y0: float64(n) - 0.2, y1: float64(n) - 0.2 + planRows})
	}
	p.NominalY(names...)
	p.Y.Tick.Label.Font.Size = vg.Points(8)
	p.X.Label.Text = "kWh a year behind the best layout"
	p.X.Label.TextStyle.Color = Ink
	p.X.Min, p.X.Max = 0, xMax
	p.X.Tick.Marker = thousandsTicks{}
	p.Y.Min = -0.6
	p.Y.Max = float64(n) - 0.4
	if plans > 0 {
		p.Y.Max = float64(n) - 0.2 + planRows
	}
	return p
}

// smallPlans draws layouts' strings as small plans side by side in the data rows [y0, y1]
// across the plot's whole width.
type smallPlans struct {
	pl     *Plan
	ls     []Layout
	chosen string
	names  []string // the bars' labels, whose column the plans may use
	y0, y1 float64
}

// Plot implements plot.Plotter.
func (s smallPlans) Plot(c draw.Canvas, p *plot.Plot) {
	_, trY := p.Transforms(&c)
	bottom, top := trY(s.y0), trY(s.y1)
	// The plans sit across the whole picture, the tick labels' column included, for room.
	left, right := c.Min.X, c.Max.X
	var labelW vg.Length
	for _, n := range s.names {
		labelW = max(labelW, p.Y.Tick.Label.Width(n))
	}
	left = max(left-labelW-vg.Points(8), vg.Points(4))
	if len(s.ls) == 0 || right <= left || top <= bottom {
		return
	}
	idx := make(map[string]int, len(s.pl.Modules))
	minX, minY, maxX, maxY := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for i, m := range s.pl.Modules {
		idx[m.ID] = i
		for _, q := range m.Corners {
			minX, maxX = math.Min(minX, q[0]), math.Max(maxX, q[0])
			minY, maxY = math.Min(minY, q[1]), math.Max(maxY, q[1])
		}
	}
	if !(maxX > minX && maxY > minY) {
		return
	}
	k := len(s.ls)
	gap := vg.Points(8)
	panelW := (right - left - gap*vg.Length(k-1)) / vg.Length(k)
	titleH := vg.Points(18)
	panelH := top - bottom - titleH
	scale := math.Min(float64(panelW)/(maxX-minX), float64(panelH)/(maxY-minY))
	sty := p.Title.TextStyle // the house type (styleTitle)
	sty.Font.Size = vg.Points(7)
	sty.XAlign, sty.YAlign = text.XCenter, text.YBottom
	for j, l := range s.ls {
		x0 := left + vg.Length(j)*(panelW+gap)
		// Centre the drawing in its panel.
		dx := (float64(panelW) - scale*(maxX-minX)) / 2
		dy := (float64(panelH) - scale*(maxY-minY)) / 2
		at := func(q [2]float64) vg.Point {
			return vg.Point{X: x0 + vg.Length(dx+scale*(q[0]-minX)), Y: bottom + vg.Length(dy+scale*(q[1]-minY))}
		}
		fill := make([]color.Color, len(s.pl.Modules))
		for si, str := range l.Strings {
			col := tint(StringColours[si%len(StringColours)], 0.25)
			for _, id := range str {
				if i, ok := idx[id]; ok {
					fill[i] = col
				}
			}
		}
		edge := draw.LineStyle{Color: white, Width: vg.Points(0.4)}
		open := draw.LineStyle{Color: Ink, Width: vg.Points(0.4), Dashes: []vg.Length{vg.Points(1.5), vg.Points(1)}}
		for i, m := range s.pl.Modules {
			pts := make([]vg.Point, 0, 5)
			for _, q := range m.Corners {
				pts = append(pts, at(q))
			}
			if fill[i] != nil {
				c.FillPolygon(fill[i], pts)
				c.StrokeLines(edge, append(pts, pts[0]))
			} else {
				c.StrokeLines(open, append(pts, pts[0]))
			}
		}
		name := fmt.Sprintf("%d. %s", j+1, l.Name)
		if l.Name == s.chosen {
			name = "► " + name + " (chosen)"
		}
		// About half the type size a character: cut the name to its panel.
		fit := max(12, int(float64(panelW)/(0.5*float64(sty.Font.Size))))
		c.FillText(sty, vg.Point{X: x0 + panelW/2, Y: top - titleH + vg.Points(3)}, Printable(shorten(name, fit)))
	}
}

// maxRowName is the longest layout name, in runes, written beside a bar of layouts.png.
const maxRowName = 48

// shorten cuts a name to at most n columns (see columns) with an ellipsis.
func shorten(s string, n int) string {
	total := 0
	for _, r := range s {
		total += columns(r)
	}
	if total <= n {
		return s
	}
	var b strings.Builder
	used := 0
	for _, r := range s {
		if used+columns(r) > n-1 {
			break
		}
		b.WriteRune(r)
		used += columns(r)
	}
	return b.String() + "…"
}

// columns is the width of r in Latin characters: two for a wide one (CJK, most emoji),
// which the fallback typefaces draw a full em wide.
func columns(r rune) int {
	switch width.LookupRune(r).Kind() {
	case width.EastAsianWide, width.EastAsianFullwidth:
		return 2
	}
	return 1
}
