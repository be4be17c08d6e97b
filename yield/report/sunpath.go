package report

import (
	"cmp"
	"fmt"
	"image/color"
	"math"
	"slices"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"sunstring/shading"
	"sunstring/shading/sun"
)

// SunPath is the input of the sun-path chart: where the site is, and what stands above the
// horizon as seen from one module.
type SunPath struct {
	Observer sun.Observer
	Zone     *time.Location // for the hour marks; nil means UTC
	Year     int            // the year of the day paths; 0 means 2025
	// Outlines are the obstructions seen from the module (shading.Scene.Silhouette), sampled
	// every AzStepDeg degrees of azimuth from north.
	Outlines  []shading.Outline
	AzStepDeg float64
	// Shaders are what stands between the module and the sun at some step of the year
	// (shading.Scene.Blockers), for the documents' caption; nil when not known (the caption
	// then names what rises above the horizon, the roof faces left out, since the module's own
	// face rises behind it).
	Shaders []shading.Blocker
	// Module names the module the outlines are seen from, ShadeLossPct its annual loss
	// (negative: not known, left out of the title).
	Module       string
	ShadeLossPct float64
}

var (
	obstacleFill = map[string]color.RGBA{
		"face":    {R: 0xb8, G: 0xbe, B: 0xc2, A: 0xff},
		"block":   {R: 0x8d, G: 0x94, B: 0x99, A: 0xff},
		"tree":    {R: 0xd5, G: 0xd9, B: 0xdb, A: 0xff},
		"horizon": {R: 0x5e, G: 0x66, B: 0x6b, A: 0xff},
	}
	obstacleName = map[string]string{"face": "roof", "block": "chimney, dormer, building", "tree": "tree", "horizon": "far horizon"}
	// obstacleOrder is the order the chart draws (and its legend lists) the kinds in, and the
	// documents' caption names them in.
	obstacleOrder = []string{"horizon", "face", "block", "tree"}
)

// standardOffset returns the zone's offset from UTC in its winter (standard) time: hour
// marks in standard time keep the hour lines smooth across a daylight-saving change.
func standardOffset(z *time.Location, year int, south bool) time.Duration {
	m := time.January
	if south {
		m = time.July
	}
	_, off := time.Date(year, m, 15, 12, 0, 0, 0, z).Zone()
	return time.Duration(off) * time.Second
}

// azX maps an azimuth to the chart's x: 0–360 centred on south for sites north of the
// equator, −180–180 centred on north south of it, so the day paths never break.
func azX(az float64, south bool) float64 {
	if south {
		return math.Mod(az+540, 360) - 180
	}
	return math.Mod(az+360, 360)
}

// SunPathChart draws the sun's elevation against its azimuth on the 21st of December to June
// (the other months retrace these), hour lines in local standard time, and the obstructions
// seen from the module filled below their upper edge: where a day path runs through a grey
// area, that module is in shade at that time of year.
func SunPathChart(in *SunPath) *plot.Plot {
	p := plot.New()
	title := "Sun path and obstructions"
	switch {
	case in.Module != "" && in.ShadeLossPct >= 0:
		title = fmt.Sprintf("Sun path and obstructions seen from module %s\n%s of its light lost to shade", Printable(in.Module), Pct(in.ShadeLossPct))
	case in.Module != "":
		title += " seen from module " + Printable(in.Module)
	}
	styleTitle(p, title)
	// The grid goes first so that everything else is drawn over it.
	grid := plotter.NewGrid()
	grid.Vertical.Color, grid.Horizontal.Color = faceFill, faceFill
	p.Add(grid)
	z := in.Zone
	if z == nil {
		z = time.UTC
	}
	year := in.Year
	if year == 0 {
		year = 2025
	}
	south := in.Observer.LatDeg < 0
	off := standardOffset(z, year, south)
	std := time.FixedZone("", int(off/time.Second))

	// Obstructions first, so the paths are drawn over them.
	maxEl := 0.0
	seen := map[string]bool{}
	var idXY plotter.XYs
	var idLab []string
	for _, kind := range obstacleOrder {
		for _, o := range in.Outlines {
			if o.Kind != kind || len(o.ElevationDeg) == 0 || in.AzStepDeg <= 0 {
				continue
			}
			n := len(o.ElevationDeg)
			start := 0
			if south {
				start = int(math.Round(180/in.AzStepDeg)) % n
			}
			xy := plotter.XYs{}
			any := false
			for k := 0; k <= n; k++ {
				i := (start + k) % n
				x := float64(k)*in.AzStepDeg + azX(float64(start)*in.AzStepDeg, south)
				e := o.ElevationDeg[i]
				if e > 0 {
					any = true
				}
				maxEl = math.Max(maxEl, e)
				xy = append(xy, plotter.XY{X: x, Y: e})
			}
			if !any {
				continue
			}
			// The obstacle's id at its highest point, so the page can name what shades.
			top := xy[0]
			for _, q := range xy {
				if q.Y > top.Y {
					top = q
				}
			}
			if top.Y >= 1 && o.ID != "" {
				idXY = append(idXY, plotter.XY{X: top.X, Y: top.Y + 0.8})
				idLab = append(idLab, Printable(o.ID))
			}
			xy = append(xy, plotter.XY{X: xy[len(xy)-1].X, Y: 0}, plotter.XY{X: xy[0].X, Y: 0})
			pg := addPolygon(p, xy, obstacleFill[kind], nil, 0)
			if pg != nil && !seen[kind] {
				seen[kind] = true
				p.Legend.Add(obstacleName[kind], pg)
			}
		}
	}

	type mark struct{ x, y float64 }
	hours := map[int][]mark{}
	months := []time.Month{time.December, time.January, time.February, time.March, time.April, time.May, time.June}
	if south {
		months = []time.Month{time.June, time.July, time.August, time.September, time.October, time.November, time.December}
	}
	var noonXY plotter.XYs
	var noonLab []string
	for mi, mo := range months {
		day := time.Date(year, mo, 21, 0, 0, 0, 0, std)
		var seg plotter.XYs
		best := mark{y: -90}
		flush := func() {
			if len(seg) > 1 {
				ln, _ := plotter.NewLine(seg)
				ln.LineStyle.Color = Accent
				ln.LineStyle.Width = vg.Points(1.1)
				if mi == 0 || mi == len(months)-1 {
					ln.LineStyle.Width = vg.Points(1.8)
				}
				p.Add(ln)
				if mi == 0 && !seen["path"] {
					seen["path"] = true
					p.Legend.Add("sun on the 21st of the month", ln)
				}
			}
			seg = nil
		}
		for m := 0; m <= 24*60; m += 5 {
			t := day.Add(time.Duration(m) * time.Minute)
			pos := sun.At(t.UTC(), in.Observer)
			el := pos.Elevation().Degrees()
			if el < 0 {
				flush()
				continue
			}
			x := azX(pos.Azimuth.Degrees(), south)
			// In polar day the path crosses the chart's edge azimuth (north, or south in the
			// southern hemisphere): start a new line there rather than draw across the chart.
			if n := len(seg); n > 0 && math.Abs(x-seg[n-1].X) > 180 {
				flush()
			}
			seg = append(seg, plotter.XY{X: x, Y: el})
			maxEl = math.Max(maxEl, el)
			if el > best.y {
				best = mark{x, el}
			}
			if m%60 == 0 {
				hours[m/60] = append(hours[m/60], mark{x, el})
			}
		}
		flush()
		if best.y > 0 {
			noonXY = append(noonXY, plotter.XY{X: best.x, Y: best.y})
			noonLab = append(noonLab, "21 "+MonthNames[mo-1][:3])
		}
	}
	hourStyle := func(l *plotter.Line) {
		l.LineStyle.Color = AccentSoft
		l.LineStyle.Width = vg.Points(0.7)
		l.LineStyle.Dashes = []vg.Length{vg.Points(2), vg.Points(2)}
	}
	var hx plotter.XYs
	var hl []string
	// Hour 24 is hour 0 of the next day: one label, not two on top of each other.
	for h := 0; h < 24; h++ {
		ms := hours[h]
		if len(ms) == 0 {
			continue
		}
		xy := make(plotter.XYs, len(ms))
		top := ms[0]
		for i, m := range ms {
			xy[i] = plotter.XY{X: m.x, Y: m.y}
			if m.y > top.y {
				top = m
			}
		}
		if len(xy) > 1 {
			ln, _ := plotter.NewLine(xy)
			hourStyle(ln)
			p.Add(ln)
		}
		hx = append(hx, plotter.XY{X: top.x, Y: top.y + 1.5})
		hl = append(hl, fmt.Sprintf("%d h", h))
	}
	hourLab := addLabels(p, hx, hl, 7, Accent, text.XCenter, text.YBottom)
	noonLabs := addLabels(p, noonXY, noonLab, 6.5, Ink, text.XCenter, text.YTop)
	// The obstructions' names, the highest first: where small ones crowd, the tallest keep
	// theirs.
	order := make([]int, len(idLab))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(idXY[b].Y, idXY[a].Y) })
	var oXY plotter.XYs
	var oLab []string
	for _, i := range order {
		oXY, oLab = append(oXY, idXY[i]), append(oLab, idLab[i])
	}
	if ids := labelsOf(oXY, oLab, 7, Ink, text.XCenter, text.YBottom); ids != nil {
		var avoid []*plotter.Labels
		for _, l := range []*plotter.Labels{hourLab, noonLabs} {
			if l != nil {
				avoid = append(avoid, l)
			}
		}
		p.Add(&spacedLabels{Labels: ids, avoid: avoid})
	}

	p.X.Label.Text = fmt.Sprintf("azimuth (degrees from north)   ·   hour lines in local standard time (UTC%s)", utcOffset(off))
	p.Y.Label.Text = "sun elevation (°)"
	p.X.Label.TextStyle.Color, p.Y.Label.TextStyle.Color = Ink, Ink
	var ticks []plot.Tick
	names := []string{"N", "NE", "E", "SE", "S", "SW", "W", "NW", "N"}
	for i := 0; i <= 8; i++ {
		az := float64(i) * 45
		x := az
		if south {
			x = az - 180
			az = math.Mod(az+180, 360)
		}
		ticks = append(ticks, plot.Tick{Value: x, Label: fmt.Sprintf("%s %g°", names[int(az/45)], az)})
	}
	p.X.Tick.Marker = plot.ConstantTicks(ticks)
	if south {
		p.X.Min, p.X.Max = -180, 180
	} else {
		p.X.Min, p.X.Max = 0, 360
	}
	p.Y.Min = 0
	p.Y.Max = math.Min(90, math.Ceil((maxEl+8)/10)*10)
	p.Legend.Top = true
	p.Legend.Left = true
	return p
}

func utcOffset(d time.Duration) string {
	sign := "+"
	if d < 0 {
		sign, d = "−", -d
	}
	h := int(d / time.Hour)
	m := int((d % time.Hour) / time.Minute)
	if m == 0 {
		return fmt.Sprintf("%s%d", sign, h)
	}
	return fmt.Sprintf("%s%d:%02d", sign, h, m)
}

// spacedLabels are labels that keep clear of each other and of other labels: drawn in turn,
// each at its point or, where it would overlap a label drawn before (or one of avoid), one or
// two lines higher, else left out. A chart that names every obstruction in a crowd of small
// ones would print their names over each other; the documents' caption names all that shade.
type spacedLabels struct {
	*plotter.Labels
	avoid []*plotter.Labels
}

// spacedShifts are the heights, in lines of the label's own text, a label is tried at.
var spacedShifts = []float64{0, 1, 2}

// Plot draws the labels that find room, in their order.
func (l *spacedLabels) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	// The chart's top and right edges bound the names; they start at a point inside the
	// chart and run up from it, so the bottom never cuts them, and a name at the left edge
	// may reach over the axis's margin.
	far := vg.Length(math.Inf(1))
	board := labelBoard{bounds: vg.Rectangle{Min: vg.Point{X: -far, Y: -far}, Max: c.Max}}
	for _, o := range l.avoid {
		for i, s := range o.Labels {
			pt := vg.Point{X: trX(o.XYs[i].X), Y: trY(o.XYs[i].Y)}.Add(o.Offset)
			board.hard = append(board.hard, occupied{r: o.TextStyle[i].Rectangle(s).Add(pt)})
		}
	}
	for i, s := range l.Labels.Labels {
		pt := vg.Point{X: trX(l.XYs[i].X), Y: trY(l.XYs[i].Y)}
		if !c.Contains(pt) {
			continue
		}
		sty := l.TextStyle[i]
		box := sty.Rectangle(s)
		at := make([]vg.Point, len(spacedShifts))
		cands := make([]vg.Rectangle, len(spacedShifts))
		for j, k := range spacedShifts {
			at[j] = pt.Add(l.Offset).Add(vg.Point{Y: vg.Length(k) * box.Size().Y})
			cands[j] = box.Add(at[j])
		}
		if j := board.place(cands, 0, true); j >= 0 {
			c.FillText(sty, at[j], s)
		}
	}
}
