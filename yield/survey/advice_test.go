package survey

import (
	"strings"
	"testing"

	"sunstring/yield"
)

// Layout names say the string lengths in plain words, longest first, without numbering.
func TestLengthWords(t *testing.T) {
	for _, c := range []struct {
		name string
		lens []int
		want string
	}{
		{"one string", []int{12}, "one string of 12"},
		{"unequal strings", []int{8, 14, 13}, "strings of 14, 13 and 8"},
		{"two unequal", []int{9, 13}, "strings of 13 and 9"},
		{"equal strings", []int{23, 23, 23}, "3 strings of 23"},
		{"groups", []int{22, 23, 23, 22, 23, 23}, "4 strings of 23 and 2 of 22"},
		{"a single longest", []int{10, 12, 10}, "1 string of 12 and 2 of 10"},
	} {
		t.Run(c.name, func(t *testing.T) {
			if got := lengthWords(c.lens); got != c.want {
				t.Errorf("lengthWords(%v) = %q, want %q", c.lens, got, c.want)
			}
		})
	}
}

func TestJoinWords(t *testing.T) {
	for _, c := range []struct {
		in   []string
		want string
	}{
		{nil, ""},
		{[]string{"G.1.1"}, "G.1.1"},
		{[]string{"G.1.1", "G.2.1"}, "G.1.1 and G.2.1"},
		{[]string{"a", "b", "c"}, "a, b and c"},
	} {
		if got := joinWords(c.in); got != c.want {
			t.Errorf("joinWords(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}

// The advice says what a chosen layout's extra cable buys when it needs much more string
// cable than the roof order (more than 20 m and half as much again), and nothing otherwise.
func TestCableNote(t *testing.T) {
	lay := func(name string, kwh, cable float64) RankedLayout {
		return RankedLayout{Name: name, Result: yield.LayoutResult{ACkWh: kwh}, CableM: cable}
	}
	for _, c := range []struct {
		name string
		ls   []RankedLayout
		want string // a part of the note; empty: no note
	}{
		{"scattered strings on a large roof", []RankedLayout{lay("searched", 179451, 1412), lay(roofOrderName, 176844, 129)},
			"about 1,283 m more string cable than \"roof order\" for 2,607 kWh a year more"},
		{"a few metres more", []RankedLayout{lay("searched", 8600, 15), lay(roofOrderName, 8560, 2)}, ""},
		{"twice the cable but under 20 m more", []RankedLayout{lay("searched", 8600, 30), lay(roofOrderName, 8560, 12)}, ""},
		{"more than 20 m but not half as much again", []RankedLayout{lay("searched", 50000, 130), lay(roofOrderName, 49000, 100)}, ""},
		{"the roof order chosen", []RankedLayout{lay(roofOrderName, 8560, 0.1)}, ""},
		{"no roof order listed", []RankedLayout{lay("searched", 8600, 400)}, ""},
	} {
		t.Run(c.name, func(t *testing.T) {
			got := cableNote(c.ls, 0)
			if c.want == "" && got != "" || c.want != "" && !strings.Contains(got, c.want) {
				t.Errorf("note %q, want one containing %q", got, c.want)
			}
		})
	}
}
