// Package sun computes where the sun is as seen from a site on the Earth.
//
// The public surface is At (one instant), AtEach (many instants, the fast path for a
// year of time steps), Incidence (angle to a tilted surface) and RiseTransitSet. Angles crossing
// the package boundary are s1.Angle; azimuth is measured clockwise from true north.
//
// Method: see the file that implements At for the published algorithm, its stated
// accuracy and valid range.
package sun
