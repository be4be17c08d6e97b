package osm

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	posm "github.com/paulmach/osm"

	"sunstring/geo"
)

// gjFeature is one GeoJSON feature as converters of OpenStreetMap data write it: the element's
// tags as properties, its id as the feature's id ("way/123") or as an "@id" property.
type gjFeature struct {
	Type       string          `json:"type"`
	ID         any             `json:"id"`
	Properties map[string]any  `json:"properties"`
	Geometry   json.RawMessage `json:"geometry"`
}

type gjGeometry struct {
	Type        string          `json:"type"`
	Coordinates json.RawMessage `json:"coordinates"`
}

// HasKinds reports whether a GeoJSON document's features carry sunstring's "kind" property
// (then it is a map of blocks and trees for geo.Decode, not OpenStreetMap data). A document that
// does not parse reports false, and ReadGeoJSON says what is wrong with it.
func HasKinds(data []byte) bool {
	var doc struct {
		Features []struct {
			Properties map[string]json.RawMessage `json:"properties"`
		} `json:"features"`
	}
	if json.Unmarshal(data, &doc) != nil {
		return false
	}
	for _, f := range doc.Features {
		if _, ok := f.Properties["kind"]; ok {
			return true
		}
	}
	return false
}

// ReadGeoJSON reads OpenStreetMap buildings and trees from a GeoJSON FeatureCollection in WGS 84
// longitude/latitude whose features carry the elements' tags as properties (as converters of
// OpenStreetMap data write them): Polygon and MultiPolygon features tagged building or
// building:part, Point features tagged natural=tree, with the same rules as Read. Other
// features are passed over. Problems name the file, the feature index and its id.
func ReadGeoJSON(r io.Reader, proj *geo.ENU, opt Options) (*geo.Surroundings, error) {
	data, opt, err := begin(r, proj, opt, "ReadGeoJSON")
	if err != nil {
		return nil, err
	}
	rd := &reader{opt: opt, proj: proj, line: map[string]int{}, feature: map[string]int{}}
	if len(data) > MaxBytes {
		return nil, rd.fail(0, fmt.Sprintf("the file is larger than %d MiB; cut it to the site's neighbourhood", MaxBytes>>20))
	}
	var doc struct {
		Type     string      `json:"type"`
		Features []gjFeature `json:"features"`
	}
	if err := json.Unmarshal(data, &doc); err != nil {
		var se *json.SyntaxError
		if errors.As(err, &se) {
			return nil, rd.fail(1+bytes.Count(data[:min(int(se.Offset), len(data))], []byte("\n")), "not valid JSON: "+se.Error())
		}
		return nil, rd.fail(0, "not a GeoJSON FeatureCollection: "+err.Error())
	}
	if doc.Type != "FeatureCollection" {
		return nil, rd.fail(0, fmt.Sprintf("the file must be a GeoJSON FeatureCollection, got type %q", doc.Type))
	}
	for i, f := range doc.Features {
		ts := tagsOf(f.Properties)
		building, tree := isBuilding(ts), ts.Find("natural") == "tree"
		if !building && !tree {
			continue
		}
		id := featureID(f, i)
		if _, dup := rd.feature[id]; dup {
			id = fmt.Sprintf("%s#%d", id, i)
		}
		rd.feature[id] = i
		var g gjGeometry
		if len(f.Geometry) == 0 || json.Unmarshal(f.Geometry, &g) != nil {
			rd.problem(id, "geometry", "missing or not a GeoJSON geometry")
			continue
		}
		switch {
		case tree && g.Type == "Point":
			var c []float64
			if json.Unmarshal(g.Coordinates, &c) != nil || !lonLatOK(c) {
				rd.problem(id, "geometry", "a tree's Point needs [longitude, latitude] within [-180, 180] × [-90, 90]")
				continue
			}
			rd.tree(id, ts, c[0], c[1])
		case building && (g.Type == "Polygon" || g.Type == "MultiPolygon"):
			var polys [][][][]float64
			if g.Type == "Polygon" {
				var p [][][]float64
				if json.Unmarshal(g.Coordinates, &p) == nil {
					polys = append(polys, p)
				}
			} else if json.Unmarshal(g.Coordinates, &polys) != nil {
				polys = nil
			}
			if len(polys) == 0 {
				rd.problem(id, "geometry", "a building needs a Polygon or MultiPolygon of [longitude, latitude] rings")
				continue
			}
			for k, p := range polys {
				pid := id
				if k > 0 {
					pid = fmt.Sprintf("%s#%d", id, k+1)
					rd.feature[pid] = i
				}
				outer, ok := ringOf(p)
				if !ok {
					rd.problem(pid, "geometry", "a building's outline must be a closed ring of at least four [longitude, latitude] positions, the last equal to the first")
					break
				}
				rd.block(pid, ts, outer)
			}
		default:
			rd.problem(id, "geometry", fmt.Sprintf("a %s needs a %s, got %s", map[bool]string{true: "tree", false: "building"}[tree],
				map[bool]string{true: "Point", false: "Polygon or MultiPolygon"}[tree], g.Type))
		}
	}
	if len(rd.probs) > 0 {
		return nil, rd.probs
	}
	return &rd.out, nil
}

// tagsOf turns properties into tags: strings as they are, numbers in their shortest form.
func tagsOf(props map[string]any) posm.Tags {
	var ts posm.Tags
	for k, v := range props {
		switch x := v.(type) {
		case string:
			ts = append(ts, posm.Tag{Key: k, Value: x})
		case float64:
			ts = append(ts, posm.Tag{Key: k, Value: strconv.FormatFloat(x, 'g', -1, 64)})
		}
	}
	ts.SortByKeyValue()
	return ts
}

// featureID is the element's id: the feature's own id or its "@id" property ("way/123"), else
// "feature/<index>".
func featureID(f gjFeature, i int) string {
	for _, v := range []any{f.ID, f.Properties["@id"], f.Properties["id"]} {
		switch x := v.(type) {
		case string:
			if strings.TrimSpace(x) != "" {
				return x
			}
		case float64:
			return strconv.FormatFloat(x, 'f', -1, 64)
		}
	}
	return fmt.Sprintf("feature/%d", i)
}

func lonLatOK(c []float64) bool {
	return len(c) >= 2 && !math.IsNaN(c[0]) && !math.IsNaN(c[1]) && c[0] >= -180 && c[0] <= 180 && c[1] >= -90 && c[1] <= 90
}

// ringOf returns a polygon's outer ring without its closing position.
func ringOf(p [][][]float64) ([]orb.Point, bool) {
	if len(p) == 0 || len(p[0]) < 4 {
		return nil, false
	}
	r := p[0]
	first, last := r[0], r[len(r)-1]
	if !lonLatOK(first) || !lonLatOK(last) || first[0] != last[0] || first[1] != last[1] {
		return nil, false
	}
	out := make([]orb.Point, 0, len(r)-1)
	for _, c := range r[:len(r)-1] {
		if !lonLatOK(c) {
			return nil, false
		}
		out = append(out, orb.Point{c[0], c[1]})
	}
	return out, true
}
