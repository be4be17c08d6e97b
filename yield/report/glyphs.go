package report

import (
	"strings"
	"sync"

	"codeberg.org/go-fonts/liberation/liberationsansregular"
	"golang.org/x/image/font/sfnt"
)

// Missing is printed for each character no typeface of the reports draws: a visible mark
// instead of a hole or a failed document.
const Missing = "□"

var glyphs struct {
	once sync.Once
	font *sfnt.Font
}

// hasGlyph reports whether the reports' main typeface (Liberation Sans, the PDFs' and the
// charts') draws r. The PDF writer also takes only the Basic Multilingual Plane.
func hasGlyph(r rune) bool {
	if r < 0x80 {
		return true
	}
	if r > 0xffff {
		return false
	}
	glyphs.once.Do(func() {
		glyphs.font, _ = sfnt.Parse(liberationsansregular.TTF)
	})
	if glyphs.font == nil {
		return false
	}
	var buf sfnt.Buffer
	i, err := glyphs.font.GlyphIndex(&buf, r)
	return err == nil && i != 0
}

// Printable returns s as the reports draw it: a character no typeface of theirs draws
// (Liberation Sans, or a face of package fonts) replaced by Missing, and the joiners,
// variation selectors and skin tones of an emoji sequence left out (the pictographs are
// monochrome outlines, drawn one by one).
func Printable(s string) string {
	runs, plain := faceRuns(s)
	if plain {
		return s
	}
	var b strings.Builder
	for _, rn := range runs {
		b.WriteString(rn.text)
	}
	return b.String()
}
