package irradiance

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

func TestExtraterrestrialNormal(t *testing.T) {
	tests := []struct {
		name    string
		doy     int
		want    float64
		tol     float64
		comment string
	}{
		// [calc] from Spencer (1971) series with Gsc 1367: B = 0 → 1.035050·1367 = 1414.913.
		{"1 January", 1, 1414.913, 0.01, "perihelion side, series at B = 0"},
		// [calc] B = 2π·182/365 → E0 = 0.966624.
		{"2 July", 183, 1321.37, 0.01, "aphelion side"},
		// 366 wraps to 1 January (documented behaviour).
		{"day 366 wraps", 366, 1414.913, 0.01, "series is 365-periodic"},
		{"day 0 wraps to 31 Dec", 0, ExtraterrestrialNormal(365), 1e-12, "wrap below 1"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := ExtraterrestrialNormal(tc.doy)
			if !scalar.EqualWithinAbs(got, tc.want, tc.tol) {
				t.Errorf("ExtraterrestrialNormal(%d) = %.4f, want %.4f ± %g (%s)", tc.doy, got, tc.want, tc.tol, tc.comment)
			}
		})
	}
}

// TestExtraterrestrialNormalSimpleForm checks the series against the one-term form
// Gsc·(1 + 0.033 cos(360n/365)) of Duffie & Beckman (2013) eq. 1.4.1a; the handbook
// states the two agree to within the accuracy needed for engineering, and they differ by
// at most about 0.25 % [calc], so 0.3 % catches a wrong phase or sign.
func TestExtraterrestrialNormalSimpleForm(t *testing.T) {
	for n := 1; n <= 365; n++ {
		simple := SolarConstant * (1 + 0.033*math.Cos(2*math.Pi*float64(n)/365))
		got := ExtraterrestrialNormal(n)
		if !scalar.EqualWithinRel(got, simple, 0.003) {
			t.Fatalf("day %d: Spencer %.2f vs one-term %.2f differ by more than 0.3 %%", n, got, simple)
		}
	}
}

func TestAirMass(t *testing.T) {
	tests := []struct {
		name      string
		zenithDeg float64
		want      float64
		tol       float64
	}{
		// Kasten & Young (1989) formula, checks [calc]: hand calculation from the
		// published formula, a regression value (AM = 1/[cos Z + 0.50572(96.07995 − Z)^−1.6364]).
		{"zenith", 0, 0.9997, 1e-4},
		{"60 deg", 60, 1.9943, 1e-4},
		{"80 deg", 80, 5.5860, 1e-4},
		{"horizon", 90, 37.9196, 1e-4},
		// Documented guard: beyond 90° the horizon value is returned.
		{"below horizon clamps", 95, 37.9196, 1e-4},
		{"far below horizon clamps", 170, 37.9196, 1e-4},
		// Documented: negative zenith is read as its absolute value.
		{"negative zenith", -60, 1.9943, 1e-4},
		// Common practice: at 30° the Earth's curvature hardly matters, so the air mass
		// stays within 0.1 % of the plane-parallel secant 1/cos 30° = 1.1547.
		{"30 deg near secant", 30, 1.1547, 0.001},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := AirMass(tc.zenithDeg)
			if !scalar.EqualWithinAbs(got, tc.want, tc.tol) {
				t.Errorf("AirMass(%g) = %.5f, want %.5f ± %g", tc.zenithDeg, got, tc.want, tc.tol)
			}
		})
	}
	if !math.IsNaN(AirMass(math.NaN())) {
		t.Errorf("AirMass(NaN) should be NaN")
	}
}

func TestErbsDiffuseFraction(t *testing.T) {
	tests := []struct {
		name string
		kt   float64
		want float64
		tol  float64
	}{
		// Erbs, Klein & Duffie (1982) correlation; checks [calc] by hand from the published polynomial,
		// printed to 4 decimals, hence ±5e-5.
		{"overcast 0.10", 0.10, 0.9910, 5e-5},
		{"0.30", 0.30, 0.9486, 5e-5},
		{"0.50", 0.50, 0.6591, 5e-5},
		{"0.70", 0.70, 0.2440, 5e-5},
		{"very clear 0.90", 0.90, 0.1650, 5e-5},
		// Documented: non-positive kt is fully diffuse.
		{"zero", 0, 1, 0},
		{"negative", -0.3, 1, 0},
		// The published pieces join almost continuously: 0.9802 (linear) vs 0.9798
		// (quartic) at 0.22 and 0.1650 vs 0.165 at 0.80 [calc]. A typo in a coefficient
		// would open a gap of more than 0.01.
		{"just above 0.22", 0.22 + 1e-9, 1 - 0.09*0.22, 0.001},
		{"just below 0.80", 0.80, 0.165, 0.001},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := ErbsDiffuseFraction(tc.kt)
			if !scalar.EqualWithinAbs(got, tc.want, tc.tol) {
				t.Errorf("ErbsDiffuseFraction(%g) = %.5f, want %.5f ± %g", tc.kt, got, tc.want, tc.tol)
			}
		})
	}
}

func TestErbs(t *testing.T) {
	tests := []struct {
		name             string
		ghi, zenithDeg   float64
		doy              int
		wantDNI, wantDHI float64
		tol              float64
		reason           string
	}{
		// [calc] from Erbs et al. (1982): doy 172, I0 = 1322.9, Z 30 → kt = 800/1145.7 =
		// 0.6983, kd = 0.2461, DHI = 196.9, DNI = (800 − 196.9)/cos 30 = 696.4.
		{"clear summer noon", 800, 30, 172, 696.4, 196.9, 0.5, "regression [calc]"},
		// [calc] kt = 100/(I0 cos 60) ≈ 0.15 → kd = 0.9865 → DNI = 2.7.
		{"overcast", 100, 60, 172, 2.70, 98.65, 0.05, "regression [calc]"},
		// Documented guard: sun below horizon, all diffuse.
		{"night twilight", 5, 95, 172, 0, 5, 0, "guard"},
		{"no light", 0, 30, 172, 0, 0, 0, "guard"},
		{"negative ghi", -3, 30, 172, 0, 0, 0, "guard: sensor offset at night"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			dni, dhi := Erbs(tc.ghi, tc.zenithDeg, tc.doy)
			if !scalar.EqualWithinAbs(dni, tc.wantDNI, tc.tol) || !scalar.EqualWithinAbs(dhi, tc.wantDHI, tc.tol) {
				t.Errorf("Erbs(%g, %g, %d) = (%.3f, %.3f), want (%.3f, %.3f) ± %g (%s)",
					tc.ghi, tc.zenithDeg, tc.doy, dni, dhi, tc.wantDNI, tc.wantDHI, tc.tol, tc.reason)
			}
		})
	}
}

// TestErbsProperties checks on random inputs that the split conserves GHI (closure
// DHI + DNI cos Z = GHI to 1e-9 W/m², rounding only), never goes negative and never
// exceeds the extraterrestrial normal irradiance.
func TestErbsProperties(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range 20000 {
		ghi := rng.Float64() * 1300
		z := rng.Float64() * 100
		doy := 1 + rng.IntN(366)
		dni, dhi := Erbs(ghi, z, doy)
		cz := math.Max(0, math.Cos(z*math.Pi/180))
		if z >= 90 {
			cz = 0
		}
		if dni < 0 || dhi < 0 {
			t.Fatalf("case %d: negative component (%g, %g) for ghi %g z %g", i, dni, dhi, ghi, z)
		}
		if dni > ExtraterrestrialNormal(doy)+1e-9 {
			t.Fatalf("case %d: dni %g exceeds I0", i, dni)
		}
		if !scalar.EqualWithinAbs(dhi+dni*cz, ghi, 1e-9) {
			t.Fatalf("case %d: closure %g + %g·%g != %g", i, dhi, dni, cz, ghi)
		}
	}
}
