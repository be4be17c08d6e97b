package report

import (
	"math"
	"strings"
	"sync"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"

	"sunstring/yield/report/fonts"
)

// The charts draw their text through chartText, set as gonum/plot's default handler when
// the package loads (the report is the program's only plotting): a name in a script
// Liberation Sans lacks is drawn, run by run, in the fallback faces of package fonts, the
// pictographs included (the raster charts take any outline). Text Liberation draws whole
// goes to gonum's own handler, so charts in Latin script are unchanged byte for byte.
func init() {
	plot.DefaultTextHandler = chartText{text.Plain{Fonts: font.DefaultCache}}
}

type chartText struct{ text.Plain }

// addFaces puts the fallback faces in the plot's font cache on first need.
var addFaces sync.Once

// runFont returns the font of a run's face at the style's size.
func (h chartText) runFont(face int, fnt font.Font) font.Font {
	if face == mainFace {
		return fnt
	}
	addFaces.Do(func() {
		var coll font.Collection
		for _, f := range append(fonts.Chain(), fonts.Pictographs()) {
			if fn, err := f.Font(); err == nil {
				coll = append(coll, font.Face{Font: font.Font{Typeface: font.Typeface(f.Name)}, Face: fn})
			}
		}
		h.Fonts.Add(coll)
	})
	name := fonts.Pictographs().Name
	if face != pictoFace {
		name = fonts.Chain()[face].Name
	}
	return font.Font{Typeface: font.Typeface(name), Size: fnt.Size}
}

// plainText reports whether Liberation draws all of s.
func plainText(s string) bool {
	_, plain := runsOf(s)
	return plain
}

func (h chartText) width(runs []run, fnt font.Font) vg.Length {
	var w vg.Length
	for _, rn := range runs {
		f := h.runFont(rn.face, fnt)
		face := h.Fonts.Lookup(f, f.Size)
		w += face.Width(rn.text)
	}
	return w
}

// Box is text.Plain's Box for text of any script.
func (h chartText) Box(txt string, fnt font.Font) (width, height, depth vg.Length) {
	runs, plain := runsOf(txt)
	width, height, depth = h.Plain.Box(txt, fnt)
	if !plain {
		width = h.width(runs, fnt)
	}
	return width, height, depth
}

// Draw is text.Plain's Draw (the same placement of lines, alignment and rotation) for text
// of any script.
func (h chartText) Draw(c vg.Canvas, txt string, sty text.Style, pt vg.Point) {
	if plainText(txt) {
		h.Plain.Draw(c, txt, sty, pt)
		return
	}
	txt = strings.TrimRight(txt, "\n")
	main := h.Fonts.Lookup(sty.Font, sty.Font.Size)
	c.SetColor(sty.Color)
	if sty.Rotation != 0 {
		c.Push()
		c.Rotate(sty.Rotation)
	}
	sin64, cos64 := math.Sincos(sty.Rotation)
	cos, sin := vg.Length(cos64), vg.Length(sin64)
	pt.X, pt.Y = pt.Y*sin+pt.X*cos, pt.Y*cos-pt.X*sin
	lines := h.Lines(txt)
	pt.Y += sty.Height(txt)*vg.Length(sty.YAlign) - main.Extents().Ascent
	for i, line := range lines {
		runs, _ := runsOf(line)
		x := vg.Length(sty.XAlign) * h.width(runs, sty.Font)
		n := vg.Length(len(lines) - i)
		for _, rn := range runs {
			f := h.runFont(rn.face, sty.Font)
			face := h.Fonts.Lookup(f, f.Size)
			c.FillString(face, pt.Add(vg.Point{X: x, Y: n * sty.Font.Size}), rn.text)
			x += face.Width(rn.text)
		}
	}
	if sty.Rotation != 0 {
		c.Pop()
	}
}
