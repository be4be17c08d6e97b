package weather

import (
	"math"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/shading/sun"
)

// shifted returns a copy of s whose GHI is moved by k records: k > 0 stamps every value k
// hours late (wrapping around the year); a fractional k blends the two neighbouring shifts.
func shifted(s *Series, k float64) *Series {
	out := *s
	out.Records = make([]Record, len(s.Records))
	copy(out.Records, s.Records)
	n := len(s.Records)
	lo := int(math.Floor(k))
	w := k - float64(lo)
	for i := range out.Records {
		a := s.Records[((i-lo)%n+n)%n].GHI
		b := s.Records[((i-lo-1)%n+n)%n].GHI
		out.Records[i].GHI = (1-w)*a + w*b
	}
	return &out
}

func TestNoonShift(t *testing.T) {
	site := Site{LatDeg: 47.05, LonDeg: 15.43, ElevationM: 400, Zone: time.FixedZone("UTC+1", 3600)}
	obs := sun.Observer{LatDeg: site.LatDeg, LonDeg: site.LonDeg, ElevationM: site.ElevationM}
	clear := ClearSky(site, nil)
	monthly, err := FromMonthly(site, [12]float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29},
		[12]float64{-1, 1, 5, 10, 15, 18, 20, 19.6, 15, 10, 4, 0})
	if err != nil {
		t.Fatal(err)
	}
	// Far from its zone's meridian: solar noon near 13:50 on the clock, which must not matter.
	westSite := Site{LatDeg: 43.3, LonDeg: -8.4, Zone: time.FixedZone("UTC+1", 3600)}
	west := ClearSky(westSite, nil)
	westObs := sun.Observer{LatDeg: westSite.LatDeg, LonDeg: westSite.LonDeg}

	tests := []struct {
		name  string
		s     *Series
		obs   sun.Observer
		wantH float64
		tol   float64
		warn  string // fragment of the warning; "" for none
	}{
		// Analytic: the clear-sky model depends on the zenith only, symmetric about noon, so
		// its light centres on solar noon; moving every value by k hours moves it by k.
		{"clear sky as is", clear, obs, 0, 1.0 / 60, ""},
		{"clear sky an hour late", shifted(clear, 1), obs, 1, 1.0 / 60, "after solar noon"},
		{"clear sky an hour early", shifted(clear, -1), obs, -1, 1.0 / 60, "END of its hour"},
		{"clear sky half an hour late", shifted(clear, 0.5), obs, 0.5, 1.0 / 60, "30 minutes after"},
		{"clear sky a quarter hour late", shifted(clear, 0.25), obs, 0.25, 1.0 / 60, ""},
		{"west of the zone meridian", west, westObs, 0, 1.0 / 60, ""},
		// The synthetic year shares each day by the Collares-Pereira & Rabl profile, symmetric
		// in the hour angle: centred on solar noon too.
		{"synthetic year", monthly, obs, 0, 2.0 / 60, ""},
		{"synthetic year an hour late", shifted(monthly, 1), obs, 1, 2.0 / 60, "60 minutes after"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			ns, ok := tc.s.NoonShift(tc.obs)
			if !ok {
				t.Fatal("no verdict on a whole year")
			}
			t.Logf("shift %.2f min, spread %.1f min, %d days", ns.Hours*60, ns.SpreadHours*60, ns.Days)
			if !scalar.EqualWithinAbs(ns.Hours, tc.wantH, tc.tol) {
				t.Errorf("shift %.4f h, want %.4f ± %.4f", ns.Hours, tc.wantH, tc.tol)
			}
			if ns.Days < 80 || ns.Days > 95 {
				t.Errorf("%d days used, want the clearest quarter of about 365", ns.Days)
			}
			w := tc.s.NoonWarning("w.csv", tc.obs)
			switch {
			case tc.warn == "" && w != "":
				t.Errorf("unexpected warning %q", w)
			case tc.warn != "" && (!strings.Contains(w, tc.warn) || !strings.HasPrefix(w, "w.csv: ")):
				t.Errorf("warning %q, want one naming w.csv and holding %q", w, tc.warn)
			}
		})
	}
}

func TestNoonShiftShortSeries(t *testing.T) {
	obs := sun.Observer{LatDeg: 47, LonDeg: 15}
	s := ClearSky(Site{LatDeg: 47, LonDeg: 15}, nil)
	s.Records = s.Records[:6*24] // six days: under a week
	if _, ok := s.NoonShift(obs); ok {
		t.Error("a verdict from six days")
	}
	var empty *Series
	if _, ok := empty.NoonShift(obs); ok {
		t.Error("a verdict from a nil series")
	}
}
