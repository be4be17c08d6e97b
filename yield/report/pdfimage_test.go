package report

import (
	"bytes"
	"image"
	"image/png"
	"strings"
	"testing"

	"codeberg.org/go-fonts/liberation/liberationsansregular"
	"codeberg.org/go-pdf/fpdf"
)

// A picture that fits its page but would push the last lines of the text under it onto a page
// of their own is shrunk, by at most a quarter, so that the text fits; otherwise it keeps its
// size.
func TestImageAboveLeavesRoom(t *testing.T) {
	var buf bytes.Buffer
	if err := png.Encode(&buf, image.NewGray(image.Rect(0, 0, 400, 300))); err != nil {
		t.Fatal(err)
	}
	text := strings.Repeat("A paragraph long enough to take several lines of the page. ", 12)
	newA4 := func() *pdfDoc {
		f := fpdf.New("P", "mm", "A4", "")
		w, h := f.GetPageSize()
		f.SetMargins(margin, margin, margin)
		f.SetAutoPageBreak(true, margin+6)
		f.AddUTF8FontFromBytes(fontName, "", liberationsansregular.TTF)
		f.AddPage()
		return &pdfDoc{Fpdf: f, w: w, h: h}
	}
	probe := newA4()
	full := probe.contentW() * 0.92 * 300 / 400 // the picture's height at full size, mm
	textH := probe.paraHeight(text)
	bottom := probe.h - margin - 8
	for _, tc := range []struct {
		name   string
		top    float64 // where the picture starts, mm
		below  float64 // the text's height, 0: none
		height float64 // the picture's expected height, mm
		pages  int
	}{
		{"room for both", margin + 10, textH, full, 1},
		{"text one line short", bottom - full - imageGap - textH + lineMM, textH, full - lineMM, 1},
		{"no text", bottom - full - imageGap - textH + lineMM, 0, full, 1},
		// A quarter of the picture is not enough room: the text goes on to the next page.
		{"text too long to make room for", bottom - full - imageGap + 1, textH, full, 2},
	} {
		t.Run(tc.name, func(t *testing.T) {
			d := newA4()
			d.SetY(tc.top)
			d.imageAbove("p", buf.Bytes(), 0.92, tc.below)
			// 0.01 mm: the heights are sums and products of a few millimetre values, exact
			// but for rounding far below that; a line is 5 mm.
			if got := d.GetY() - tc.top - imageGap; got < tc.height-0.01 || got > tc.height+0.01 {
				t.Errorf("picture %.2f mm high, want %.2f", got, tc.height)
			}
			if tc.below > 0 {
				d.para(text)
			}
			if n := d.PageNo(); n != tc.pages {
				t.Errorf("%d pages, want %d", n, tc.pages)
			}
		})
	}
}
