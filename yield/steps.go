package yield

import (
	"time"

	"sunstring/shading/sun"
)

// stepSun returns the sun for the interval (start, end]: at the interval's midpoint, or, for
// the intervals in which the sun rises or sets, at the midpoint of the sunlit part (the
// convention package weather documents), so that the hour's light is not credited to a sun
// below the horizon. lit is the sunlit fraction of the interval.
func stepSun(start, end time.Time, o sun.Observer) (p sun.Position, lit float64) {
	a, b := sun.At(start, o), sun.At(end, o)
	mid := start.Add(end.Sub(start) / 2)
	if a.Up() == b.Up() {
		p = sun.At(mid, o)
		if p.Up() {
			return p, 1
		}
		// Up at neither end but possibly up in between (polar edge cases): treat as dark.
		return p, 0
	}
	// Bisect for the crossing to within a few seconds.
	lo, hi := start, end
	for hi.Sub(lo) > 4*time.Second {
		m := lo.Add(hi.Sub(lo) / 2)
		if sun.At(m, o).Up() == a.Up() {
			lo = m
		} else {
			hi = m
		}
	}
	cross := lo.Add(hi.Sub(lo) / 2)
	var s0, s1 time.Time
	if a.Up() { // sunset within the interval
		s0, s1 = start, cross
	} else { // sunrise
		s0, s1 = cross, end
	}
	p = sun.At(s0.Add(s1.Sub(s0)/2), o)
	return p, float64(s1.Sub(s0)) / float64(end.Sub(start))
}
