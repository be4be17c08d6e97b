package sun

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"

	"github.com/soniakeys/meeus/v3/coord"
	"github.com/soniakeys/meeus/v3/globe"
	mnut "github.com/soniakeys/meeus/v3/nutation"
	"github.com/soniakeys/meeus/v3/parallax"
	"github.com/soniakeys/meeus/v3/sidereal"
	"github.com/soniakeys/meeus/v3/solar"
	"github.com/soniakeys/unit"
	"gonum.org/v1/gonum/floats/scalar"
)

// TestAgainstMeeus holds the SPA against github.com/soniakeys/meeus/v3 v3.0.1, an independent
// implementation of Meeus, Astronomical Algorithms (2nd ed. 1998), at 60 seeded times (1900–
// 2100) and places. Each check names the chapter and the accuracy the library or book claims;
// all comparisons are geocentric or topocentric without refraction.
func TestAgainstMeeus(t *testing.T) {
	rng := rand.New(rand.NewPCG(1998, 25))
	const arcsec = 1.0 / 3600
	for i := range 60 {
		tm := time.Unix(rng.Int64N(200*365*86400)-100*365*86400+946728000, 0).UTC()
		o := Observer{LatDeg: rng.Float64()*170 - 85, LonDeg: rng.Float64()*360 - 180, ElevationM: rng.Float64() * 4000}
		jd := JulianDay(tm)
		dt := DeltaT(tm)
		g := GeocentricAt(jd, dt)
		jde := g.JDE
		name := tm.Format(time.RFC3339)

		check := func(what string, got, want, tol float64) {
			t.Helper()
			if !scalar.EqualWithinAbs(got, want, tol) {
				t.Errorf("case %d %s %s: got %.9f, want %.9f ± %g (diff %.3g)", i, name, what, got, want, tol, got-want)
			}
		}

		// Ch. 22, IAU 1980 nutation: the same 63-term series as the SPA's Table A4.3 (the
		// library drops no term the SPA keeps), so agreement to 1e-5″ is float noise and the
		// polynomial terms of the arguments (the library's cubic term of the Moon's anomaly
		// differs, 1/5620 vs 1/56250, worth 1e-7″ near 2000).
		dpsi, deps := mnut.Nutation(jde)
		check("Δψ deg", g.NutationLon.Degrees(), dpsi.Deg(), 1e-5*arcsec)
		check("Δε deg", g.NutationObl.Degrees(), deps.Deg(), 1e-5*arcsec)

		// Ch. 22, eq. 22.3 (Laskar 1986), mean obliquity: the SPA uses the same polynomial.
		eps0 := g.Obliquity.Degrees() - g.NutationObl.Degrees()
		check("ε0 deg", eps0, mnut.MeanObliquityLaskar(jde).Deg(), 1e-9)

		// Ch. 12, apparent sidereal time at Greenwich: mean time by eqs. 12.3/12.4 (IAU 1982)
		// plus the nutation in right ascension. The library takes the nutation at UT and the
		// IAU 1980 mean obliquity; both shift ν by under 2e-7°.
		nu := sidereal.Apparent(jd).Angle().Deg()
		check("ν deg", g.SiderealTime.Degrees(), nu, 5e-7)

		// Ch. 13, eqs. 13.3–13.4: our eqs. 30–31 (ecliptic to equatorial) against coord.
		sEps, cEps := math.Sincos(g.Obliquity.Radians())
		beta := -g.HelioLat.Degrees()
		a, d := coord.EclToEq(unit.AngleFromDeg(g.ApparentLon.Degrees()), unit.AngleFromDeg(beta), sEps, cEps)
		check("α from λ,β deg", normDeg(a.Deg()), g.RightAscension.Degrees(), 1e-9)
		check("δ from λ,β deg", d.Deg(), g.Declination.Degrees(), 1e-9)

		// Ch. 25, low-accuracy solar coordinates: the book states 0.01° for the apparent
		// longitude and hence α, δ; the SPA is far better, so this bounds the library's error.
		lam := solar.ApparentLongitude((jde - j2000) / 36525).Deg()
		if dl := normDeg180(g.ApparentLon.Degrees() - normDeg(lam)); !scalar.EqualWithinAbs(dl, 0, 0.01) {
			t.Errorf("case %d %s: λ differs from ch. 25 by %.4f°", i, name, dl)
		}
		ma, md := solar.ApparentEquatorial(jde)
		if da := normDeg180(g.RightAscension.Degrees() - ma.Deg()); !scalar.EqualWithinAbs(da, 0, 0.01) {
			t.Errorf("case %d %s: α differs from ch. 25 by %.4f°", i, name, da)
		}
		check("δ vs ch. 25 deg", g.Declination.Degrees(), md.Deg(), 0.01)

		// Ch. 40, eqs. 40.2–40.3, topocentric parallax with the IAU 1976 ellipsoid (ch. 11,
		// the SPA's b/a = 0.99664719 and a = 6378140 m). Meeus counts longitude west
		// positive; its routine takes sidereal time from its last argument, so it gets the
		// UT Julian Day. Rigorous formulae on both sides: 1e-7°.
		p := At(tm, o)
		rs, rc := globe.Earth76.ParallaxConstants(unit.AngleFromDeg(o.LatDeg), o.ElevationM)
		ta, td := parallax.Topocentric(unit.RAFromDeg(g.RightAscension.Degrees()), unit.AngleFromDeg(g.Declination.Degrees()),
			g.Radius, rs, rc, unit.AngleFromDeg(-o.LonDeg), jd)
		if da := normDeg180(p.RightAscension.Degrees() - ta.Deg()); !scalar.EqualWithinAbs(da, 0, 1e-7) {
			t.Errorf("case %d %s: α′ differs from ch. 40 by %.3g°", i, name, da)
		}
		check("δ′ deg", p.Declination.Degrees(), td.Deg(), 1e-7)

		// Ch. 13, eqs. 13.5–13.6, equatorial to horizontal (azimuth from the south, westward)
		// with the library's sidereal time: true elevation and azimuth, 5e-7° (the ν bound).
		az, alt := coord.EqToHz(ta, td, unit.AngleFromDeg(o.LatDeg), unit.AngleFromDeg(-o.LonDeg), sidereal.Apparent(jd))
		e0 := p.Elevation().Degrees() - p.RefractionDelta.Degrees()
		check("true elevation deg", e0, alt.Deg(), 5e-7)
		if dz := normDeg180(p.Azimuth.Degrees() - (az.Deg() + 180)); !scalar.EqualWithinAbs(dz*math.Cos(e0*deg), 0, 5e-7) {
			t.Errorf("case %d %s: azimuth %.7f vs ch. 13 %.7f", i, name, p.Azimuth.Degrees(), normDeg(az.Deg()+180))
		}
	}
}
