package survey

import (
	"testing"
	"time"
)

// TestDocumentDate: the site file's date wins, else the fallback's day in UTC, else none.
func TestDocumentDate(t *testing.T) {
	late := time.Date(2026, 12, 5, 23, 30, 0, 0, time.FixedZone("", -3600)) // 6 Dec, 00:30 UTC
	tests := []struct {
		name     string
		date     string
		fallback time.Time
		want     time.Time
	}{
		{"site file's date", "2026-05-04", late, time.Date(2026, 5, 4, 0, 0, 0, 0, time.UTC)},
		{"fallback's day in UTC", "", late, time.Date(2026, 12, 6, 0, 0, 0, 0, time.UTC)},
		{"neither", "", time.Time{}, time.Time{}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			cfg := &Config{Proposal: Proposal{Date: tc.date}}
			if got := documentDate(cfg, tc.fallback); !got.Equal(tc.want) {
				t.Errorf("documentDate = %v, want %v", got, tc.want)
			}
		})
	}
}
