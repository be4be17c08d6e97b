package report

import (
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/recorder"
)

// Names that would print over each other are drawn one or two lines higher, or left out;
// names with room stay where they are, and none is drawn over another or over the labels it
// must avoid.
func TestSpacedLabels(t *testing.T) {
	p := plot.New()
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, 100, 0, 100
	// Four long names a hair apart, one far off, one where an avoided label stands.
	ids := labelsOf(plotter.XYs{{X: 50, Y: 50}, {X: 50.5, Y: 50}, {X: 51, Y: 50}, {X: 51.5, Y: 50}, {X: 90, Y: 10}, {X: 20, Y: 80}},
		[]string{"first-name", "second-name", "third-name", "fourth-name", "far", "under"}, 7, Ink, text.XCenter, text.YBottom)
	avoid := labelsOf(plotter.XYs{{X: 20, Y: 80}}, []string{"12 h"}, 7, Accent, text.XCenter, text.YBottom)
	rec := &recorder.Canvas{}
	c := draw.NewCanvas(rec, vg.Points(400), vg.Points(300))
	(&spacedLabels{Labels: ids, avoid: []*plotter.Labels{avoid}}).Plot(c, p)
	drawn := map[string]vg.Point{}
	for _, a := range rec.Actions {
		if f, ok := a.(*recorder.FillString); ok {
			drawn[f.String] = f.Point
		}
	}
	lineH := ids.TextStyle[0].Rectangle("first-name").Size().Y
	trX, trY := p.Transforms(&c)
	// FillText starts the text left of its point and above it by the style's alignment, the
	// same for every name of one style: the far name, alone where it stands, gives that offset.
	// Positions are compared within 0.01 pt, rounding of sums of point lengths; a line of
	// these names is about 8 pt.
	far := drawn["far"]
	baseY := far.Y - trY(10)
	for _, tc := range []struct {
		name  string
		drawn bool
		lines float64 // how many lines above its point
	}{
		{"first-name", true, 0},
		{"second-name", true, 1},
		{"third-name", true, 2},
		{"fourth-name", false, 0},
		{"far", true, 0},
		{"under", true, 1},
	} {
		t.Run(tc.name, func(t *testing.T) {
			at, ok := drawn[tc.name]
			if ok != tc.drawn {
				t.Fatalf("drawn %v, want %v", ok, tc.drawn)
			}
			if !ok {
				return
			}
			i := 0
			for ids.Labels[i] != tc.name {
				i++
			}
			wantY := trY(ids.XYs[i].Y) + baseY + vg.Length(tc.lines)*lineH
			if !near(float64(at.Y), float64(wantY), 0.01) {
				t.Errorf("text at %.2f pt high, want %.2f (%g lines up)", at.Y, wantY, tc.lines)
			}
			// Centred on its point: the text starts half its width to the left.
			box := ids.TextStyle[i].Rectangle(tc.name)
			if got := at.X - box.Min.X; !near(float64(got), float64(trX(ids.XYs[i].X)), 0.01) {
				t.Errorf("centre at %.2f pt, want %.2f", got, trX(ids.XYs[i].X))
			}
		})
	}
}

func near(a, b, tol float64) bool { return a-b <= tol && b-a <= tol }
