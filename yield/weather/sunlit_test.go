package weather

import (
	"testing"
	"time"

	"sunstring/shading/sun"

	"gonum.org/v1/gonum/floats/scalar"
)

func TestSunlitPart(t *testing.T) {
	// The sunlit part of the sunrise and sunset hours against sun.RiseTransitSet (Reda &
	// Andreas 2004, appendix A.2). That reference times the upper limb with standard
	// refraction, this package the sun's centre with the observer's refraction: the sun's
	// radius (0.267°) takes 1–2 min to cross at these latitudes [calc], hence 150 s.
	cases := []struct {
		name string
		obs  sun.Observer
		day  time.Time
	}{
		{"47° N midsummer", sun.Observer{LatDeg: 47.07, LonDeg: 15.44, ElevationM: 360}, time.Date(2025, 6, 21, 12, 0, 0, 0, time.FixedZone("", 3600))},
		{"equator equinox", sun.Observer{LatDeg: 0, LonDeg: 0}, time.Date(2025, 3, 20, 12, 0, 0, 0, time.UTC)},
		{"34° S winter", sun.Observer{LatDeg: -33.9, LonDeg: 18.4}, time.Date(2025, 6, 21, 12, 0, 0, 0, time.FixedZone("", 7200))},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			d := sun.RiseTransitSet(c.day, c.obs)
			if d.Sunrise.IsZero() || d.Sunset.IsZero() {
				t.Fatalf("no sunrise or sunset on %v: the case would check nothing", c.day)
			}
			checked := 0
			start := time.Date(c.day.Year(), c.day.Month(), c.day.Day(), 0, 0, 0, 0, c.day.Location())
			ends := make([]time.Time, 24)
			for h := range ends {
				ends[h] = start.Add(time.Duration(h+1) * time.Hour)
			}
			suns := sunOver(ends, time.Hour, c.obs)
			for h, e := range ends {
				is := suns[h]
				switch {
				case !d.Sunrise.Before(e.Add(-time.Hour)) && d.Sunrise.Before(e):
					checked++
					want := e.Sub(d.Sunrise).Seconds()
					if !scalar.EqualWithinAbs(is.frac*3600, want, 150) {
						t.Errorf("sunrise hour ending %v: sunlit %.0f s, want %.0f ± 150 s", e, is.frac*3600, want)
					}
				case !d.Sunset.Before(e.Add(-time.Hour)) && d.Sunset.Before(e):
					checked++
					want := d.Sunset.Sub(e.Add(-time.Hour)).Seconds()
					if !scalar.EqualWithinAbs(is.frac*3600, want, 150) {
						t.Errorf("sunset hour ending %v: sunlit %.0f s, want %.0f ± 150 s", e, is.frac*3600, want)
					}
				case e.After(d.Sunrise.Add(time.Hour)) && e.Before(d.Sunset):
					if is.frac != 1 {
						t.Errorf("daytime hour ending %v: sunlit share %g, want 1", e, is.frac)
					}
				}
			}
			if checked != 2 {
				t.Errorf("checked %d sunrise/sunset hours, want 2", checked)
			}
		})
	}
}
