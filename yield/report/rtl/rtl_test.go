package rtl

import (
	"fmt"
	"testing"

	"golang.org/x/text/unicode/norm"
)

// Every presentation form the table gives decomposes (NFKC, from the Unicode Character
// Database through golang.org/x/text) to the letter it stands for.
func TestFormsMatchUnicode(t *testing.T) {
	n := 0
	for r, fs := range forms {
		for _, f := range fs {
			n++
			if got := norm.NFKC.String(string(f)); got != string(r) {
				t.Errorf("U+%04X, a form of U+%04X, decomposes to %q", f, r, got)
			}
		}
	}
	// U+FE80–U+FEF4: 117 forms (the block's layout)
	if n != 0xfef4-0xfe80+1 {
		t.Errorf("%d forms, want %d", n, 0xfef4-0xfe80+1)
	}
	for a, lig := range lamAlef {
		for k, l := range []rune{lig, lig + 1} {
			if got, want := norm.NFKC.String(string(l)), string([]rune{lam, a}); got != want {
				t.Errorf("lam-alef U+%04X (form %d) decomposes to %q, want %q", l, k, got, want)
			}
		}
	}
}

func TestVisual(t *testing.T) {
	cases := []struct {
		name, in, want string
	}{
		{"Latin unchanged", "Müller 12", "Müller 12"},
		// بيت (house): beh initial, yeh medial, teh final, then reversed
		{"Arabic word", "بيت", "\ufe96\ufef4\ufe91"},
		// دار (home): dal and alef join no letter after them, so all three are isolated
		{"right-joining letters", "دار", "\ufead\ufe8d\ufea9"},
		{"lam-alef ligature", "لا", "\ufefb"},
		{"Hebrew reversed", "בית", "תיב"},
		// Digits after right-to-left text go with it and keep their order (UAX #9).
		{"number keeps its order", "بيت 12", "12 \ufe96\ufef4\ufe91"},
		{"mixed line with a number", "Casa בית 12 ok", "Casa 12 תיב ok"},
		{"mixed line", "Casa بيت ok", "Casa \ufe96\ufef4\ufe91 ok"},
		{"two words", "בית שמש", "שמש תיב"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := Visual(tc.in); got != tc.want {
				t.Errorf("Visual(%q) = %q, want %q", tc.in, got, tc.want)
			}
		})
	}
}

func ExampleVisual() {
	fmt.Println(Visual("Sol בית"))
	// Output: Sol תיב
}
