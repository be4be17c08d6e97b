package irradiance

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// TestPerezCoefficients checks the coefficient table through the model's output, not
// against a copy of itself. Each of the eight clearness bins is entered at two zenith angles
// (40° and 70°, different brightness Δ), and F1 and F2 are read back from the circumsolar and
// horizon components (F1 = Circumsolar·b/(DHI·a), F2 = Horizon/(DHI·sin β)), together with the
// sky diffuse on a plane tilted 30° with the sun 25° off its normal. The wanted values are hand
// calculations from the equations of Perez et al. (1990), Solar Energy 44(5):271–289 (ε, Δ,
// F1 = max(0, F11 + F12Δ + F13Z), F2 = F21 + F22Δ + F23Z) with the authors' seven-decimal
// coefficients, I0 1367 W/m² and the Kasten & Young (1989) air mass: regression values, to
// 1e-6 in F and 1e-3 W/m² in the sky diffuse. A wrong digit in the table moves at least one
// of them. The paper's own three-decimal values guard the two known typos below.
func TestPerezCoefficients(t *testing.T) {
	tests := []struct {
		name                  string
		zenith, dhi, dni      float64
		wantF1, wantF2, wantD float64
	}{
		{"bin 1, Z 40", 40, 300, 12.2, 0.116581, -0.054331, 280.5008}, // ε 1.030, Δ 0.2862
		{"bin 2, Z 40", 40, 280, 56.9, 0.206616, -0.021469, 272.7061}, // ε 1.150, Δ 0.2671
		{"bin 3, Z 40", 40, 250, 121.9, 0.291471, 0.021969, 254.2227}, // ε 1.360, Δ 0.2385
		{"bin 4, Z 40", 40, 200, 195.0, 0.397935, 0.070117, 213.5180}, // ε 1.720, Δ 0.1908
		{"bin 5, Z 40", 40, 150, 278.3, 0.564468, 0.160310, 173.1501}, // ε 2.370, Δ 0.1431
		{"bin 6, Z 40", 40, 120, 422.5, 0.703490, 0.232554, 147.0269}, // ε 3.600, Δ 0.1145
		{"bin 7, Z 40", 40, 100, 582.3, 0.656940, 0.248169, 122.1390}, // ε 5.300, Δ 0.0954
		{"bin 8, Z 40", 40, 80, 758.4, 0.477936, 0.226035, 93.2445},   // ε 8.000, Δ 0.0763
		{"bin 1, Z 70", 70, 150, 13.0, 0.103090, -0.063530, 161.7358}, // ε 1.030, Δ 0.3186
		{"bin 2, Z 70", 70, 140, 60.9, 0.147957, -0.034597, 163.7630}, // ε 1.150, Δ 0.2973
		{"bin 3, Z 70", 70, 120, 125.2, 0.183655, 0.007283, 150.2356}, // ε 1.360, Δ 0.2548
		{"bin 4, Z 70", 70, 100, 208.7, 0.247447, 0.059525, 138.7606}, // ε 1.720, Δ 0.2124
		{"bin 5, Z 70", 70, 70, 278.0, 0.372951, 0.158397, 115.6759},  // ε 2.370, Δ 0.1487
		{"bin 6, Z 70", 70, 50, 376.8, 0.498115, 0.268638, 96.1261},   // ε 3.600, Δ 0.1062
		{"bin 7, Z 70", 70, 40, 498.5, 0.485741, 0.328586, 77.2501},   // ε 5.300, Δ 0.0849
		{"bin 8, Z 70", 70, 30, 608.7, 0.350940, 0.374623, 51.6851},   // ε 8.001, Δ 0.0637
	}
	const tilt, incid = 30.0, 25.0
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := Sky{DHI: tc.dhi, DNI: tc.dni, GHI: tc.dhi + tc.dni*math.Cos(tc.zenith*deg), ZenithDeg: tc.zenith, DNIExtra: 1367}
			c := Transpose(Perez, s, incid, tilt)
			f1 := c.Circumsolar * math.Cos(tc.zenith*deg) / (tc.dhi * math.Cos(incid*deg))
			f2 := c.Horizon / (tc.dhi * math.Sin(tilt*deg))
			if !scalar.EqualWithinAbs(f1, tc.wantF1, 1e-6) || !scalar.EqualWithinAbs(f2, tc.wantF2, 1e-6) {
				t.Errorf("F1 %.6f F2 %.6f, want %.6f %.6f (hand calculation)", f1, f2, tc.wantF1, tc.wantF2)
			}
			if !scalar.EqualWithinAbs(c.SkyDiffuse(), tc.wantD, 1e-3) {
				t.Errorf("sky diffuse %.4f, want %.4f W/m² (hand calculation)", c.SkyDiffuse(), tc.wantD)
			}
		})
	}
	typos := []struct {
		name      string
		bin, k    int
		want, tol float64
	}{
		// Perez et al. (1990) Table 6 three-decimal values [pub]: bin 4 F23 = −0.014,
		// bin 7 F22 = −1.127.
		{"bin 4 F23 negative", 3, 5, -0.014, 0.0005},
		{"bin 7 F22 not -1.27234", 6, 4, -1.127, 0.0005},
	}
	for _, tc := range typos {
		t.Run(tc.name, func(t *testing.T) {
			if got := perezCoeffs[tc.bin][tc.k]; !scalar.EqualWithinAbs(got, tc.want, tc.tol) {
				t.Errorf("got %v, want %v ± %v", got, tc.want, tc.tol)
			}
		})
	}
	// Bin edges [pub], Perez et al. (1990) Table 1.
	edges := [7]float64{1.065, 1.230, 1.500, 1.950, 2.800, 4.500, 6.200}
	for i, e := range edges {
		if perezBin(e-1e-9) != i || perezBin(e) != i+1 {
			t.Errorf("edge %g: bins %d, %d, want %d, %d", e, perezBin(e-1e-9), perezBin(e), i, i+1)
		}
	}
}

// TestTransposeRegression checks the three sky models and the Perez plane-of-array total
// against regression values [calc] from the published formulas (Liu & Jordan 1963;
// Hay & Davies 1980; Perez et al. 1990 with the table above), I0 = 1367 W/m², albedo 0.2,
// Kasten–Young air mass, GHI = DHI + DNI cos Z: hand calculations, not published values.
// The values are printed to two decimals, hence ±0.01 W/m².
func TestTransposeRegression(t *testing.T) {
	tests := []struct {
		name                            string
		dhi, dni, zenith, incid, tilt   float64
		wantIso, wantHD, wantPerez, poa float64
	}{
		{"clear, low incidence", 100, 800, 30, 20, 30, 93.30, 102.20, 109.75, 872.13},
		{"mixed", 200, 500, 50, 30, 35, 181.92, 213.94, 236.87, 679.31},
		{"overcast-ish, low sun", 300, 100, 60, 45, 20, 290.95, 300.71, 324.89, 397.71},
	}
	const tol = 0.01
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := Sky{
				DNI: tc.dni, DHI: tc.dhi, ZenithDeg: tc.zenith,
				GHI:      tc.dhi + tc.dni*math.Cos(tc.zenith*deg),
				DNIExtra: 1367, Albedo: 0.2,
			}
			iso := Transpose(Isotropic, s, tc.incid, tc.tilt)
			hd := Transpose(HayDavies, s, tc.incid, tc.tilt)
			pz := Transpose(Perez, s, tc.incid, tc.tilt)
			for _, c := range []struct {
				model     string
				got, want float64
			}{
				{"isotropic sky", iso.SkyDiffuse(), tc.wantIso},
				{"hay-davies sky", hd.SkyDiffuse(), tc.wantHD},
				{"perez sky", pz.SkyDiffuse(), tc.wantPerez},
				{"perez POA", pz.Total(), tc.poa},
			} {
				if !scalar.EqualWithinAbs(c.got, c.want, tol) {
					t.Errorf("%s = %.3f, want %.2f ± %g", c.model, c.got, c.want, tol)
				}
			}
			// The isotropic model puts nothing in the anisotropic parts.
			if iso.Circumsolar != 0 || iso.Horizon != 0 || hd.Horizon != 0 {
				t.Errorf("anisotropic parts in simpler models: iso %+v, hd %+v", iso, hd)
			}
		})
	}
}

// dbHour holds the inputs of Duffie & Beckman (2013) Example 2.15.1 computed as the book
// does: latitude 40°, 20 February (n = 51), solar hour 9–10, slope 60° facing south,
// I = 1.04 MJ/m², ground reflectance 0.60.
type dbHour struct {
	ghi, dni, dhi, zenithDeg, incidenceDeg, dniExtra float64
}

func duffieBeckman2151() dbHour {
	const (
		lat   = 40 * deg
		slope = 60 * deg
		n     = 51
		iMJ   = 1.04 // MJ/m² in the hour [pub]
	)
	// Cooper's declination, Duffie & Beckman eq. 1.6.1a.
	dec := 23.45 * deg * math.Sin(2*math.Pi*(284+n)/365)
	// Extraterrestrial normal as in the book's eq. 1.4.1a (Gsc 1367).
	gon := 1367 * (1 + 0.033*math.Cos(2*math.Pi*n/365))
	// Hourly extraterrestrial on the horizontal, eq. 1.10.4, ω1 = −45°, ω2 = −30°.
	w1, w2 := -45*deg, -30*deg
	i0 := 12 * 3600 / math.Pi * gon * (math.Cos(lat)*math.Cos(dec)*(math.Sin(w2)-math.Sin(w1)) +
		(w2-w1)*math.Sin(lat)*math.Sin(dec)) / 1e6
	kt := iMJ / i0
	idMJ := ErbsDiffuseFraction(kt) * iMJ
	// Geometry at the hour's midpoint, ω = −37.5°; a south-facing plane at slope β sees
	// the sun as a horizontal plane at latitude φ − β (eq. 1.6.7a).
	w := -37.5 * deg
	cosZ := math.Cos(lat)*math.Cos(dec)*math.Cos(w) + math.Sin(lat)*math.Sin(dec)
	cosT := math.Cos(lat-slope)*math.Cos(dec)*math.Cos(w) + math.Sin(lat-slope)*math.Sin(dec)
	ghi := iMJ * 1e6 / 3600
	dhi := idMJ * 1e6 / 3600
	return dbHour{
		ghi: ghi, dhi: dhi, dni: (ghi - dhi) / cosZ,
		zenithDeg: math.Acos(cosZ) / deg, incidenceDeg: math.Acos(cosT) / deg,
		dniExtra: gon,
	}
}

func TestTransposeDuffieBeckman2151(t *testing.T) {
	h := duffieBeckman2151()
	s := Sky{DNI: h.dni, DHI: h.dhi, GHI: h.ghi, ZenithDeg: h.zenithDeg, DNIExtra: h.dniExtra, Albedo: 0.6}
	tests := []struct {
		name   string
		model  SkyModel
		wantMJ float64
		tol    float64
		reason string
	}{
		// [pub] IT = 1.18 MJ/m² with the book's own diffuse correlation; with the Erbs
		// split the isotropic result is 1.171 [calc], so ±0.015 covers the published value.
		{"isotropic vs book", Isotropic, 1.18, 0.015, "Duffie & Beckman Ex. 2.15.1 [pub]"},
		{"isotropic", Isotropic, 1.171, 0.002, "[calc] Erbs split, Liu & Jordan (1963)"},
		{"hay-davies", HayDavies, 1.251, 0.002, "[calc] Hay & Davies (1980)"},
		{"perez", Perez, 1.370, 0.002, "[calc] Perez et al. (1990)"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			gotMJ := Transpose(tc.model, s, h.incidenceDeg, 60).Total() * 3600 / 1e6
			if !scalar.EqualWithinAbs(gotMJ, tc.wantMJ, tc.tol) {
				t.Errorf("IT = %.4f MJ/m², want %.3f ± %g (%s)", gotMJ, tc.wantMJ, tc.tol, tc.reason)
			}
		})
	}
}

func TestTransposeAnalytic(t *testing.T) {
	clear := Sky{DNI: 800, DHI: 100, GHI: 100 + 800*math.Cos(30*deg), ZenithDeg: 30, DNIExtra: 1367, Albedo: 0.2}
	tests := []struct {
		name   string
		model  SkyModel
		sky    Sky
		incid  float64
		tilt   float64
		field  func(Components) float64
		want   float64
		tol    float64
		reason string
	}{
		{"vertical plane sees half the isotropic dome", Isotropic, clear, 60, 90,
			func(c Components) float64 { return c.Isotropic }, 50, 1e-9, "(1 + cos 90°)/2 = 1/2"},
		{"vertical plane sees half the ground", Isotropic, clear, 60, 90,
			func(c Components) float64 { return c.Ground }, clear.GHI * 0.2 / 2, 1e-9, "(1 − cos 90°)/2 = 1/2"},
		{"horizontal plane sees no ground", Perez, clear, 30, 0,
			func(c Components) float64 { return c.Ground }, 0, 1e-12, "1 − cos 0 = 0"},
		{"horizontal plane has no horizon band", Perez, clear, 30, 0,
			func(c Components) float64 { return c.Horizon }, 0, 1e-12, "sin 0 = 0"},
		{"sun behind the plane: no beam", Perez, clear, 100, 80,
			func(c Components) float64 { return c.Beam }, 0, 0, "cos θ < 0"},
		{"sun behind the plane: no circumsolar", HayDavies, clear, 100, 80,
			func(c Components) float64 { return c.Circumsolar }, 0, 0, "a = max(0, cos θ) = 0"},
		{"sun below horizon: no beam", Perez, Sky{DNI: 50, DHI: 20, GHI: 20, ZenithDeg: 95}, 40, 30,
			func(c Components) float64 { return c.Beam }, 0, 0, "zenith ≥ 90"},
		{"sun below horizon: no circumsolar", Perez, Sky{DNI: 50, DHI: 20, GHI: 20, ZenithDeg: 95}, 40, 30,
			func(c Components) float64 { return c.Circumsolar }, 0, 0, "zenith ≥ 90"},
		{"zero DNIExtra means the solar constant", HayDavies,
			Sky{DNI: 800, DHI: 100, GHI: 100 + 800*math.Cos(30*deg), ZenithDeg: 30, Albedo: 0.2}, 20, 30,
			func(c Components) float64 { return c.SkyDiffuse() }, 102.20, 0.01, "same as regression case 1"},
		{"zero sky is dark", Perez, Sky{}, 0, 30,
			func(c Components) float64 { return c.Total() }, 0, 0, "zero value"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := tc.field(Transpose(tc.model, tc.sky, tc.incid, tc.tilt))
			if !scalar.EqualWithinAbs(got, tc.want, tc.tol) {
				t.Errorf("got %.6f, want %.6f ± %g (%s)", got, tc.want, tc.tol, tc.reason)
			}
		})
	}
}

// randomSky draws a physically consistent sky: zenith 0–100°, DHI up to 500, DNI up to
// the extraterrestrial value times a clearness draw, GHI from closure.
func randomSky(rng *rand.Rand) Sky {
	doy := 1 + rng.IntN(365)
	i0 := ExtraterrestrialNormal(doy)
	z := rng.Float64() * 100
	dni := rng.Float64() * 0.8 * i0
	dhi := rng.Float64() * 500
	ghi := dhi + dni*math.Max(0, math.Cos(z*deg))
	if z >= 90 {
		dni = 0
		ghi = dhi
	}
	return Sky{DNI: dni, DHI: dhi, GHI: ghi, ZenithDeg: z, DNIExtra: i0, Albedo: rng.Float64() * 0.8}
}

func TestTransposeProperties(t *testing.T) {
	rng := rand.New(rand.NewPCG(20260101, 7))
	for i := range 50000 {
		s := randomSky(rng)
		incid := rng.Float64() * 180
		tilt := rng.Float64() * 90
		for _, m := range []SkyModel{Perez, HayDavies, Isotropic} {
			c := Transpose(m, s, incid, tilt)
			if c.Total() < 0 || c.SkyDiffuse() < -1e-9 || c.Beam < 0 || c.Ground < 0 || c.Circumsolar < 0 {
				t.Fatalf("case %d %v: negative %+v for %+v θ %g β %g", i, m, c, s, incid, tilt)
			}
			if math.IsNaN(c.Total()) {
				t.Fatalf("case %d %v: NaN for %+v", i, m, s)
			}
			if (incid >= 90 || s.ZenithDeg >= 90) && (c.Beam != 0 || c.Circumsolar != 0) {
				t.Fatalf("case %d %v: beam %g circumsolar %g with θ %g, Z %g", i, m, c.Beam, c.Circumsolar, incid, s.ZenithDeg)
			}
		}
	}
}

// TestTransposeHorizontal: on a horizontal plane the incidence angle is the zenith, the
// plane sees the whole sky and no ground, so beam + sky diffuse should return GHI.
// Isotropic is exact by construction and Hay–Davies because Rb = 1. For Perez the
// horizon term vanishes (sin 0) and the circumsolar a/b = 1 gives back the F1·DHI the
// isotropic part loses, so it is exact as well while b is not floored, i.e. for
// Z ≤ 85°. Tolerance 1e-9 W/m² (rounding) for all three.
func TestTransposeHorizontal(t *testing.T) {
	rng := rand.New(rand.NewPCG(99, 1))
	for i := range 20000 {
		s := randomSky(rng)
		s.ZenithDeg = rng.Float64() * 85
		s.GHI = s.DHI + s.DNI*math.Cos(s.ZenithDeg*deg)
		for _, m := range []SkyModel{Perez, HayDavies, Isotropic} {
			c := Transpose(m, s, s.ZenithDeg, 0)
			if got := c.Beam + c.SkyDiffuse(); !scalar.EqualWithinAbs(got, s.GHI, 1e-9) {
				t.Fatalf("case %d %v: beam + sky = %.6f, GHI %.6f (%+v)", i, m, got, s.GHI, s)
			}
		}
	}
}

// TestPerezOvercastNearIsotropic: under an overcast sky (DNI = 0, so ε = 1, bin 1) with
// the sun above 30° elevation and brightness Δ ≤ 0.2, bin 1 of the table gives
// 0 ≤ F1 ≤ 0.5877·0.2 = 0.118 and −0.083 ≤ F2 ≤ −0.045 [calc]. With a/b ≤ 1/cos 60° = 2
// and the isotropic view factor in [0.5, 1], Perez minus isotropic lies within
// DHI·(0.118·1.5 + 0) above and DHI·(0.118 + 0.083) below, so the tolerance is
// 0.2·DHI: a bound from the model's own coefficients, not a fitted figure. A wrong bin or
// a sign error in F2 breaks it.
func TestPerezOvercastNearIsotropic(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for i := range 20000 {
		z := rng.Float64() * 60
		dhi := 10 + rng.Float64()*(0.2*1367/AirMass(z)-10) // keeps Δ ≤ 0.2
		s := Sky{DHI: dhi, GHI: dhi, ZenithDeg: z, DNIExtra: 1367, Albedo: 0.2}
		tilt := rng.Float64() * 90
		incid := rng.Float64() * 180
		p := Transpose(Perez, s, incid, tilt).SkyDiffuse()
		iso := Transpose(Isotropic, s, incid, tilt).SkyDiffuse()
		if !scalar.EqualWithinAbs(p, iso, 0.2*dhi) {
			t.Fatalf("case %d: Perez %.2f vs isotropic %.2f (Z %g, β %g, θ %g, DHI %g)", i, p, iso, z, tilt, incid, dhi)
		}
	}
}

func TestSkyModelNames(t *testing.T) {
	tests := []struct {
		name    string
		in      string
		want    SkyModel
		wantErr bool
	}{
		{"perez", "perez", Perez, false},
		{"hay-davies", "hay-davies", HayDavies, false},
		{"isotropic", "isotropic", Isotropic, false},
		{"empty is default", "", Perez, false},
		{"unknown", "klucher", Perez, true},
		{"case matters", "Perez", Perez, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got, err := ParseSkyModel(tc.in)
			if (err != nil) != tc.wantErr || got != tc.want {
				t.Fatalf("ParseSkyModel(%q) = %v, %v", tc.in, got, err)
			}
			if err != nil && !errors.Is(err, ErrUnknownSkyModel) {
				t.Errorf("error %v does not wrap ErrUnknownSkyModel", err)
			}
			if err == nil && tc.in != "" && got.String() != tc.in {
				t.Errorf("round trip %q → %q", tc.in, got.String())
			}
		})
	}
	if got := SkyModel(7).String(); got != "SkyModel(7)" {
		t.Errorf("invalid model String() = %q", got)
	}
	var zero SkyModel
	if zero != Perez {
		t.Errorf("zero SkyModel is %v, want perez", zero)
	}
}

// TestPerezNegativeSkyClamp exercises the documented guard. The inputs are deliberately
// beyond physical skies (DHI 1371, DNI 3907 at Z 60° give ε ≈ 2.3, bin 5, and Δ ≈ 2), so
// that F2 = 0.2256 − 0.4620·2 + 0.0012·1.047 ≈ −0.70 [calc, bin 5 of the table] and F1 = 0:
// on a vertical plane the raw sky diffuse DHI·(0.5 − 0.70) would be negative. The guard
// raises Horizon until the sky diffuse is zero.
func TestPerezNegativeSkyClamp(t *testing.T) {
	s := Sky{DHI: 1371, DNI: 3907, GHI: 1371 + 3907*0.5, ZenithDeg: 60, DNIExtra: 1367}
	c := Transpose(Perez, s, 120, 90)
	if !scalar.EqualWithinAbs(c.SkyDiffuse(), 0, 1e-9) {
		t.Errorf("sky diffuse %g, want 0 (guard)", c.SkyDiffuse())
	}
	if !(c.Horizon < 0) || !scalar.EqualWithinAbs(c.Horizon, -(c.Isotropic+c.Circumsolar), 1e-9) {
		t.Errorf("horizon %g should be the negative of isotropic + circumsolar %g", c.Horizon, c.Isotropic+c.Circumsolar)
	}
	// Without the guard the horizon term would be DHI·F2·sin 90° ≈ −960 [calc]; the
	// isotropic part DHI·(1 − F1)/2 = 685.5 stays as the model gives it.
	if !scalar.EqualWithinAbs(c.Isotropic, 1371*0.5, 1e-9) {
		t.Errorf("isotropic %g, want %g (F1 = 0 in bin 5 at Δ ≈ 2)", c.Isotropic, 1371*0.5)
	}
}

// TestPerezLowSun holds the low-sun record that once gave a cell negative light: GHI 67,
// DNI 45, DHI 65 W/m² in the last minutes before sunset. At Z = 89.8° the air mass is 35.1
// (Kasten & Young 1989), Δ = 65·35.1/1367 = 1.67 and ε = 1.14 (bin 2), so the fit gives
// F1 = 0.1299 + 0.6826·1.67 − 0.1514·1.567 = 1.031 and F2 = 0.046 [hand calculation from
// Perez et al. 1990, a regression value]. F1 is bounded at 1, so the isotropic background is
// exactly zero and the circumsolar part is the whole DHI scaled by a/b.
func TestPerezLowSun(t *testing.T) {
	s := Sky{GHI: 67, DNI: 45, DHI: 65, ZenithDeg: 89.8, DNIExtra: 1367, Albedo: 0.2}
	tests := []struct {
		name        string
		incid, tilt float64
		field       func(Components) float64
		want, tol   float64
		reason      string
	}{
		{"isotropic bounded at zero", 60, 35, func(c Components) float64 { return c.Isotropic }, 0, 1e-12,
			"F1 bounded at 1"},
		{"circumsolar is the whole diffuse times a/b", 60, 35, func(c Components) float64 { return c.Circumsolar },
			65 * 0.5 / math.Cos(85*deg), 1e-9, "DHI·1·cos 60°/cos 85°"},
		{"horizon band from F2", 60, 35, func(c Components) float64 { return c.Horizon },
			65 * 0.0459 * math.Sin(35*deg), 0.01, "DHI·F2·sin β with F2 = 0.0459 [calc]"},
		{"facing away: sky light is the horizon band alone", 100, 35, func(c Components) float64 { return c.SkyDiffuse() },
			65 * 0.0459 * math.Sin(35*deg), 0.01, "a = 0, isotropic 0"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := tc.field(Transpose(Perez, s, tc.incid, tc.tilt))
			if !scalar.EqualWithinAbsOrRel(got, tc.want, tc.tol, 1e-9) {
				t.Errorf("got %.6f, want %.6f ± %g (%s)", got, tc.want, tc.tol, tc.reason)
			}
		})
	}
	// A shaded cell on a plane facing away, seeing part of the dome and all of the horizon
	// band: never negative light.
	for _, z := range []float64{88, 89, 89.5, 89.8, 89.95} {
		s.ZenithDeg = z
		c := Transpose(Perez, s, 100, 35)
		direct, diffuse := c.OnPlane(View{Sky: 0.3, Horizon: 1, Ground: 0.5, IAMBeam: 1, IAMSky: 0.95, IAMGround: 0.7})
		if direct < 0 || diffuse < 0 || c.Isotropic < 0 {
			t.Errorf("Z %g: direct %g diffuse %g, components %+v", z, direct, diffuse, c)
		}
	}
}

// TestOnPlane checks the split against hand sums of its definition and the clamp of a
// horizon band darker than the dome light the point sees.
func TestOnPlane(t *testing.T) {
	c := Components{Beam: 500, Isotropic: 80, Circumsolar: 40, Horizon: -30, Ground: 20}
	tests := []struct {
		name                 string
		v                    View
		wantDirect, wantDiff float64
	}{
		{"open plane", View{1, 1, 1, 0.9, 0.95, 0.7}, 540 * 0.9, (80-30)*0.95 + 20*0.7},
		{"horizon darker than the dome seen: sky clamps at 0", View{0.2, 1, 1, 1, 1, 1}, 540, 20},
		{"nothing seen", View{}, 0, 0},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			d, f := c.OnPlane(tc.v)
			if !scalar.EqualWithinAbs(d, tc.wantDirect, 1e-9) || !scalar.EqualWithinAbs(f, tc.wantDiff, 1e-9) {
				t.Errorf("got %g, %g, want %g, %g (sums of the definition)", d, f, tc.wantDirect, tc.wantDiff)
			}
		})
	}
}

// TestNonNeg: nonNeg is math.Max(0, x) to the bit, special values included.
func TestNonNeg(t *testing.T) {
	for _, tc := range []struct {
		name string
		x    float64
	}{
		{"positive", 812.5},
		{"tiny positive", math.SmallestNonzeroFloat64},
		{"negative", -3.25},
		{"zero", 0},
		{"negative zero", math.Copysign(0, -1)},
		{"infinite", math.Inf(1)},
		{"minus infinite", math.Inf(-1)},
		{"NaN", math.NaN()},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got, want := nonNeg(tc.x), math.Max(0, tc.x)
			if math.Float64bits(got) != math.Float64bits(want) && !(math.IsNaN(got) && math.IsNaN(want)) {
				t.Errorf("nonNeg(%v) = %v (%#x), math.Max gives %v (%#x)", tc.x, got, math.Float64bits(got), want, math.Float64bits(want))
			}
		})
	}
}
