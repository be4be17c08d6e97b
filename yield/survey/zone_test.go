package survey

import (
	"strings"
	"testing"
	"time"
)

func TestZoneWarning(t *testing.T) {
	for _, c := range []struct {
		zone string
		lon  float64
		warn bool
	}{
		// Standard offsets (IANA tz database) against longitude/15°:
		{"Europe/Vienna", 15.43, false},       // UTC+1 at 15° E: 0 h apart
		{"Europe/Madrid", -3.7, false},        // UTC+1 at 3.7° W: 1.2 h apart (common practice)
		{"Asia/Urumqi", 87.6, false},          // UTC+6 at 87.6° E: 0.2 h apart
		{"Asia/Shanghai", 87.6, false},        // UTC+8 used in western China: 2.2 h apart
		{"America/New_York", 15.43, true},     // UTC−5 at 15° E: 6 h apart
		{"Pacific/Kiritimati", -157.4, false}, // UTC+14 at 157.4° W: −10.49 h against +14 h, 0.49 h once wrapped to a day
		{"Africa/Johannesburg", 18.4, false},  // UTC+2 at 18.4° E: 0.8 h apart
	} {
		z, err := time.LoadLocation(c.zone)
		if err != nil {
			t.Fatal(err)
		}
		got := zoneWarning(&Config{Timezone: c.zone, Zone: z}, c.lon)
		want := c.warn
		if (got != "") != want || (got != "" && !strings.Contains(got, c.zone)) {
			t.Errorf("%s at %.1f°: warning %q, want one: %v", c.zone, c.lon, got, want)
		}
	}
}
