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
)

// StartKWh returns the energy the loss breakdown starts from: the annual AC energy plus every
// loss, that is the modules' irradiation at their STC efficiency.
func StartKWh(acKWh float64, ls []Loss) float64 {
	s := acKWh
	for _, l := range ls {
		s += l.KWh
	}
	return s
}

// LossGroupOrder is the breakdown's groups in the order the energy meets them; steps of a
// group the survey did not name go last, under "other".
var LossGroupOrder = []string{"light reaching the modules", "the modules themselves", "strings and cables", "the inverter", "operation"}

// groupColours give each group of the breakdown its hue: sunlight amber for the light, the
// accent for the modules, then the strings chart's hues.
var groupColours = map[string]color.RGBA{
	"light reaching the modules": {R: 0xc9, G: 0x8a, B: 0x1b, A: 0xff},
	"the modules themselves":     {R: 0x1b, G: 0x6f, B: 0x7a, A: 0xff},
	"strings and cables":         {R: 0x5b, G: 0x5f, B: 0xa8, A: 0xff},
	"the inverter":               {R: 0xa8, G: 0x45, B: 0x3a, A: 0xff},
	"operation":                  {R: 0x7a, G: 0x6a, B: 0x52, A: 0xff},
}

// LossGroup is one group of the breakdown with its steps and their sum.
type LossGroup struct {
	Name  string
	KWh   float64
	Steps []Loss
}

// GroupLosses gathers the steps by group, in LossGroupOrder, keeping each group's steps
// in their order; a step without a known group goes to "other" at the end.
func GroupLosses(ls []Loss) []LossGroup {
	idx := map[string]int{}
	var out []LossGroup
	for _, g := range LossGroupOrder {
		idx[g] = len(out)
		out = append(out, LossGroup{Name: g})
	}
	for _, l := range ls {
		i, ok := idx[l.Group]
		if !ok {
			i, ok = idx["other"]
			if !ok {
				i = len(out)
				idx["other"] = i
				out = append(out, LossGroup{Name: "other"})
			}
		}
		out[i].KWh += l.KWh
		out[i].Steps = append(out[i].Steps, l)
	}
	var kept []LossGroup
	for _, g := range out {
		if len(g.Steps) > 0 {
			kept = append(kept, g)
		}
	}
	return kept
}

// barRect is a horizontal bar from x0 to x1 at row y (rows are one unit apart).
func barRect(x0, x1, y float64) plotter.XYs {
	return lossBar(x0, x1, y, 0.32)
}

// lossBar is a horizontal bar from x0 to x1 at row y, of half height h.
func lossBar(x0, x1, y, h float64) plotter.XYs {
	return plotter.XYs{{X: x0, Y: y - h}, {X: x1, Y: y - h}, {X: x1, Y: y + h}, {X: x0, Y: y + h}}
}

// LossChart draws where the year's energy goes: for each group of the breakdown a heading
// row with the group's whole loss, then its steps, every bar measured from zero so that
// the losses compare directly; the title gives the start and what is delivered. Steps that
// round to 0 kWh are left out of the chart (the tables list them).
func LossChart(acKWh float64, ls []Loss) *plot.Plot {
	p := plot.New()
	start := StartKWh(acKWh, ls)
	share := 0.0
	if start > 0 {
		share = 100 * acKWh / start
	}
	styleTitle(p, fmt.Sprintf("Where the year's energy goes\nfrom %s kWh at the modules' rated efficiency to %s kWh of AC (%s)",
		Thousands(start, 0), Thousands(acKWh, 0), Pct(share)))
	p.Title.TextStyle.Font.Size = vg.Points(11)
	type row struct {
		name string
		kwh  float64
		c    color.Color
		lab  string
		head bool
	}
	var rows []row
	maxKWh := 0.0
	for _, g := range GroupLosses(ls) {
		c, ok := groupColours[g.Name]
		if !ok {
			c = lossGrey
		}
		gp := 0.0
		if start > 0 {
			gp = 100 * g.KWh / start
		}
		rows = append(rows, row{strings.ToUpper(g.Name), g.KWh, c, fmt.Sprintf("%s kWh in all, %s of the start", Thousands(g.KWh, 0), Pct(gp)), true})
		maxKWh = math.Max(maxKWh, g.KWh)
		for _, l := range g.Steps {
			if Thousands(l.KWh, 0) == "0" {
				continue
			}
			rows = append(rows, row{Printable(l.Step), l.KWh, tint(c, 0.45), fmt.Sprintf("%s kWh · %s", Thousands(l.KWh, 0), Pct(l.Pct)), false})
		}
	}
	n := len(rows)
	names := make([]string, n)
	var lxy plotter.XYs
	var lls []string
	for i, r := range rows {
		y := float64(n - 1 - i)
		// Drawn glyphs run a little wider than the axis measures them: leading spaces (the
		// labels are right-aligned) keep long names inside the picture.
		names[n-1-i] = strings.Repeat(" ", len(r.name)/8+1) + r.name
		h := 0.3
		if r.head {
			h = 0.38
		}
		addPolygon(p, lossBar(0, math.Max(r.kwh, 0), y, h), r.c, nil, 0)
		lxy = append(lxy, plotter.XY{X: math.Max(r.kwh, 0) + 0.015*maxKWh, Y: y})
		lls = append(lls, r.lab)
	}
	addLabels(p, lxy, lls, 7, Ink, text.XLeft, text.YCenter)
	if n > 0 {
		p.NominalY(names...)
	}
	p.Y.Tick.Label.Font.Size = vg.Points(7.5)
	p.Y.Tick.Label.Color = Ink
	p.Y.Padding = vg.Points(4)
	p.X.Label.Text = "energy lost a year (kWh); a step's % is of the energy reaching it"
	p.X.Label.TextStyle.Color = Ink
	p.X.Label.TextStyle.Font.Size = vg.Points(8)
	p.X.Min = 0
	p.X.Max = math.Max(maxKWh*1.85, 1) // room for the value labels
	p.X.Tick.Marker = thousandsTicks{}
	p.Y.Min, p.Y.Max = -0.6, math.Max(float64(n)-0.4, 0.4)
	return p
}

// lossGrey marks a step of no known group.
var lossGrey = color.RGBA{R: 0x6b, G: 0x73, B: 0x78, A: 0xff}

// thousandsTicks is the default tick placement with thousands separators in the labels.
type thousandsTicks struct{}

// Ticks returns the default ticks, relabelled.
func (thousandsTicks) Ticks(min, max float64) []plot.Tick {
	ts := plot.DefaultTicks{}.Ticks(min, max)
	for i := range ts {
		if ts[i].Label != "" {
			d := 0
			if math.Abs(max-min) < 10 {
				d = 1
			}
			ts[i].Label = Thousands(ts[i].Value, d)
		}
	}
	return ts
}

// LayoutChart draws the annual AC energy of each ranked layout (best first, at the top) as
// horizontal bars, the best in the accent colour, with each layout's shade loss beside it.
func LayoutChart(ls []Layout) *plot.Plot {
	p := plot.New()
	styleTitle(p, "String layouts compared: annual AC energy\n"+WiringCaution)
	n := len(ls)
	names := make([]string, n)
	var lxy plotter.XYs
	var lls []string
	max := 0.0
	for _, l := range ls {
		max = math.Max(max, l.AnnualACkWh)
	}
	for i, l := range ls {
		y := float64(n - 1 - i)
		names[n-1-i] = fmt.Sprintf("%d. %s", i+1, l.Name)
		c := color.Color(Muted)
		if i == 0 {
			c = Accent
		}
		addPolygon(p, barRect(0, l.AnnualACkWh, y), c, nil, 0)
		lxy = append(lxy, plotter.XY{X: l.AnnualACkWh + 0.01*max, Y: y})
		lab := fmt.Sprintf("%s kWh, shade loss %s", Thousands(l.AnnualACkWh, 0), Pct(l.ShadeLossPct))
		if i > 0 {
			lab = fmt.Sprintf("−%s kWh, shade loss %s", Thousands(l.BehindBestKWh, 0), Pct(l.ShadeLossPct))
		}
		lls = append(lls, lab)
	}
	addLabels(p, lxy, lls, 7, Ink, text.XLeft, text.YCenter)
	if n > 0 {
		p.NominalY(names...)
	}
	p.Y.Tick.Label.Font.Size = vg.Points(8)
	p.X.Label.Text = "AC energy per year (kWh)"
	p.X.Label.TextStyle.Color = Ink
	p.X.Min = 0
	p.X.Max = math.Max(max*1.7, 1)
	p.X.Tick.Marker = thousandsTicks{}
	p.Y.Min, p.Y.Max = -0.6, math.Max(float64(n)-0.4, 0.4)
	return p
}
