package yield

import (
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/shading/sun"
	"sunstring/yield/irradiance"
	"sunstring/yield/weather"
)

func TestPlaneIrradiation(t *testing.T) {
	site := weather.Site{LatDeg: 47.05, LonDeg: 15.43, ElevationM: 400, Zone: time.FixedZone("", 3600)}
	obs := sun.Observer{LatDeg: site.LatDeg, LonDeg: site.LonDeg, ElevationM: site.ElevationM}
	w, err := weather.FromMonthly(site, [12]float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29},
		[12]float64{-1, 1, 5, 10, 15, 18, 20, 19.6, 15, 10, 4, 0})
	if err != nil {
		t.Fatal(err)
	}
	ghi := 0.0
	for _, m := range w.Monthly() {
		ghi += m.GHIKWhM2
	}
	planes := []Plane{{0, 180}, {35, 180}, {35, 0}, {35, 90}}
	got := PlaneIrradiation(w, obs, site.Zone, irradiance.Isotropic, 0.2, planes)
	// Analytic: a horizontal plane under the isotropic model receives DNI·cos Z + DHI = GHI
	// (the synthetic year splits GHI that way; the sun is taken at the same instants, so only
	// the sunrise and sunset hours differ a little).
	if !scalar.EqualWithinRel(got[0], ghi, 0.005) {
		t.Errorf("horizontal %.1f kWh/m², want the year's GHI %.1f ± 0.5 %%", got[0], ghi)
	}
	// At 47° N a south face at 35° receives more than the horizontal (about 10–15 % more,
	// common practice), an east face less, a north face far less (55–65 % of the south face,
	// common practice).
	s, n, e := got[1], got[2], got[3]
	if !(s > 1.05*got[0] && s < 1.2*got[0]) {
		t.Errorf("south 35° %.0f against horizontal %.0f: want 5–20 %% more", s, got[0])
	}
	if r := n / s; r < 0.45 || r > 0.7 {
		t.Errorf("north/south %.2f, want 0.45–0.70", r)
	}
	if r := e / s; r < 0.75 || r > 0.9 {
		t.Errorf("east/south %.2f, want 0.75–0.90", r)
	}
	t.Logf("GHI %.0f; horizontal %.0f, south %.0f, north %.0f (%.0f %%), east %.0f (%.0f %%)", ghi, got[0], s, n, 100*n/s, e, 100*e/s)
}
