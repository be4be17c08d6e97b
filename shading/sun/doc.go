// Package sun computes where the sun is as seen from a site on the Earth.
//
// The public surface is At (one instant), AtEach (many instants, the fast path for a year of
// time steps), Incidence (angle to a tilted surface), RiseTransitSet (sunrise, transit and
// sunset of a local day), DeltaT (TT − UT) and GeocentricAt (the observer-independent part, for
// checks). Angles crossing the package boundary are s1.Angle; azimuth is measured clockwise
// from true north.
//
// Method: the Solar Position Algorithm of I. Reda and A. Andreas, "Solar Position Algorithm
// for Solar Radiation Applications", NREL/TP-560-34302 (2004, revised January 2008; also Solar
// Energy 76(5), 577–589, 2004): Earth's heliocentric position from a truncated VSOP87 (Bretagnon
// & Francou 1988), IAU 1980 nutation, aberration, apparent sidereal time, topocentric parallax
// for the observer's elevation, refraction from annual mean pressure and temperature (eq. 42,
// zero below the horizon), and the sunrise, transit and sunset method of its appendix A.2.
// Stated uncertainty ±0.0003° in zenith and azimuth for the years −2000 to 6000, given the
// right ΔT. ΔT defaults to the polynomial model of Espenak & Meeus (2006), NASA/TP-2006-214141.
//
// Refraction uses annual mean conditions, as the method intends; near the horizon (elevation
// below about 5°) real refraction varies with the weather by tenths of a degree, far more than
// the algorithm's uncertainty.
//
// AtEach evaluates the geocentric part once per day and interpolates it; it agrees with At to
// within 1e−6° in practice (tested to 0.0001°).
package sun
