package sun

import (
	"errors"
	"fmt"
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

// Errors reported by Observer.Validate.
var (
	ErrLatitude  = errors.New("sun: latitude outside [-90, 90] degrees")
	ErrLongitude = errors.New("sun: longitude outside [-180, 180] degrees")
	ErrElevation = errors.New("sun: elevation outside [-6500000, 100000] metres")
	ErrPressure  = errors.New("sun: pressure outside [0, 5000] mbar")
	ErrTemp      = errors.New("sun: temperature outside (-273, 6000] °C")
	ErrDeltaT    = errors.New("sun: ΔT outside [-8000, 8000] seconds")
)

// Validate reports the first input outside the ranges the algorithm accepts (those of
// Reda & Andreas 2004, section 3.14, with a finite upper elevation). At does not validate:
// it returns meaningless angles, never a panic, for such inputs.
func (o Observer) Validate() error {
	check := func(name string, v, lo, hi float64, err error) error {
		if !(v >= lo && v <= hi) { // also rejects NaN
			return fmt.Errorf("%s %g: %w", name, v, err)
		}
		return nil
	}
	if err := check("latitude", o.LatDeg, -90, 90, ErrLatitude); err != nil {
		return err
	}
	if err := check("longitude", o.LonDeg, -180, 180, ErrLongitude); err != nil {
		return err
	}
	if err := check("elevation", o.ElevationM, -6500000, 100000, ErrElevation); err != nil {
		return err
	}
	if err := check("pressure", o.PressureMbar, 0, 5000, ErrPressure); err != nil {
		return err
	}
	if o.TempC != nil {
		if err := check("temperature", *o.TempC, -272.999, 6000, ErrTemp); err != nil {
			return err
		}
	}
	if o.DeltaTSec != nil {
		if err := check("delta T", *o.DeltaTSec, -8000, 8000, ErrDeltaT); err != nil {
			return err
		}
	}
	return nil
}

// Position is the sun in the local horizon frame. The zero value is at the zenith, due north.
type Position struct {
	Zenith  s1.Angle // topocentric, refraction-corrected
	Azimuth s1.Angle // clockwise from true north, [0, 360°)

	// Fields below are intermediate results, exposed for checks against published examples.
	JD              float64  // Julian Day (UT)
	RightAscension  s1.Angle // topocentric α′, [0, 360°)
	Declination     s1.Angle // topocentric δ′
	HourAngle       s1.Angle // topocentric H′, positive west of the meridian, (−180°, 180°]
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
// from horizontal whose downhill side faces aspectDeg (clockwise from north); Reda & Andreas
// (2004), eq. 47, with their surface azimuth (from south, west positive) equal to aspect − 180°.
func Incidence(p Position, tiltDeg, aspectDeg float64) s1.Angle {
	z := p.Zenith.Radians()
	b := tiltDeg * deg
	daz := p.Azimuth.Radians() - aspectDeg*deg
	c := math.Cos(z)*math.Cos(b) + math.Sin(b)*math.Sin(z)*math.Cos(daz)
	return s1.Angle(math.Acos(math.Max(-1, math.Min(1, c))))
}

// At computes the topocentric, refraction-corrected position of the sun at t with the full
// Solar Position Algorithm (Reda & Andreas 2004, rev. 2008).
func At(t time.Time, o Observer) Position {
	jd := JulianDay(t)
	g := GeocentricAt(jd, o.deltaT(t))
	s := newSite(o)
	return s.position(jd, apparentOf(g))
}

// apparent holds what the topocentric step needs from the geocentric one.
type apparent struct {
	alphaDeg, deltaRad float64 // geocentric α, δ
	nuDeg              float64 // apparent sidereal time at Greenwich
	r                  float64 // AU
	eotMin             float64
}

func apparentOf(g Geocentric) apparent {
	dpsiCosEps := g.NutationLon.Degrees() * math.Cos(g.Obliquity.Radians())
	alpha := g.RightAscension.Degrees()
	return apparent{
		alphaDeg: alpha,
		deltaRad: g.Declination.Radians(),
		nuDeg:    g.SiderealTime.Degrees(),
		r:        g.Radius,
		eotMin:   equationOfTimeMin(g.meanLonDeg, alpha, dpsiCosEps),
	}
}

// site is an Observer with its constant terms worked out once.
type site struct {
	lonDeg              float64
	sinLat, cosLat      float64
	x, y                float64 // parallax terms, eqs. 38–39
	pressureMbar, tempC float64
}

func newSite(o Observer) site {
	lat := o.LatDeg * deg
	sinLat, cosLat := math.Sincos(lat)
	// Eqs. 35–39: geocentric position of the observer on the reference ellipsoid
	// (flattening ratio b/a = 0.99664719, equatorial radius 6378140 m).
	u := math.Atan(0.99664719 * math.Tan(lat))
	sinU, cosU := math.Sincos(u)
	h := o.ElevationM / 6378140
	return site{
		lonDeg:       o.LonDeg,
		sinLat:       sinLat,
		cosLat:       cosLat,
		x:            cosU + h*cosLat,
		y:            0.99664719*sinU + h*sinLat,
		pressureMbar: o.pressure(),
		tempC:        o.temp(),
	}
}

// position is steps 3.9 to 3.14 of the SPA: from the geocentric apparent place to the
// topocentric, refraction-corrected zenith and azimuth.
func (s *site) position(jd float64, a apparent) Position {
	hDeg := normDeg(a.nuDeg + s.lonDeg - a.alphaDeg) // eq. 32
	xi := 8.794 / (3600 * a.r) * deg                 // eq. 33, equatorial horizontal parallax
	// ξ and the parallax in right ascension Δα stay below 5e-5 rad, so their sines, cosines
	// and arc tangents are taken from Taylor series (exact to 1e-19 rad): AtEach runs this per
	// instant, and these save half its trigonometric calls.
	sinXi := xi - xi*xi*xi/6
	sinH, cosH := math.Sincos(hDeg * deg)
	sinD, cosD := math.Sincos(a.deltaRad)
	den := cosD - s.x*sinXi*cosH // > 0: the sun's |δ| < 24°
	z := -s.x * sinXi * sinH / den
	dAlpha := z - z*z*z/3 // eq. 40
	sinDA, cosDA := dAlpha-dAlpha*dAlpha*dAlpha/6, 1-dAlpha*dAlpha/2
	num := (sinD - s.y*sinXi) * cosDA
	deltaP := math.Atan2(num, den) // eq. 41
	hyp := math.Sqrt(num*num + den*den)
	sinDp, cosDp := num/hyp, den/hyp
	hP := hDeg*deg - dAlpha // eq. 43
	sinHp := sinH*cosDA - cosH*sinDA
	cosHp := cosH*cosDA + sinH*sinDA
	e0 := math.Asin(s.sinLat*sinDp+s.cosLat*cosDp*cosHp) / deg // eq. 44
	de := refraction(e0, s.pressureMbar, s.tempC)              // eq. 45
	gamma := math.Atan2(sinHp, cosHp*s.sinLat-sinDp/cosDp*s.cosLat)
	return Position{
		Zenith:          s1.Angle((90 - e0 - de) * deg),
		Azimuth:         s1.Angle(normDeg(gamma/deg+180) * deg),
		JD:              jd,
		RightAscension:  s1.Angle(normDeg(a.alphaDeg+dAlpha/deg) * deg),
		Declination:     s1.Angle(deltaP),
		HourAngle:       s1.Angle(normDeg180(hP/deg) * deg),
		RefractionDelta: s1.Angle(de * deg),
		EquationOfTime:  time.Duration(a.eotMin * float64(time.Minute)),
	}
}

// Standard values of Reda & Andreas (2004), appendix A.2, for the sun's limb at the horizon.
const (
	sunRadiusDeg     = 0.26667
	stdRefractionDeg = 0.5667
)

// refraction returns the elevation, in degrees, that the atmosphere adds to a true elevation
// e0 (degrees), after Reda & Andreas (2004), eq. 42; zero once the sun's upper limb is below the
// horizon even with standard refraction, as in the report's reference code revision of 2007.
func refraction(e0, pressureMbar, tempC float64) float64 {
	if e0 < -(sunRadiusDeg + stdRefractionDeg) {
		return 0
	}
	return pressureMbar / 1010 * 283 / (273 + tempC) * 1.02 / (60 * math.Tan((e0+10.3/(e0+5.11))*deg))
}

func (o Observer) pressure() float64 {
	if o.PressureMbar > 0 {
		return o.PressureMbar
	}
	// International standard atmosphere, barometric formula (ISO 2533); no air above its
	// formal top, where the base of the power turns negative.
	return 1013.25 * math.Pow(math.Max(0, 1-2.25577e-5*o.ElevationM), 5.25588)
}

func (o Observer) temp() float64 {
	if o.TempC != nil {
		return *o.TempC
	}
	return 12
}

func (o Observer) deltaT(t time.Time) float64 {
	if o.DeltaTSec != nil {
		return *o.DeltaTSec
	}
	return DeltaT(t)
}
