package report

import (
	"strings"
	"unicode"

	"golang.org/x/image/font/sfnt"
	"golang.org/x/image/math/fixed"

	"sunstring/yield/report/fonts"
	"sunstring/yield/report/rtl"
)

// Text in the PDFs is drawn in runs: Liberation Sans where it has the character, else the
// first face of fonts.Chain that has it (embedded like Liberation, so the text can be
// searched and copied), else, for pictographs the PDF writer cannot embed (it takes only
// the Basic Multilingual Plane), the outline of the pictograph drawn as a shape. Only what
// no face draws prints as Missing. Text that Liberation draws whole takes fpdf's own
// calls, so documents in Latin script are unchanged byte for byte.

// face numbers of a run besides the indexes of fonts.Chain.
const (
	mainFace  = -1
	pictoFace = -2
)

// run is a stretch of text drawn in one face.
type run struct {
	face int
	text string
}

// silent are the characters that shape an emoji sequence (joiner, variation selectors,
// skin tones): with monochrome outlines drawn one by one they have nothing to add (the
// pictograph face draws a skin tone as a swatch of its own).
func silent(r rune) bool {
	return r == 0x200d || (r >= 0xfe00 && r <= 0xfe0f) || (r >= 0x1f3fb && r <= 0x1f3ff)
}

// faceHas reports whether face (a run's face number) draws r.
func faceHas(face int, r rune) bool {
	switch {
	case face == mainFace:
		return hasGlyph(r)
	case face == pictoFace:
		return fonts.Pictographs().Has(r)
	default:
		return r <= 0xffff && fonts.Chain()[face].Has(r)
	}
}

// faceOf returns the face that draws r, or ok false.
func faceOf(r rune) (face int, ok bool) {
	if hasGlyph(r) {
		return mainFace, true
	}
	if r <= 0xffff {
		for i, f := range fonts.Chain() {
			if f.Has(r) {
				return i, true
			}
		}
	}
	if fonts.Pictographs().Has(r) {
		return pictoFace, true
	}
	return 0, false
}

// runsOf splits the line s into runs in the order they are drawn (right-to-left text
// reversed and Arabic joined, package rtl); plain is true when Liberation draws all of s
// as it is.
func runsOf(s string) (runs []run, plain bool) {
	v := rtl.Visual(s)
	runs, plain = faceRuns(v)
	return runs, plain && v == s
}

// faceRuns splits s into runs by face, in the order of s; plain is true when Liberation
// draws all of s.
func faceRuns(s string) (runs []run, plain bool) {
	plain = true
	for _, r := range s {
		if !hasGlyph(r) {
			plain = false
			break
		}
	}
	if plain {
		return []run{{mainFace, s}}, true
	}
	var b strings.Builder
	cur := mainFace
	flush := func() {
		if b.Len() > 0 {
			runs = append(runs, run{cur, b.String()})
			b.Reset()
		}
	}
	add := func(face int, s string) {
		if face != cur {
			flush()
			cur = face
		}
		b.WriteString(s)
	}
	for _, r := range s {
		if silent(r) {
			continue
		}
		// A combining mark stays with the face of its base character where that face has it.
		if b.Len() > 0 && (unicode.Is(unicode.Mn, r) || unicode.Is(unicode.Mc, r)) && faceHas(cur, r) {
			b.WriteRune(r)
			continue
		}
		face, ok := faceOf(r)
		if !ok {
			face, r = mainFace, []rune(Missing)[0]
		}
		add(face, string(r))
	}
	flush()
	return runs, false
}

// bmp is s for the document's metadata, which fpdf encodes only within the Basic
// Multilingual Plane: a character beyond it becomes Missing.
func bmp(s string) string {
	return strings.Map(func(r rune) rune {
		if r > 0xffff {
			return []rune(Missing)[0]
		}
		return r
	}, s)
}

// setFace selects face at the current size, keeping bold where the face has a bold cut
// (else its regular serves), and registers the face's font the first time it is used.
func (d *pdfDoc) setFace(face int, family, style string) {
	size, _ := d.GetFontSize()
	if face == mainFace {
		d.SetFont(family, style, size)
		return
	}
	f := fonts.Chain()[face]
	ttf, st := f.Regular(), ""
	if strings.Contains(style, "B") && f.Bold() != nil {
		ttf, st = f.Bold(), "B"
	}
	key := f.Name + st
	if !d.faces[key] {
		if d.faces == nil {
			d.faces = map[string]bool{}
		}
		d.AddUTF8FontFromBytes(f.Name, st, ttf)
		d.faces[key] = true
	}
	d.SetFont(f.Name, st, size)
}

// pictoScale returns the pictograph face and the millimetres per 26.6 font unit at the
// current type size.
func (d *pdfDoc) pictoScale() (*sfnt.Font, float64, error) {
	fn, err := fonts.Pictographs().Font()
	if err != nil {
		return nil, 0, err
	}
	_, sizeMM := d.GetFontSize()
	return fn, sizeMM / float64(fn.UnitsPerEm()) / 64, nil
}

// runsWidth returns the width of runs at the current font, mm.
func (d *pdfDoc) runsWidth(runs []run) float64 {
	family, style := d.GetFontFamily(), d.GetFontStyle()
	w := 0.0
	for _, rn := range runs {
		switch rn.face {
		case mainFace:
			w += d.GetStringWidth(rn.text)
		case pictoFace:
			fn, k, err := d.pictoScale()
			if err != nil {
				continue
			}
			var buf sfnt.Buffer
			ppem := fixed.I(int(fn.UnitsPerEm()))
			for _, r := range rn.text {
				if i, err := fn.GlyphIndex(&buf, r); err == nil {
					if a, err := fn.GlyphAdvance(&buf, i, ppem, 0); err == nil {
						w += float64(a) * k
					}
				}
			}
		default:
			d.setFace(rn.face, family, style)
			w += d.GetStringWidth(rn.text)
			d.SetFont(family, style, 0)
		}
	}
	return w
}

// width is GetStringWidth for text of any script.
func (d *pdfDoc) width(s string) float64 {
	runs, plain := runsOf(s)
	if plain {
		return d.GetStringWidth(s)
	}
	return d.runsWidth(runs)
}

// drawPicto draws the pictographs of s as filled outlines in the text colour, starting at
// x on the baseline y, and returns the x after them.
func (d *pdfDoc) drawPicto(s string, x, y float64) float64 {
	fn, k, err := d.pictoScale()
	if err != nil {
		return x
	}
	fr, fg, fb := d.GetFillColor()
	d.SetFillColor(d.GetTextColor())
	var buf sfnt.Buffer
	ppem := fixed.I(int(fn.UnitsPerEm()))
	for _, r := range s {
		i, err := fn.GlyphIndex(&buf, r)
		if err != nil {
			continue
		}
		segs, err := fn.LoadGlyph(&buf, i, ppem, nil)
		if err != nil {
			continue
		}
		px := func(p fixed.Point26_6) (float64, float64) {
			return x + float64(p.X)*k, y + float64(p.Y)*k
		}
		for _, sg := range segs {
			switch sg.Op {
			case sfnt.SegmentOpMoveTo:
				d.MoveTo(px(sg.Args[0]))
			case sfnt.SegmentOpLineTo:
				d.LineTo(px(sg.Args[0]))
			case sfnt.SegmentOpQuadTo:
				cx, cy := px(sg.Args[0])
				ex, ey := px(sg.Args[1])
				d.CurveTo(cx, cy, ex, ey)
			case sfnt.SegmentOpCubeTo:
				c0x, c0y := px(sg.Args[0])
				c1x, c1y := px(sg.Args[1])
				ex, ey := px(sg.Args[2])
				d.CurveBezierCubicTo(c0x, c0y, c1x, c1y, ex, ey)
			}
		}
		if len(segs) > 0 {
			d.DrawPath("F")
		}
		if a, err := fn.GlyphAdvance(&buf, i, ppem, 0); err == nil {
			x += float64(a) * k
		}
	}
	d.SetFillColor(fr, fg, fb)
	return x
}

// cell is fpdf's CellFormat for text of any script.
func (d *pdfDoc) cell(w, h float64, s, border string, ln int, align string, fill bool) {
	runs, plain := runsOf(s)
	if plain {
		d.CellFormat(w, h, s, border, ln, align, fill, 0, "")
		return
	}
	x0 := d.GetX()
	if w == 0 {
		w = d.w - margin - x0
	}
	tw := d.runsWidth(runs)
	// An empty cell draws the border and fill, and breaks the page where fpdf would.
	d.CellFormat(w, h, "", border, 0, "", fill, 0, "")
	y := d.GetY()
	cm := d.GetCellMargin()
	x := x0 + cm
	switch {
	case strings.Contains(align, "R"):
		x = x0 + w - cm - tw
	case strings.Contains(align, "C"):
		x = x0 + (w-tw)/2
	}
	family, style := d.GetFontFamily(), d.GetFontStyle()
	d.SetCellMargin(0)
	for _, rn := range runs {
		switch rn.face {
		case pictoFace:
			_, sizeMM := d.GetFontSize()
			x = d.drawPicto(rn.text, x, y+h/2+0.3*sizeMM)
		default:
			d.setFace(rn.face, family, style)
			rw := d.GetStringWidth(rn.text)
			d.SetXY(x, y)
			d.CellFormat(rw, h, rn.text, "", 0, "L", false, 0, "")
			x += rw
		}
	}
	d.SetFont(family, style, 0)
	d.SetCellMargin(cm)
	switch ln {
	case 0:
		d.SetXY(x0+w, y)
	case 1:
		d.SetXY(margin, y+h)
	default:
		d.SetXY(x0, y+h)
	}
}

// multi is fpdf's MultiCell (full width, left-aligned) for text of any script.
func (d *pdfDoc) multi(h float64, s string, fill bool) {
	if _, plain := runsOf(s); plain {
		d.MultiCell(0, h, s, "", "L", fill)
		return
	}
	x0 := d.GetX()
	w := d.w - margin - x0
	for _, l := range d.wrap(s, w-2*d.GetCellMargin()) {
		d.SetX(x0)
		d.cell(w, h, l, "", 2, "L", fill)
	}
	d.SetX(margin)
}

// split is fpdf's SplitText (lines of at most w, mm, cell margins included) for text of
// any script.
func (d *pdfDoc) split(s string, w float64) []string {
	if _, plain := runsOf(s); plain {
		return d.SplitText(s, w)
	}
	return d.wrap(s, w-2*d.GetCellMargin())
}

// wrap breaks s into lines no wider than w, mm: at spaces, and between Chinese or
// Japanese characters, which need none; a word wider than a line is cut where it must.
func (d *pdfDoc) wrap(s string, w float64) []string {
	var lines []string
	for _, para := range strings.Split(s, "\n") {
		var line string
		for _, tok := range tokens(para) {
			try := line + tok
			if line == "" {
				try = strings.TrimLeft(tok, " ")
			}
			if d.width(try) <= w {
				line = try
				continue
			}
			if line != "" {
				lines = append(lines, strings.TrimRight(line, " "))
			}
			line = strings.TrimLeft(tok, " ")
			for line != "" && d.width(line) > w {
				// cut the word after as many characters as fit, at least one
				rs := []rune(line)
				n := 1
				for n < len(rs) && d.width(string(rs[:n+1])) <= w {
					n++
				}
				lines = append(lines, string(rs[:n]))
				line = string(rs[n:])
			}
		}
		lines = append(lines, strings.TrimRight(line, " "))
	}
	return lines
}

// tokens splits s into the pieces a line may break between: a word with the spaces before
// it, or a single ideograph or kana.
func tokens(s string) []string {
	var out []string
	start := 0
	for i, r := range s {
		ideo := unicode.In(r, unicode.Han, unicode.Hiragana, unicode.Katakana)
		if i > start && (ideo || r == ' ' && s[i-1] != ' ') {
			out = append(out, s[start:i])
			start = i
		}
		if ideo {
			out = append(out, s[start:i+len(string(r))])
			start = i + len(string(r))
		}
	}
	if start < len(s) {
		out = append(out, s[start:])
	}
	return out
}
