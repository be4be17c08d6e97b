package report

import (
	"image"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/vgimg"
)

// ink draws s in black in the charts' handler at 40 pt on white and returns the dark pixels.
func ink(s string) map[image.Point]bool {
	c := vgimg.NewWith(vgimg.UseWH(200, 60), vgimg.UseDPI(72))
	sty := text.Style{Font: font.From(plot.DefaultFont, 40), Handler: plot.DefaultTextHandler}
	plot.DefaultTextHandler.Draw(c, s, sty, vg.Point{X: 5, Y: 10})
	img := c.Image()
	out := map[image.Point]bool{}
	b := img.Bounds()
	for y := b.Min.Y; y < b.Max.Y; y++ {
		for x := b.Min.X; x < b.Max.X; x++ {
			if r, _, _, _ := img.At(x, y).RGBA(); r < 0x8000 {
				out[image.Point{X: x, Y: y}] = true
			}
		}
	}
	return out
}

// The charts draw a name in another script, or a pictograph, in a fallback face: the width
// is that face's, and the pixels are the glyph's, not the mark's.
func TestChartText(t *testing.T) {
	cases := []struct {
		name, text string
		widthPt    float64 // at 10 pt; 0: not checked
	}{
		// A CJK ideograph is one em wide (common practice of CJK typefaces; Droid Sans
		// Fallback's advance is its em, 256 units).
		{"Chinese", "山田", 20},
		{"Korean", "한", 10},
		{"Devanagari", "घर", 0},
		{"emoji", "🏠", 0},
	}
	mark := ink(Missing)
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if tc.widthPt > 0 {
				w, _, _ := plot.DefaultTextHandler.Box(tc.text, font.From(plot.DefaultFont, 10))
				if !scalar.EqualWithinAbsOrRel(w.Points(), tc.widthPt, 1e-9, 1e-9) {
					t.Errorf("width of %q = %g pt, want %g", tc.text, w.Points(), tc.widthPt)
				}
			}
			got := ink(string([]rune(tc.text)[0]))
			// The glyph must have ink, and differ from the mark in at least a fifth of the
			// mark's pixels (an outline square of the same size would not).
			diff := 0
			for p := range got {
				if !mark[p] {
					diff++
				}
			}
			for p := range mark {
				if !got[p] {
					diff++
				}
			}
			if len(got) < 20 || diff < len(mark)/5 {
				t.Errorf("%q draws %d pixels, %d unlike the mark's %d", tc.text, len(got), diff, len(mark))
			}
		})
	}
}
