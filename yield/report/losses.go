package report

import (
	"fmt"
	"image/color"
	"math"

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

// lossGrey marks what is lost: a dark grey, so the accent stays for what is delivered.
var lossGrey = color.RGBA{R: 0x6b, G: 0x73, B: 0x78, A: 0xff}

// barRect is a horizontal bar from x0 to x1 at row y (rows are one unit apart).
func barRect(x0, x1, y float64) plotter.XYs {
	const h = 0.32
	return plotter.XYs{{X: x0, Y: y - h}, {X: x1, Y: y - h}, {X: x1, Y: y + h}, {X: x0, Y: y + h}}
}

// LossChart draws the loss breakdown as a horizontal waterfall: the starting energy at the
// top, each loss as a bar hanging from what is left before it, the AC energy at the bottom.
// Steps that lose less than 0.5 kWh are left out of the chart (the table lists them).
func LossChart(acKWh float64, ls []Loss) *plot.Plot {
	p := plot.New()
	styleTitle(p, "From irradiation to AC energy: annual losses")
	start := StartKWh(acKWh, ls)
	type row struct {
		name   string
		x0, x1 float64
		c      color.Color
		lab    string
	}
	rows := []row{{"modules' irradiation at STC efficiency", 0, start, Muted, Thousands(start, 0) + " kWh"}}
	left := start
	for _, l := range ls {
		if l.KWh < 0.5 {
			left -= l.KWh
			continue
		}
		rows = append(rows, row{l.Step, left - l.KWh, left, lossGrey,
			fmt.Sprintf("−%s kWh (%s)", Thousands(l.KWh, 0), Pct(l.Pct))})
		left -= l.KWh
	}
	rows = append(rows, row{"AC energy", 0, acKWh, Accent, Thousands(acKWh, 0) + " kWh"})
	n := len(rows)
	names := make([]string, n)
	var lxy plotter.XYs
	var lls []string
	for i, r := range rows {
		y := float64(n - 1 - i)
		names[n-1-i] = r.name
		addPolygon(p, barRect(r.x0, r.x1, y), r.c, nil, 0)
		lxy = append(lxy, plotter.XY{X: r.x1 + 0.01*start, Y: y})
		lls = append(lls, r.lab)
	}
	addLabels(p, lxy, lls, 7, Ink, text.XLeft, text.YCenter)
	p.NominalY(names...)
	p.Y.Tick.Label.Font.Size = vg.Points(8)
	p.Y.Tick.Label.Color = Ink
	p.X.Label.Text = "energy per year (kWh)"
	p.X.Label.TextStyle.Color = Ink
	p.X.Min = 0
	p.X.Max = start * 1.32 // room for the value labels
	p.X.Tick.Marker = thousandsTicks{}
	p.Y.Min, p.Y.Max = -0.6, float64(n)-0.4
	return p
}

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
