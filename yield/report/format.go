package report

import (
	"fmt"
	"math"
	"strings"
)

// Thousands formats x with d decimals and comma thousands separators ("12,345.6"), the way
// the proposal and the charts print every energy.
func Thousands(x float64, d int) string {
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return "–"
	}
	s := fmt.Sprintf("%.*f", d, x)
	neg := strings.HasPrefix(s, "-")
	s = strings.TrimPrefix(s, "-")
	intPart, frac := s, ""
	if i := strings.IndexByte(s, '.'); i >= 0 {
		intPart, frac = s[:i], s[i:]
	}
	var b strings.Builder
	if neg && strings.Trim(s, "0.") != "" {
		b.WriteByte('-')
	}
	for i, r := range intPart {
		if i > 0 && (len(intPart)-i)%3 == 0 {
			b.WriteByte(',')
		}
		b.WriteRune(r)
	}
	return b.String() + frac
}

// Pct formats a percentage with one decimal and its unit ("12.3 %").
func Pct(x float64) string { return Thousands(x, 1) + " %" }

// Count says n things with the noun's singular or plural ("1 module", "2 modules").
func Count(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}
