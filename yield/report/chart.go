package report

import (
	"bytes"
	"fmt"
	"image/color"
	"image/png"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// The house palette: one accent (a deep teal) with greys, chosen for print and for readers
// with red-green colour blindness.
var (
	Accent     = color.RGBA{R: 0x1b, G: 0x6f, B: 0x7a, A: 0xff}
	AccentSoft = color.RGBA{R: 0xa9, G: 0xd3, B: 0xd8, A: 0xff}
	Ink        = color.RGBA{R: 0x22, G: 0x27, B: 0x2b, A: 0xff}
	Muted      = color.RGBA{R: 0xb8, G: 0xbe, B: 0xc2, A: 0xff}
	Warn       = color.RGBA{R: 0xc0, G: 0x4a, B: 0x1c, A: 0xff}
)

// Format is a chart file format.
type Format int

// Chart formats.
const (
	PNG Format = iota
	SVG
)

// Ext returns the file extension of the format, with its dot.
func (f Format) Ext() string {
	if f == SVG {
		return ".svg"
	}
	return ".png"
}

// chartDPI is the raster resolution: sharp in a printed A4 proposal, small enough to mail.
const chartDPI = 200

// Render draws p at w×h into the format's bytes.
func Render(p *plot.Plot, w, h vg.Length, f Format) ([]byte, error) {
	var buf bytes.Buffer
	switch f {
	case SVG:
		c := vgsvg.New(w, h)
		p.Draw(draw.New(c))
		if _, err := c.WriteTo(&buf); err != nil {
			return nil, fmt.Errorf("report: svg: %w", err)
		}
	default:
		c := vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(w, h), vgimg.UseDPI(chartDPI))}
		p.Draw(draw.New(c))
		if err := pngEncoder.Encode(&buf, c.Image()); err != nil {
			return nil, fmt.Errorf("report: png: %w", err)
		}
	}
	return buf.Bytes(), nil
}

// pngEncoder compresses charts at deflate's fastest level: a chart is mostly flat colour,
// which every level compresses well, and the fastest takes a fraction of the default's time.
var pngEncoder = png.Encoder{CompressionLevel: png.BestSpeed}

// MonthNames are the month labels of every monthly chart.
var MonthNames = []string{"Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"}

// MonthlyChart draws monthly AC energy as bars, with the same modules' unshaded energy
// beside each bar when unshaded is given. note, when not empty, is printed under the title
// (for example the indicative-climate warning).
func MonthlyChart(ac, unshaded *[12]float64, note string) *plot.Plot {
	p := plot.New()
	title := "Monthly AC energy"
	if note != "" {
		title += "\n" + note
	}
	// A blank line under the title holds the legend, above the bars and the grid.
	styleTitle(p, title+"\n\n ")
	p.Y.Label.Text = "AC energy (kWh)"
	p.Y.Tick.Marker = thousandsTicks{}
	p.Y.Min = 0
	// Horizontal lines only, drawn first so the bars cover them; the months need no
	// vertical ones.
	grid := plotter.NewGrid()
	grid.Vertical.Width = 0
	grid.Horizontal.Color = Muted
	grid.Horizontal.Width = vg.Points(0.3)
	p.Add(grid)
	w := vg.Points(11)
	vals := func(a *[12]float64) plotter.Values {
		v := make(plotter.Values, 12)
		copy(v, a[:])
		return v
	}
	bars, _ := plotter.NewBarChart(vals(ac), w)
	bars.Color = Accent
	bars.LineStyle.Width = 0
	if unshaded != nil {
		ub, _ := plotter.NewBarChart(vals(unshaded), w)
		ub.Color = Muted
		ub.LineStyle.Width = 0
		ub.Offset = w / 2
		bars.Offset = -w / 2
		p.Add(ub)
		p.Legend.Add("without shade", ub)
	}
	p.Add(bars)
	p.Legend.Add("estimate, with shade", bars)
	p.Legend.Top = true
	p.Legend.YOffs = vg.Points(26)
	p.NominalX(MonthNames...)
	p.X.Min, p.X.Max = -0.7, 11.7 // the outer bars whole
	return p
}
