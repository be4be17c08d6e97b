package sun

import (
	"errors"
	"math"
	"testing"
	"time"

	"gonum.org/v1/gonum/floats/scalar"
)

func TestObserverValidate(t *testing.T) {
	// Ranges of Reda & Andreas (2004), section 3.14 / reference code input checks.
	hot, cold, dt := 6001.0, -273.0, 9000.0
	for _, c := range []struct {
		name string
		o    Observer
		want error
	}{
		{"zero value", Observer{}, nil},
		{"SPA example", func() Observer { _, o := spaExample(); return o }(), nil},
		{"latitude 91", Observer{LatDeg: 91}, ErrLatitude},
		{"latitude NaN", Observer{LatDeg: math.NaN()}, ErrLatitude},
		{"longitude -181", Observer{LonDeg: -181}, ErrLongitude},
		{"pressure negative", Observer{PressureMbar: -1}, ErrPressure},
		{"temperature too hot", Observer{TempC: &hot}, ErrTemp},
		{"absolute zero", Observer{TempC: &cold}, ErrTemp},
		{"delta T 9000 s", Observer{DeltaTSec: &dt}, ErrDeltaT},
		{"elevation 200 km", Observer{ElevationM: 200e3}, ErrElevation},
	} {
		if err := c.o.Validate(); !errors.Is(err, c.want) {
			t.Errorf("%s: Validate() = %v, want %v", c.name, err, c.want)
		}
	}
}

func TestObserverDefaults(t *testing.T) {
	// The zero Observer uses the standard atmosphere: 1013.25 mbar at sea level and 12 °C
	// (ISO 2533 sea-level pressure [pub]; 12 °C is this package's documented default). At 1500 m
	// the barometric formula gives 845.6 mbar ([calc] from ISO 2533, eq. for the troposphere).
	for _, c := range []struct {
		name      string
		o         Observer
		want, tol float64
	}{
		{"sea level", Observer{}, 1013.25, 1e-9},
		{"1500 m", Observer{ElevationM: 1500}, 845.56, 0.05},
		{"given", Observer{ElevationM: 1500, PressureMbar: 900}, 900, 0},
	} {
		if got := c.o.pressure(); !scalar.EqualWithinAbs(got, c.want, c.tol) {
			t.Errorf("%s: pressure %.3f, want %.3f ± %g", c.name, got, c.want, c.tol)
		}
	}
	if got := (Observer{}).temp(); got != 12 {
		t.Errorf("default temperature %g, want 12", got)
	}
	// Refraction at true elevation 0 under the standard atmosphere: eq. 42 gives
	// 1013.25/1010 · 283/285 · 1.02/(60 tan(10.3/5.11 °)) = 0.4812° [calc]; the classical
	// horizon refraction is about 0.57° (from memory), the formula being a fit above 0°.
	if got := refraction(0, 1013.25, 12); !scalar.EqualWithinAbs(got, 0.4812, 5e-5) {
		t.Errorf("refraction at the horizon %.4f°, want 0.4812", got)
	}
	if got := refraction(-1, 1013.25, 12); got != 0 {
		t.Errorf("refraction below the horizon limit %.4f°, want 0", got)
	}
	// The zero Position is at the zenith: up, elevation 90°, vector straight up.
	var p Position
	if !p.Up() || p.Elevation().Degrees() != 90 || p.Vector()[2] != 1 {
		t.Errorf("zero Position: up %v elevation %v vector %v", p.Up(), p.Elevation(), p.Vector())
	}
	// Incidence on a horizontal surface is the zenith angle; facing the sun it is zero.
	q := At(time.Date(2024, 6, 1, 10, 0, 0, 0, time.UTC), Observer{LatDeg: 47, LonDeg: 15})
	if got := Incidence(q, 0, 123).Degrees(); !scalar.EqualWithinAbs(got, q.Zenith.Degrees(), 1e-9) {
		t.Errorf("incidence on a flat surface %g, zenith %g", got, q.Zenith.Degrees())
	}
	if got := Incidence(q, q.Zenith.Degrees(), q.Azimuth.Degrees()).Degrees(); !scalar.EqualWithinAbs(got, 0, 1e-6) {
		t.Errorf("incidence on a surface facing the sun %g", got)
	}
}
