package fonts

import (
	_ "embed"
	"sync"

	"codeberg.org/go-fonts/dejavu/dejavusans"
	"codeberg.org/go-fonts/dejavu/dejavusansbold"
	"golang.org/x/image/font/sfnt"
)

// The files beside this one are subsets of Debian's font packages (see the LICENSE-*
// files): small enough to live in the repository, and a clean machine with only the Go
// module proxy builds with them.
var (
	//go:embed DroidSansFallback-CJK.ttf
	cjkTTF []byte
	//go:embed NotoSansDevanagari-Regular.ttf
	devanagariTTF []byte
	//go:embed NotoSansThai-Regular.ttf
	thaiTTF []byte
	//go:embed Symbola-Emoji.ttf
	pictoTTF []byte
)

// Face is one typeface of the fallback chain.
type Face struct {
	// Name is the face's family name in a PDF.
	Name string
	// Regular is the TrueType file; Bold is its bold cut, or nil where the face has none
	// (bold text then prints in the regular cut).
	Regular, Bold []byte

	once sync.Once
	font *sfnt.Font
	err  error
}

var (
	chain = []*Face{
		// Greek, Cyrillic and Latin beyond Liberation's, Arabic, Hebrew, Armenian,
		// Georgian and many symbols, with a bold cut.
		{Name: "FallbackDejaVu", Regular: dejavusans.TTF, Bold: dejavusansbold.TTF},
		{Name: "FallbackDevanagari", Regular: devanagariTTF},
		{Name: "FallbackThai", Regular: thaiTTF},
		// Chinese, Japanese and Korean.
		{Name: "FallbackCJK", Regular: cjkTTF},
	}
	picto = &Face{Name: "FallbackPictographs", Regular: pictoTTF}
)

// Chain returns the faces tried, in order, for a character the main typeface lacks.
func Chain() []*Face { return chain }

// Pictographs returns the face of pictographs (emoji) and symbols, drawn as outlines.
func Pictographs() *Face { return picto }

// Font returns the parsed regular cut.
func (f *Face) Font() (*sfnt.Font, error) {
	f.once.Do(func() { f.font, f.err = sfnt.Parse(f.Regular) })
	return f.font, f.err
}

// Has reports whether the face draws r.
func (f *Face) Has(r rune) bool {
	fn, err := f.Font()
	if err != nil {
		return false
	}
	var buf sfnt.Buffer
	i, err := fn.GlyphIndex(&buf, r)
	return err == nil && i != 0
}
