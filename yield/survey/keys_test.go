package survey

import "testing"

func TestNearest(t *testing.T) {
	keys := Keys()
	tests := []struct{ in, want string }{
		{"losses.soiling", "losses.soiling_pct"},
		{"inverter.ac_power", "inverter.ac_power_w"},
		{"modul.power_w", "module.power_w"},
		{"colour", ""}, // nothing like it
	}
	for _, tc := range tests {
		if got := Nearest(tc.in, keys); got != tc.want {
			t.Errorf("nearest(%q) = %q, want %q", tc.in, got, tc.want)
		}
	}
	// Levenshtein distances by hand: kitten → sitting is 3 (the textbook example).
	if d := editDistance("kitten", "sitting"); d != 3 {
		t.Errorf("editDistance = %d, want 3", d)
	}
}
