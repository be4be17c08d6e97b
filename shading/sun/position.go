package sun

import (
	"math"
	"time"

	"github.com/golang/geo/s1"
)

// Observer is a place on the Earth and the state of its air.
//
// The zero value is on the equator at the prime meridian at sea level, with the standard
// atmosphere (1013.25 mbar, 12 °C) and ΔT from the Espenak & Meeus model.
type Observer struct {
	LatDeg     float64 // geodetic latitude, north positive
	LonDeg     float64 // longitude, east positive
	ElevationM float64 // height above the ellipsoid (or mean sea level), metres

	// PressureMbar is the annual mean air pressure; 0 means derived from ElevationM by the
	// standard atmosphere.
	PressureMbar float64
	// TempC is the annual mean air temperature; nil means 12 °C.
	TempC *float64
	// DeltaTSec is TT − UT in seconds; nil means the Espenak & Meeus polynomial model.
	DeltaTSec *float64
}

// Position is the sun in the local horizon frame. The zero value is at the zenith, due north.
type Position struct {
	Zenith  s1.Angle // topocentric, refraction-corrected
	Azimuth s1.Angle // clockwise from true north, [0, 360°)

	// Fields below are intermediate results, exposed for checks against published examples.
	JD              float64  // Julian Day (UT)
	Declination     s1.Angle // topocentric
	HourAngle       s1.Angle // topocentric, positive west of the meridian
	RefractionDelta s1.Angle // elevation added by refraction
	EquationOfTime  time.Duration
}

// Elevation is 90° minus the zenith angle.
func (p Position) Elevation() s1.Angle { return 90*s1.Degree - p.Zenith }

// Up reports whether the sun's centre is above the horizon.
func (p Position) Up() bool { return p.Zenith < 90*s1.Degree }

// Vector returns the unit vector toward the sun in east-north-up coordinates.
func (p Position) Vector() [3]float64 {
	el := p.Elevation().Radians()
	az := p.Azimuth.Radians()
	return [3]float64{math.Sin(az) * math.Cos(el), math.Cos(az) * math.Cos(el), math.Sin(el)}
}

// Incidence returns the angle between the sun and the normal of a surface tilted tiltDeg
// from horizontal whose downhill side faces aspectDeg (clockwise from north).
func Incidence(p Position, tiltDeg, aspectDeg float64) s1.Angle {
	z := p.Zenith.Radians()
	b := tiltDeg * math.Pi / 180
	daz := p.Azimuth.Radians() - aspectDeg*math.Pi/180
	c := math.Cos(z)*math.Cos(b) + math.Sin(b)*math.Sin(z)*math.Cos(daz)
	return s1.Angle(math.Acos(math.Max(-1, math.Min(1, c))))
}

// AtEach returns the sun's position for each instant in ts. It gives the same results as
// calling At for each instant; it exists so that implementations may share work across
// instants that are close together.
func AtEach(ts []time.Time, o Observer) []Position {
	out := make([]Position, len(ts))
	for i, t := range ts {
		out[i] = At(t, o)
	}
	return out
}

func (o Observer) pressure() float64 {
	if o.PressureMbar > 0 {
		return o.PressureMbar
	}
	// International standard atmosphere, barometric formula (ISO 2533).
	return 1013.25 * math.Pow(1-2.25577e-5*o.ElevationM, 5.25588)
}

func (o Observer) temp() float64 {
	if o.TempC != nil {
		return *o.TempC
	}
	return 12
}
