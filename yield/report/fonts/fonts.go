package fonts

import (
	"bytes"
	"compress/gzip"
	_ "embed"
	"fmt"
	"io"
	"sync"

	"codeberg.org/go-fonts/dejavu/dejavusans"
	"codeberg.org/go-fonts/dejavu/dejavusansbold"
	"golang.org/x/image/font/sfnt"
)

// The files beside this one are subsets of Debian's font packages (see the LICENSE-*
// files): small enough to live in the repository, and a clean machine with only the Go
// module proxy builds with them. They are kept compressed (half the size).
var (
	//go:embed DroidSansFallback-CJK.ttf.gz
	cjkGz []byte
	//go:embed NotoSansDevanagari-Regular.ttf.gz
	devanagariGz []byte
	//go:embed NotoSansThai-Regular.ttf.gz
	thaiGz []byte
	//go:embed Symbola-Emoji.ttf.gz
	pictoGz []byte
)

// Face is one typeface of the fallback chain.
type Face struct {
	// Name is the face's family name in a PDF.
	Name string

	gz        []byte // the compressed regular cut, or
	ttf, bold []byte // the regular and bold cuts as they are

	once sync.Once
	font *sfnt.Font
	err  error
}

// Regular returns the TrueType file of the regular cut.
func (f *Face) Regular() []byte {
	f.load()
	return f.ttf
}

// Bold returns the TrueType file of the bold cut, or nil where the face has none (bold
// text then prints in the regular cut).
func (f *Face) Bold() []byte { return f.bold }

// load decompresses and parses the regular cut, once.
func (f *Face) load() {
	f.once.Do(func() {
		if f.gz != nil {
			f.ttf, f.err = gunzip(f.gz)
			if f.err != nil {
				f.err = fmt.Errorf("fonts: %s: %w", f.Name, f.err)
				return
			}
		}
		f.font, f.err = sfnt.Parse(f.ttf)
		if f.err != nil {
			f.err = fmt.Errorf("fonts: %s: %w", f.Name, f.err)
		}
	})
}

func gunzip(b []byte) ([]byte, error) {
	r, err := gzip.NewReader(bytes.NewReader(b))
	if err != nil {
		return nil, err
	}
	return io.ReadAll(r)
}

var (
	chain = []*Face{
		// Greek, Cyrillic and Latin beyond Liberation's, Arabic, Hebrew, Armenian,
		// Georgian and many symbols, with a bold cut.
		{Name: "FallbackDejaVu", ttf: dejavusans.TTF, bold: dejavusansbold.TTF},
		{Name: "FallbackDevanagari", gz: devanagariGz},
		{Name: "FallbackThai", gz: thaiGz},
		// Chinese, Japanese and Korean.
		{Name: "FallbackCJK", gz: cjkGz},
	}
	picto = &Face{Name: "FallbackPictographs", gz: pictoGz}
)

// Chain returns the faces tried, in order, for a character the main typeface lacks.
func Chain() []*Face { return chain }

// Pictographs returns the face of pictographs (emoji) and symbols, drawn as outlines.
func Pictographs() *Face { return picto }

// Font returns the parsed regular cut.
func (f *Face) Font() (*sfnt.Font, error) {
	f.load()
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
