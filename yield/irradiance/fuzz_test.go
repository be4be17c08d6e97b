package irradiance

import (
	"errors"
	"math"
	"testing"
)

// FuzzParseSkyModel: any string either parses to a model whose String round-trips, or
// fails with ErrUnknownSkyModel; nothing panics.
func FuzzParseSkyModel(f *testing.F) {
	for _, s := range []string{"", "perez", "hay-davies", "isotropic", "PEREZ", "hay davies", "\x00"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		m, err := ParseSkyModel(s)
		if err != nil {
			if !errors.Is(err, ErrUnknownSkyModel) {
				t.Fatalf("error %v does not wrap ErrUnknownSkyModel", err)
			}
			return
		}
		if s != "" && m.String() != s {
			t.Fatalf("round trip %q → %q", s, m.String())
		}
	})
}

// FuzzTranspose: for any finite inputs every model returns finite components with a
// non-negative total, and zero beam when the sun is behind the plane or below the horizon.
func FuzzTranspose(f *testing.F) {
	f.Add(800.0, 100.0, 793.0, 30.0, 1367.0, 0.2, 20.0, 30.0)
	f.Add(0.0, 300.0, 300.0, 89.0, 1400.0, 0.6, 95.0, 90.0)
	f.Add(3907.0, 1371.0, 3324.0, 60.0, 1367.0, 0.0, 120.0, 90.0)
	f.Fuzz(func(t *testing.T, dni, dhi, ghi, z, i0, albedo, incid, tilt float64) {
		for _, v := range []float64{dni, dhi, ghi, z, i0, albedo, incid, tilt} {
			if v != v || v > 1e6 || v < -1e6 { // finite, physically bounded magnitudes only
				return
			}
		}
		s := Sky{DNI: dni, DHI: dhi, GHI: ghi, ZenithDeg: z, DNIExtra: i0, Albedo: albedo}
		for _, m := range []SkyModel{Perez, HayDavies, Isotropic} {
			c := Transpose(m, s, incid, tilt)
			tot := c.Total()
			if tot != tot || tot < -1e-9*(1+math.Abs(dhi)+math.Abs(ghi)+math.Abs(dni)) {
				t.Fatalf("%v: total %g for %+v θ %g β %g", m, tot, s, incid, tilt)
			}
		}
	})
}
