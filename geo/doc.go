// Package geo owns the site model in local east-north-up metres: roof faces, blocks, trees,
// avoid areas and hand-drawn panels; the strict GeoJSON import and the export of placed
// modules; the one projection between WGS 84 longitude/latitude and local metres; and the
// module fill on each roof face.
//
// Projection: geodetic → Earth-centred Earth-fixed → east-north-up about the site origin, on
// the WGS 84 ellipsoid (NIMA TR8350.2, 3rd ed., 2000: a = 6378137 m, f = 1/298.257223563).
// Over the few hundred metres of a site the error of treating ENU as a plane is far below the
// drawing's own accuracy. Tests hold distances and areas against github.com/golang/geo's s2
// sphere (to 0.6% and 1.2%, the spread of the ellipsoid's radii of curvature).
//
// # Map
//
// Decode reads a GeoJSON FeatureCollection (RFC 7946) strictly: member names match exactly,
// duplicate members, holes, open or self-crossing rings, rings of fewer than four positions,
// unknown kinds, values out of range and features more than MaxExtentM from the site are
// refused, each with one message naming the file, line:col, feature index, id and field. Both
// ring windings are accepted. Properties (every height in metres above the site's ground):
//
//	kind   geometry  properties
//	roof   Polygon   id, pitch_deg [0, 70], aspect_deg [0, 360) (downhill), eave_height_m;
//	                 or 3-D coordinates instead (pitch_deg, aspect_deg, eave_height_m may
//	                 then be given too and must agree with the corners)
//	building Polygon id, roof_shape (gabled, hipped, skillion, flat), pitch_deg, eave_height_m,
//	                 ridge_azimuth_deg: the roof faces and the walls (Building)
//	block  Polygon   id, height_m (top, or the eaves of a pitched roof), base_m (default 0),
//	                 ridge_m and ridge_azimuth_deg (both or neither: a pitched roof),
//	                 roof_shape ("gabled" default, "hipped"), source
//	tree   Point     id, height_m (top of crown), crown_radius_m, crown_base_m,
//	                 crown_shape ("ellipsoid" default, "sphere", "cone"), base_m (default 0),
//	                 leaf_off_transmittance [0, 1] (omit for evergreen), leaf_off_months
//	                 [1..12] (default by hemisphere: DefaultLeafOffMonths), source
//	avoid  Polygon   id
//	panel  Polygon   id (a hand-drawn module; its face then gets no automatic fill)
//	module           ignored: written by ExportGeoJSON, so an export reads back
//
// Beyond the basic properties of each kind: ridge_m, ridge_azimuth_deg, crown_shape, a tree's
// base_m, and the "module" kind that Decode skips. A sphere's crown_base_m may be omitted (it is
// height_m − 2·crown_radius_m). Roof ids may not contain dots or white space (module ids are
// "<face>.<row>.<column>"). Ids are unique over the map. Properties no kind uses give a
// warning, not an error.
//
// A third coordinate is metres above the WGS 84 ellipsoid (RFC 7946) and needs
// DecodeOptions.ElevationM, the ground's height on the same scale. A 3-D roof face is fitted
// with a least-squares plane; a corner farther than PlaneToleranceM from it is refused. A 3-D
// block or tree without base_m stands on the ground its coordinates give.
//
// A face's eave is its outline's lowest edge (Face.SetEave); heights follow from pitch and
// aspect. Faces may share edges but not overlap in plan; a strip up to OverlapTolM wide is
// cut off the face later in the map (exact polygon difference in the local plane, clip.go),
// with a note. Site.SwapEvidence names the faces that fit their aspect and each other only
// with every coordinate read the other way round (a map written latitude first). A block may pierce a face (a
// chimney); a hand-drawn panel on a block or an avoid area gives a note from Fill.
//
// # Fill
//
// Fill sets modules in rows parallel to the eave, row 1 at the eave, keeping whole modules
// inside the face less the setback (measured on the roof surface) and clear of avoid areas and
// of blocks that rise above the face, each grown by the obstacle clearance. Each row's free
// stretches are found exactly and filled with a run of modules centred on the stretch; the
// rows' starting height is searched over one row pitch (in steps of at most 1 cm) for the most
// modules, the lowest start winning a tie. Columns are numbered from the left as seen from
// below the eave looking up the slope, consecutively across gaps. Module frame: portrait has V up
// the slope and U to the right along the eave; landscape has V to the right along the eave and
// U down the slope; U×V is the face's outward normal and Corners are counter-clockwise from
// outside.
//
// # Kinds and obstacles
//
// Each map kind lives in its own file (kind_roof.go, kind_building.go, kind_block.go,
// kind_tree.go, kind_marks.go) and is listed in one table (kind.go): its geometry, its properties, its
// validation, its export and the obstacles it casts shade with. Site.Obstacles lists every
// shade-casting body as a prism or a crown, whatever kind drew it; the shading package and the
// plan work from that list alone.
//
// # Surroundings
//
// Site.AddSurroundings adds obstacles imported from beside the map (the osm subpackage reads
// OpenStreetMap extracts) that lie within a radius of the roof faces, with their source, and
// leaves out a block that holds the middle of a roof face: the site's own house, mapped too.
//
// geo knows nothing of the sun or of electricity.
package geo
