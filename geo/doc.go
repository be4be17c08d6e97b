// Package geo owns the site model in local east-north-up metres: roof faces, blocks, trees,
// avoid areas and hand-drawn panels; the strict GeoJSON import and the export of placed
// modules; the one projection between WGS 84 longitude/latitude and local metres; and the
// module fill on each roof face.
//
// Projection: geodetic → Earth-centred Earth-fixed → east-north-up about the site origin, on
// the WGS 84 ellipsoid (NIMA TR8350.2, 3rd ed., 2000: a = 6378137 m, f = 1/298.257223563).
// Over the few hundred metres of a site the error of treating ENU as a plane is far below the
// drawing's own accuracy.
//
// geo knows nothing of the sun or of electricity.
package geo
