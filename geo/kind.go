package geo

import "strings"

// kind is one value of a map feature's "kind" property. Everything the package knows of a kind
// lives in its own file (kind_roof.go, kind_building.go, kind_block.go, kind_tree.go,
// kind_marks.go) and is
// gathered in kinds: the geometry and properties the decoder expects, how a structurally sound
// feature is validated and added to the site, how it is written back by ExportGeoJSON and, for
// an obstruction, the bodies it casts shade with (Site.Obstacles), which the shading package
// ray-tests and the plan draws. Adding a kind is one file plus its tests: see DEVELOPERS.md.
type kind struct {
	name     string
	geometry string   // the GeoJSON geometry type it needs: "Polygon" or "Point"
	props    []string // the properties it reads besides "kind"
	// build validates one feature whose structure and extent passed and adds it to d.site.
	build func(d *decoder, f *rawFeature)
	// export returns the site's features of this kind for ExportGeoJSON.
	export func(e *exporter, s *Site) []exportItem
	// obstacles returns the site's shade-casting bodies of this kind; nil for a kind that casts
	// none (a roof face shades as a face, not as an obstacle).
	obstacles func(s *Site) []Obstacle
}

// kinds lists every kind in the order messages name them and obstacles are listed.
var kinds = []*kind{&roofKind, &buildingKind, &blockKind, &treeKind, &avoidKind, &panelKind}

// kindNamed returns the kind called name, or nil.
func kindNamed(name string) *kind {
	for _, k := range kinds {
		if k.name == name {
			return k
		}
	}
	return nil
}

// kindList names the kinds for messages: "roof, building, block, tree, avoid or panel".
func kindList() string {
	names := make([]string, len(kinds))
	for i, k := range kinds {
		names[i] = k.name
	}
	return strings.Join(names[:len(names)-1], ", ") + " or " + names[len(names)-1]
}
