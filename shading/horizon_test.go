package shading

import (
	"bytes"
	"context"
	"errors"
	"os"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/geo"
)

// testdata/horizon.csv is an invented profile (eight points every 45°).
func readTestHorizon(t *testing.T) *Horizon {
	t.Helper()
	b, err := os.ReadFile("testdata/horizon.csv")
	if err != nil {
		t.Fatal(err)
	}
	h, err := ReadHorizon(bytes.NewReader(b), "horizon.csv")
	if err != nil {
		t.Fatal(err)
	}
	return h
}

func TestHorizonElevation(t *testing.T) {
	h := readTestHorizon(t)
	cases := []struct {
		name string
		az   float64
		want float64 // analytic: linear interpolation between the file's points
		tol  float64
	}{
		{"on a point", 90, 8, 1e-12},
		{"midway 0..45", 22.5, 3.25, 1e-12},
		{"three quarters 225..270", 258.75, 1.5 + 0.75*10.5, 1e-12},
		{"across north 315..360", 337.5, 4, 1e-12},
		{"negative wraps", -22.5, 4, 1e-12},
		{"above 360 wraps", 382.5, 3.25, 1e-12},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			if got := h.ElevationDeg(c.az); !scalar.EqualWithinAbs(got, c.want, c.tol) {
				t.Errorf("ElevationDeg(%g) = %g, want %g", c.az, got, c.want)
			}
		})
	}
	t.Run("zero value is flat", func(t *testing.T) {
		var z *Horizon
		if got := z.ElevationDeg(123) + (&Horizon{}).ElevationDeg(5); !scalar.EqualWithinAbs(got, 0, 0) { // documented zero value
			t.Errorf("zero horizon elevation %g, want 0", got)
		}
	})
	t.Run("one point is constant", func(t *testing.T) {
		one, err := HorizonFromPoints([]float64{100}, []float64{7})
		if err != nil {
			t.Fatal(err)
		}
		if got := one.ElevationDeg(300); !scalar.EqualWithinAbs(got, 7, 0) { // a single point has nothing to interpolate
			t.Errorf("got %g, want 7", got)
		}
	})
}

func TestReadHorizonErrors(t *testing.T) {
	cases := []struct {
		name, in string
		want     error
		line     int
	}{
		{"empty", "", ErrHorizonEmpty, 0},
		{"header only", "azimuth_deg,elevation_deg\n", ErrHorizonEmpty, 0},
		{"wrong header", "az,el\n0,1\n", ErrHorizonHeader, 1},
		{"not a number", "azimuth_deg,elevation_deg\n0,1\n10,x\n", ErrHorizonNumber, 3},
		{"azimuth 360", "azimuth_deg,elevation_deg\n360,1\n", ErrHorizonRange, 2},
		{"elevation 90", "azimuth_deg,elevation_deg\n0,90\n", ErrHorizonRange, 2},
		{"negative elevation", "azimuth_deg,elevation_deg\n0,-1\n", ErrHorizonRange, 2},
		{"NaN", "azimuth_deg,elevation_deg\nNaN,1\n", ErrHorizonRange, 2},
		{"unsorted", "azimuth_deg,elevation_deg\n0,1\n20,2\n10,3\n", ErrHorizonOrder, 4},
		{"duplicate", "azimuth_deg,elevation_deg\n0,1\n0,2\n", ErrHorizonOrder, 3},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			_, err := ReadHorizon(strings.NewReader(c.in), "h.csv")
			var he *HorizonError
			if !errors.Is(err, c.want) || !errors.As(err, &he) || !he.BadInput() {
				t.Fatalf("err %v, want %v as a *HorizonError", err, c.want)
			}
			if !scalar.EqualWithinAbs(float64(he.Line), float64(c.line), 0) { // the line the user must fix
				t.Errorf("line %d, want %d (%v)", he.Line, c.line, err)
			}
		})
	}
	t.Run("wrong field count", func(t *testing.T) {
		_, err := ReadHorizon(strings.NewReader("azimuth_deg,elevation_deg\n0,1,2\n"), "h.csv")
		var he *HorizonError
		if !errors.As(err, &he) || he.Line != 2 {
			t.Errorf("err %v, want a *HorizonError on line 2", err)
		}
	})
}

// The far horizon darkens a step exactly when the sun is below it (analytic).
func TestHorizonBlocksBeam(t *testing.T) {
	h := readTestHorizon(t)
	cases := []struct {
		name   string
		az, el float64
		want   float64
	}{
		{"west below 12°", 270, 11, 0},
		{"west above 12°", 270, 13, 1},
		{"south above 0°", 180, 0.5, 1},
		{"east just below 8°", 90, 7.99, 0},
	}
	mod := flatModule("M", geo.Vec3{U: 1}, 1, 1)
	for _, c := range cases {
		for _, p := range paths {
			t.Run(c.name+" "+p.name, func(t *testing.T) {
				sc, err := NewScene(nil, []geo.Module{mod}, Options{Horizon: h, BruteForce: p.brute})
				if err != nil {
					t.Fatal(err)
				}
				r, err := sc.Compute(context.Background(), []Step{{Sun: sunAt(c.az, c.el)}}, nil)
				if err != nil {
					t.Fatal(err)
				}
				if got := r.LitFraction(0, 0); !scalar.EqualWithinAbs(got, c.want, 0) { // all or nothing
					t.Errorf("lit %g, want %g", got, c.want)
				}
			})
		}
	}
}

// FuzzReadHorizon: no panic, and whatever is accepted keeps the invariants (elevation in
// [0, 90) everywhere, azimuths increasing).
func FuzzReadHorizon(f *testing.F) {
	if b, err := os.ReadFile("testdata/horizon.csv"); err == nil {
		f.Add(b)
	}
	f.Add([]byte("azimuth_deg,elevation_deg\n0,1\n"))
	f.Add([]byte("azimuth_deg,elevation_deg\n359.9,89.9\n"))
	f.Fuzz(func(t *testing.T, b []byte) {
		h, err := ReadHorizon(bytes.NewReader(b), "fuzz")
		if err != nil {
			return
		}
		for i := range h.az {
			if i > 0 && h.az[i] <= h.az[i-1] {
				t.Fatalf("azimuths not increasing: %v", h.az)
			}
		}
		for az := -10.0; az < 370; az += 7.3 {
			if e := h.ElevationDeg(az); !(e >= 0 && e < 90) {
				t.Fatalf("elevation %g at %g", e, az)
			}
		}
	})
}
