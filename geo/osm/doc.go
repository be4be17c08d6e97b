// Package osm reads the surroundings of a site from an OpenStreetMap extract (OSM XML, as the
// usual editors and export tools write it) with github.com/paulmach/osm, and turns its buildings
// into blocks and its trees into trees of the site model, in the site's local metres. geo's
// Site.AddSurroundings then keeps those near the roofs and leaves out the site's own building.
//
// Buildings (ways and the closed outer ways of multipolygon relations tagged building or
// building:part) follow the Simple 3D Buildings tagging:
//
//   - the bottom is min_height, else building:min_level × StoreyM, else the ground;
//   - the roof's height is roof:height, else from roof:angle and the half-width across the
//     ridge, else roof:levels × StoreyM, else (a pitched roof) from a pitch of
//     DefaultRoofPitchDeg;
//   - the top is height, else building:levels × StoreyM plus the roof, else DefaultLevels
//     storeys plus the roof;
//   - roof:shape gabled (and saltbox) becomes a gabled block, hipped (and half-hipped,
//     pyramidal) a hipped one, flat or none a flat top; any other shape a flat top at the full
//     height, which shades at least as much as the real roof;
//   - the ridge runs across roof:direction (the way a slope faces, degrees or a compass point)
//     when given, else along the footprint's longest wall, or across it with
//     roof:orientation=across.
//
// natural=tree nodes become trees: height from height (else DefaultTreeHeightM), the crown's
// diameter from diameter_crown (else DefaultCrownFraction of the height), the crown an
// ellipsoid from height − diameter (at least the ground) to the top, opaque all year (a
// deciduous tree's leaf-off light is for the surveyor to draw by hand).
//
// Heights are metres above the site's ground: the surroundings are taken as level with it.
// Every height the extract does not give (a height from storeys included) is listed as a warning
// naming the element, so that the surveyor knows what to measure on site. Ids are the elements' own: "way/123", "node/45",
// "relation/6" (with "#2", "#3" for a relation's further outer rings).
//
// ReadGeoJSON reads the same from GeoJSON whose features carry the elements' tags as
// properties, as converters of OpenStreetMap data write it; HasKinds tells such a file from a
// GeoJSON of sunstring's own block and tree features, which geo.Decode reads.
//
// The reading is strict: a file that is not OSM XML, an element whose attributes do not parse,
// a building way that is not closed or whose nodes are missing, a tag value that is not a
// number where one is needed, is refused with the file, line and element. An OSM PBF file is
// refused with a message to export OSM XML instead.
package osm
