package sun

import (
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"
)

func TestAtSPAExample(t *testing.T) {
	// Reda & Andreas (2004), NREL/TP-560-34302, Table A5.1: topocentric zenith 50.11162,
	// azimuth 194.34024, incidence 25.18700 (slope 30, facing 10° east of south: aspect 170).
	// The interim low-accuracy method is good to about 0.01° (Meeus 1998, ch. 25).
	temp := 11.0
	dt := 67.0
	o := Observer{LatDeg: 39.742476, LonDeg: -105.1786, ElevationM: 1830.14, PressureMbar: 820, TempC: &temp, DeltaTSec: &dt}
	tm := time.Date(2003, 10, 17, 12, 30, 30, 0, time.FixedZone("MST", -7*3600))
	p := At(tm, o)
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"zenith", p.Zenith.Degrees(), 50.11162},
		{"azimuth", p.Azimuth.Degrees(), 194.34024},
		{"incidence", Incidence(p, 30, 170).Degrees(), 25.18700},
	} {
		if !scalar.EqualWithinAbs(c.got, c.want, 0.02) {
			t.Errorf("%s = %.5f, want %.5f ± 0.02", c.name, c.got, c.want)
		}
	}
}
