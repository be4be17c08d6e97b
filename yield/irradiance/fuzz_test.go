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

// into maps any finite x onto [lo, hi], so that every fuzz input is a physically valid
// value rather than a rejected one.
func into(x, lo, hi float64) float64 {
	return lo + math.Mod(math.Abs(x), hi-lo+1e-9)
}

// FuzzIrradianceChain runs the chain from a weather record to the light on one cell over
// every physically valid combination: GHI, DNI and DHI each 0..1500 W/m² with no closure
// imposed (weather files do not always close), sun elevation −5..90°, any sun azimuth, plane
// tilt 0..90° and aspect, albedo 0..1, day of year, the cell's view factors and modifiers
// 0..1. Every component must be finite, none but Horizon negative, and the light the cell
// receives, direct and diffuse, never negative.
func FuzzIrradianceChain(f *testing.F) {
	// The low-sun record that once gave a cell −3.36 W/m²: GHI 67, DNI 45, DHI 65 at the
	// sunset hour, on a plane facing away from the sun.
	f.Add(67.0, 45.0, 65.0, 0.2, 300.0, 35.0, 180.0, 0.2, 172.0, 0.3, 1.0, 0.0)
	f.Add(900.0, 850.0, 100.0, 60.0, 180.0, 30.0, 180.0, 0.2, 80.0, 1.0, 1.0, 1.0)
	f.Add(300.0, 0.0, 300.0, 10.0, 90.0, 90.0, 0.0, 0.8, 1.0, 0.0, 1.0, 0.5)
	f.Add(1500.0, 1500.0, 1500.0, -5.0, 0.0, 0.0, 0.0, 1.0, 365.0, 1.0, 0.0, 1.0)
	f.Fuzz(func(t *testing.T, ghi, dni, dhi, elev, sunAz, tilt, aspect, albedo, doy, vSky, vHor, vGnd float64) {
		for _, v := range []float64{ghi, dni, dhi, elev, sunAz, tilt, aspect, albedo, doy, vSky, vHor, vGnd} {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return
			}
		}
		ghi, dni, dhi = into(ghi, 0, 1500), into(dni, 0, 1500), into(dhi, 0, 1500)
		z := 90 - into(elev, -5, 90)
		sunAz, aspect = into(sunAz, 0, 360), into(aspect, 0, 360)
		tilt = into(tilt, 0, 90)
		v := View{Sky: into(vSky, 0, 1), Horizon: into(vHor, 0, 1), Ground: into(vGnd, 0, 1),
			IAMBeam: into(vSky+vHor, 0, 1), IAMSky: into(vHor+vGnd, 0, 1), IAMGround: into(vGnd+vSky, 0, 1)}
		// Incidence on the plane: cos θ = cos Z cos β + sin Z sin β cos(γs − γ) (Duffie &
		// Beckman eq. 1.6.3, azimuths from north here).
		cosT := math.Cos(z*deg)*math.Cos(tilt*deg) + math.Sin(z*deg)*math.Sin(tilt*deg)*math.Cos((sunAz-aspect)*deg)
		incid := math.Acos(math.Max(-1, math.Min(1, cosT))) / deg
		s := Sky{DNI: dni, DHI: dhi, GHI: ghi, ZenithDeg: z,
			DNIExtra: ExtraterrestrialNormal(int(into(doy, 1, 366))), Albedo: into(albedo, 0, 1)}
		for _, m := range []SkyModel{Perez, HayDavies, Isotropic} {
			c := Transpose(m, s, incid, tilt)
			for _, x := range []float64{c.Beam, c.Isotropic, c.Circumsolar, c.Horizon, c.Ground} {
				if math.IsNaN(x) || math.IsInf(x, 0) {
					t.Fatalf("%v: non-finite component in %+v for %+v θ %g β %g", m, c, s, incid, tilt)
				}
			}
			if c.Beam < 0 || c.Isotropic < 0 || c.Circumsolar < 0 || c.Ground < 0 || c.Isotropic+c.Horizon < 0 {
				t.Fatalf("%v: negative component %+v for %+v θ %g β %g", m, c, s, incid, tilt)
			}
			direct, diffuse := c.OnPlane(v)
			if !(direct >= 0) || !(diffuse >= 0) || math.IsInf(direct+diffuse, 0) {
				t.Fatalf("%v: cell light direct %g diffuse %g from %+v with view %+v", m, direct, diffuse, c, v)
			}
		}
	})
}
