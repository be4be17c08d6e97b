package survey

import "testing"

// TestParallelWords: an input with one string says so, not "1 string in parallel".
func TestParallelWords(t *testing.T) {
	tests := []struct {
		name string
		n    int
		want string
	}{
		{"one string", 1, "1 string"},
		{"two strings", 2, "2 strings in parallel"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := parallel(tc.n); got != tc.want {
				t.Errorf("parallel(%d) = %q, want %q", tc.n, got, tc.want)
			}
		})
	}
}
