package geo

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
)

// structure checks the document's shape: a FeatureCollection of features with a kind, an id and
// well-formed coordinates.
func (d *decoder) structure(root *jnode) []*rawFeature {
	if root.kind != 'o' {
		d.problem(root, -1, "", "", "the map must be a GeoJSON FeatureCollection object, got "+root.typeName())
		return nil
	}
	t := root.member("type")
	if t == nil || t.kind != 's' || t.str != "FeatureCollection" {
		got := "nothing"
		if t != nil {
			got = t.typeName()
			if t.kind == 's' {
				got = strconv.Quote(t.str)
			}
		}
		d.problem(orNode(t, root), -1, "", "type", "the map must be a FeatureCollection, got "+got)
		return nil
	}
	if c := root.member("crs"); c != nil {
		d.problem(c, -1, "", "crs", "RFC 7946 maps are in WGS 84 longitude/latitude and carry no crs; reproject and remove crs")
	}
	fs := root.member("features")
	if fs == nil || fs.kind != 'a' {
		d.problem(orNode(fs, root), -1, "", "features", "a FeatureCollection needs a features array")
		return nil
	}
	if len(fs.vals) > maxFeatures {
		d.problem(fs, -1, "", "features", fmt.Sprintf("%d features; a site map has at most %d", len(fs.vals), maxFeatures))
		return nil
	}
	var out []*rawFeature
	ids := map[string]int{}
	d.ids = ids
	for i, fn := range fs.vals {
		f := &rawFeature{index: i, n: fn}
		d.feature(f)
		if f.kind == "module" || f.kind == "" && f.failed {
			continue
		}
		if f.id != "" {
			if first, ok := ids[f.id]; ok {
				d.fproblem(f, orNode(f.props.member("id"), fn), "id",
					fmt.Sprintf("%q is already used by feature %d; ids must be unique", f.id, first))
			} else {
				ids[f.id] = i
			}
		}
		out = append(out, f)
	}
	return out
}

func orNode(n, alt *jnode) *jnode {
	if n != nil {
		return n
	}
	return alt
}

func (d *decoder) feature(f *rawFeature) {
	fn := f.n
	if fn.kind != 'o' {
		d.fproblem(f, fn, "", "a feature must be an object, got "+fn.typeName())
		return
	}
	if t := fn.member("type"); t == nil || t.kind != 's' || t.str != "Feature" {
		d.fproblem(f, orNode(t, fn), "type", `a feature needs "type": "Feature"`)
	}
	f.props = fn.member("properties")
	if f.props == nil || f.props.kind != 'o' {
		d.fproblem(f, orNode(f.props, fn), "properties", "missing; every feature needs properties with a kind ("+kindList()+") and an id")
		f.props = nil
		return
	}
	// The id first, so that every later message names it.
	// The id: properties.id, else the feature's own RFC 7946 id when it is a string.
	idn := f.props.member("id")
	if idn == nil {
		if top := fn.member("id"); top != nil && top.kind == 's' {
			idn = top
		}
	}
	switch {
	case idn == nil:
		d.fproblem(f, f.props, "id", "missing; every feature needs an id, unique in the map")
	case idn.kind != 's':
		d.fproblem(f, idn, "id", "must be a string, got "+idn.typeName())
	case strings.TrimSpace(idn.str) == "":
		d.fproblem(f, idn, "id", "empty; every feature needs an id, unique in the map")
	default:
		f.id = idn.str
	}
	kn := f.props.member("kind")
	switch {
	case kn == nil:
		d.fproblem(f, f.props, "kind", "missing; say what the feature is: "+kindList())
	case kn.kind != 's':
		d.fproblem(f, kn, "kind", "must be a string: "+kindList()+"; got "+kn.typeName())
	case kn.str == "module":
		// Modules echoed by an earlier export: output, not input. Ignoring them lets an
		// exported map be read again.
		f.kind = "module"
		return
	case kindNamed(kn.str) == nil:
		d.fproblem(f, kn, "kind", fmt.Sprintf("%q is not a known kind; use %s", kn.str, kindList()))
	default:
		f.kind = kn.str
	}
	if f.kind == "roof" && strings.ContainsAny(f.id, ". \t\n") {
		d.fproblem(f, idn, "id", fmt.Sprintf("%q: a roof face id may not contain a dot or white space, which would break module ids <face>.<row>.<column>", f.id))
	}
	if f.kind == "" {
		return
	}
	known := kindNamed(f.kind).props
	for _, k := range f.props.keys {
		if k == "kind" || slices.Contains(known, k) {
			continue
		}
		d.warn(f, fmt.Sprintf("property %q is not used by a %s; ignored (known: %s)", k, f.kind, strings.Join(known, ", ")))
	}
	d.geometry(f)
}

func (d *decoder) geometry(f *rawFeature) {
	g := f.n.member("geometry")
	want := kindNamed(f.kind).geometry
	if g == nil || g.kind == 'z' {
		d.fproblem(f, orNode(g, f.n), "geometry", fmt.Sprintf("missing; a %s needs a %s", f.kind, want))
		return
	}
	if g.kind != 'o' {
		d.fproblem(f, g, "geometry", "must be an object, got "+g.typeName())
		return
	}
	t := g.member("type")
	if t == nil || t.kind != 's' {
		d.fproblem(f, orNode(t, g), "geometry", fmt.Sprintf("the geometry has no type; a %s needs a %s", f.kind, want))
		return
	}
	if t.str != want {
		hint := ""
		if t.str == "MultiPolygon" {
			hint = "; draw each part as its own feature"
		}
		d.fproblem(f, t, "geometry", fmt.Sprintf("a %s needs a %s, got %s%s", f.kind, want, t.str, hint))
		return
	}
	f.geomType = want
	c := g.member("coordinates")
	if c == nil || c.kind != 'a' {
		d.fproblem(f, orNode(c, g), "geometry", "coordinates missing or not an array")
		return
	}
	if want == "Point" {
		p, ok := d.position(f, c)
		if ok {
			f.point = p
		}
		return
	}
	if len(c.vals) == 0 {
		d.fproblem(f, c, "geometry", "a Polygon needs one ring of positions")
		return
	}
	if len(c.vals) > 1 {
		d.fproblem(f, c.vals[1], "geometry", fmt.Sprintf("holes are not supported (%d rings); draw the outline only and put an avoid area over the hole", len(c.vals)))
		return
	}
	rn := c.vals[0]
	if rn.kind != 'a' {
		d.fproblem(f, rn, "geometry", "a ring must be an array of positions, got "+rn.typeName())
		return
	}
	if len(rn.vals) > maxRingPositions {
		d.fproblem(f, rn, "geometry", fmt.Sprintf("%d positions; an outline on a site map has at most %d", len(rn.vals), maxRingPositions))
		return
	}
	ring := make([]rawPos, 0, len(rn.vals))
	for _, pn := range rn.vals {
		p, ok := d.position(f, pn)
		if !ok {
			return
		}
		ring = append(ring, p)
	}
	if len(ring) < 4 {
		d.fproblem(f, rn, "geometry", fmt.Sprintf("a ring needs at least four positions, the last equal to the first (RFC 7946 §3.1.6); it has %d", len(ring)))
		return
	}
	first, last := ring[0], ring[len(ring)-1]
	if first.lon != last.lon || first.lat != last.lat || first.has3 != last.has3 || first.h != last.h {
		d.fproblem(f, last.n, "geometry", "the ring is not closed: its last position must repeat the first (RFC 7946 §3.1.6)")
		return
	}
	f.rings = [][]rawPos{ring}
}

// position reads [lon, lat] or [lon, lat, h].
func (d *decoder) position(f *rawFeature, n *jnode) (rawPos, bool) {
	p := rawPos{n: n}
	if n.kind != 'a' || len(n.vals) < 2 || len(n.vals) > 3 {
		d.fproblem(f, n, "geometry", "a position must be [longitude, latitude] or [longitude, latitude, height]")
		return p, false
	}
	var v [3]float64
	for i, c := range n.vals {
		x, ok := number(c)
		if !ok {
			d.fproblem(f, c, "geometry", "a coordinate must be a finite number, got "+c.typeName())
			return p, false
		}
		v[i] = x
	}
	p.lon, p.lat, p.h, p.has3 = v[0], v[1], v[2], len(n.vals) == 3
	if p.lat < -90 || p.lat > 90 {
		hint := ""
		if math.Abs(p.lon) <= 90 {
			hint = "; longitude and latitude look swapped: RFC 7946 writes [longitude, latitude]"
		}
		d.fproblem(f, n.vals[1], "geometry", fmt.Sprintf("latitude %g is outside [-90, 90]%s", p.lat, hint))
		return p, false
	}
	if p.lon < -180 || p.lon > 180 {
		d.fproblem(f, n.vals[0], "geometry", fmt.Sprintf("longitude %g is outside [-180, 180]", p.lon))
		return p, false
	}
	return p, true
}
