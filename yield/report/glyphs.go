package report

import (
	"strings"
	"sync"

	"codeberg.org/go-fonts/liberation/liberationsansregular"
	"golang.org/x/image/font/sfnt"
)

// Missing is printed for each character the report's typeface cannot draw (a character
// of another script, an emoji): a visible mark instead of a hole or a failed document.
const Missing = "□"

var glyphs struct {
	once sync.Once
	font *sfnt.Font
}

// hasGlyph reports whether the report's typeface (Liberation Sans, the PDF's and the
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

// Printable returns s with every character the typeface cannot draw replaced by Missing
// (a run of combining marks and joiners after such a character goes with it), so that a
// name in any script or with an emoji prints, marked, rather than failing the document.
func Printable(s string) string {
	ok := true
	for _, r := range s {
		if !hasGlyph(r) {
			ok = false
			break
		}
	}
	if ok {
		return s
	}
	var b strings.Builder
	lastMissing := false
	for _, r := range s {
		switch {
		case lastMissing && (r == 0x200d || (r >= 0xfe00 && r <= 0xfe0f) || (r >= 0x1f3fb && r <= 0x1f3ff)):
			// a joiner, variation selector or skin tone belongs to the character before
		case hasGlyph(r):
			b.WriteRune(r)
			lastMissing = false
		default:
			b.WriteString(Missing)
			lastMissing = true
		}
	}
	return b.String()
}
