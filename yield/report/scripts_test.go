package report

import (
	"fmt"
	"strings"
	"testing"

	"golang.org/x/text/unicode/norm"
)

// A name in any script prints as itself in both documents: pdftotext gives it back as
// text, and nothing prints as Missing. A pictograph (emoji) is drawn as an outline, which
// is no text: only the words around it come back.
func TestDocumentNamesInAnyScript(t *testing.T) {
	base := map[string]int{}
	for _, doc := range []string{"proposal", "technical sheet"} {
		b, err := render(fixture("file"), doc)
		if err != nil {
			t.Fatal(err)
		}
		base[doc] = len(b)
	}
	cases := []struct {
		name, text string
		back       []string // what pdftotext must give back
		growthKB   float64  // most the documents may grow (see the reasons below)
	}{
		// Reasons for the growth allowed, measured 2026-12: a script Liberation Sans has
		// adds a few glyphs to its subset (about 2 KB); each fallback face adds a subset font
		// program of the characters used (3 to 8 KB, more for several faces); a pictograph
		// is an outline drawn wherever the name is, and the footer repeats the name on every
		// page (about 1 KB each time: 38 and 51 KB for three pictographs). Arabic prints in
		// DejaVu Sans, regular and bold (two subsets, 23 KB in all); Liberation Sans has
		// Hebrew. pdftotext gives right-to-left text back in logical order, marked with
		// embedding controls, and Arabic in the presentation forms it is drawn with: the
		// text is compared after NFKC and without the controls.
		{"Latin with accents", "Müller-Łódź Ærøskøbing", []string{"Müller-Łódź Ærøskøbing"}, 4},
		{"Cyrillic", "Дом Солнца", []string{"Дом Солнца"}, 4},
		{"Greek", "Σπίτι του Ήλιου", []string{"Σπίτι του Ήλιου"}, 4},
		{"Chinese", "山田邸 太陽光", []string{"山田邸 太陽光"}, 10},
		{"Japanese", "ひまわり ハウス", []string{"ひまわり ハウス"}, 10},
		{"Korean", "햇빛 주택", []string{"햇빛 주택"}, 10},
		{"Devanagari", "सूर्य घर", []string{"सूर्य घर"}, 10},
		{"Thai", "บ้าน", []string{"บ้าน"}, 10},
		{"Arabic", "بيت الشمس", []string{"بيت الشمس"}, 30},
		{"Hebrew", "בית השמש 12", []string{"בית השמש"}, 4},
		{"emoji", "Casa 🏠 Sol ☀️ 👍🏽", []string{"Casa", "Sol"}, 60},
		{"mixed", "山田 Müller Ωμέγα 🏠 한", []string{"山田 Müller Ωμέγα", "한"}, 20},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			pr := fixture("file")
			pr.Summary.Site.Name = tc.text
			pr.Cover.Customer = tc.text
			pr.Cover.PreparedBy = tc.text
			pr.Summary.Faces[0].ID = tc.text
			for _, doc := range []string{"proposal", "technical sheet"} {
				b, err := render(pr, doc)
				if err != nil {
					t.Fatalf("%s: %v", doc, err)
				}
				growth := float64(len(b)-base[doc]) / 1024
				t.Logf("%s: %+.1f KB", doc, growth)
				if growth > tc.growthKB {
					t.Errorf("%s grew by %.1f KB, more than %.0f KB", doc, growth, tc.growthKB)
				}
				text := pdfText(t, b)
				if text == "" {
					continue
				}
				text = norm.NFKC.String(strings.Map(func(r rune) rune {
					if r >= 0x202a && r <= 0x202e {
						return -1
					}
					return r
				}, text))
				for _, w := range tc.back {
					if !strings.Contains(text, w) {
						t.Errorf("%s: %q does not come back as text", doc, w)
					}
				}
				if strings.Contains(text, Missing) {
					t.Errorf("%s prints %s for a character of %q", doc, Missing, tc.text)
				}
			}
		})
	}
}

func render(pr *Proposal, doc string) ([]byte, error) {
	if doc == "proposal" {
		return pr.PDF()
	}
	return pr.TechnicalPDF()
}

// Each character goes to the first face that draws it; what shapes an emoji sequence is
// dropped; what no face draws prints as Missing.
func TestRunsOf(t *testing.T) {
	cases := []struct {
		name  string
		in    string
		want  []run
		plain bool
	}{
		{"Latin", "Müller", []run{{mainFace, "Müller"}}, true},
		{"Chinese", "山田邸 A", []run{{3, "山田邸"}, {mainFace, " A"}}, false},
		{"Devanagari with its vowel signs", "सूर्य", []run{{1, "सूर्य"}}, false},
		{"Arabic, joined and reversed", "بيت", []run{{0, "\ufe96\ufef4\ufe91"}}, false},
		{"Hebrew, reversed: drawn by Liberation, but not as given", "בית", []run{{mainFace, "תיב"}}, false},
		{"emoji with a skin tone and a joiner", "ok 👍🏽👨‍👩", []run{{mainFace, "ok "}, {pictoFace, "👍👨👩"}}, false},
		{"symbol with a variation selector", "☀️", []run{{0, "☀"}}, false},
		{"private use", "a\ue000b", []run{{mainFace, "a" + Missing + "b"}}, false},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got, plain := runsOf(tc.in)
			if plain != tc.plain || fmt.Sprint(got) != fmt.Sprint(tc.want) {
				t.Errorf("runsOf(%q) = %v, %v; want %v, %v", tc.in, got, plain, tc.want, tc.plain)
			}
		})
	}
}

// Text in other scripts wraps like fpdf's own: every line fits the width, CJK breaks
// between characters, other scripts at spaces, and nothing is lost or repeated.
func TestWrapAnyScript(t *testing.T) {
	d, err := fixture("file").newDoc("test")
	if err != nil {
		t.Fatal(err)
	}
	d.AddPage()
	d.SetFont(fontName, "", bodyPt)
	const w = 60.0 // mm
	cases := []struct {
		name, text string
		minLines   int
	}{
		{"Japanese without spaces", strings.Repeat("東京都千代田区の長い住所", 4), 3},
		{"Arabic words", strings.Repeat("بيت الشمس الكبير ", 6), 2},
		{"Devanagari words", strings.Repeat("सूर्य घर बिजली ", 6), 2},
		{"a word longer than a line", strings.Repeat("한", 40), 2},
		{"mixed", "Casa 🏠 " + strings.Repeat("山田 Müller ", 6), 2},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			lines := d.wrap(tc.text, w)
			if len(lines) < tc.minLines {
				t.Errorf("%d lines, want at least %d", len(lines), tc.minLines)
			}
			for _, l := range lines {
				if lw := d.width(l); lw > w+1e-9 {
					t.Errorf("line %q is %.1f mm wide, more than %.0f", l, lw, w)
				}
			}
			strip := func(s string) string { return strings.ReplaceAll(s, " ", "") }
			if got, want := strip(strings.Join(lines, "")), strip(tc.text); got != want {
				t.Errorf("lines %q lose or repeat text of %q", lines, tc.text)
			}
		})
	}
}
