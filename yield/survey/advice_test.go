package survey

import "testing"

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
