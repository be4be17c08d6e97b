package geo

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// Limits of a plausible drawing. A value outside them is a mistake in the map, not a site.
const (
	// MaxPitchDeg is the steepest roof face accepted (common practice: steeper is a wall).
	MaxPitchDeg = 70.0
	// MaxExtentM is how far any feature may lie from the site origin: a house and its
	// neighbours, not a district.
	MaxExtentM = 500.0
	// PlaneToleranceM is how far a 3-D roof vertex may lie off the plane fitted through its
	// face (survey and drawing error), measured perpendicular to the plane.
	PlaneToleranceM = 0.10
	// PitchAgreeDeg and AspectAgreeDeg bound the disagreement between pitch_deg/aspect_deg and
	// the pitch and aspect of a face's 3-D vertices; EaveAgreeM that of eave_height_m.
	PitchAgreeDeg  = 2.0
	AspectAgreeDeg = 5.0
	EaveAgreeM     = 0.15
	// MaxMapBytes bounds the map read into memory.
	MaxMapBytes = 64 << 20
	// maxFeatures and maxRingPositions bound the work of the pairwise checks (crossing
	// edges, overlapping faces), which grow with the square of the count.
	maxFeatures      = 5000
	maxRingPositions = 2000
	// overlapTolM is how deep one face may reach into another in plan before it counts as an
	// overlap: drawings snap to a few centimetres at best.
	overlapTolM = 0.02
)

// DecodeOptions tells Decode what the map alone cannot say. The zero value reads a 2-D map
// about its own centroid.
type DecodeOptions struct {
	File                       string   // for messages
	OriginLonDeg, OriginLatDeg *float64 // site file's longitude/latitude; nil → the map's centroid
	ElevationM                 *float64 // ground height above the WGS 84 ellipsoid; needed for 3-D coordinates
}

// rawPos is one GeoJSON position as written.
type rawPos struct {
	lon, lat, h float64
	has3        bool
	n           *jnode
}

// rawFeature is one feature after the structural checks, before projection.
type rawFeature struct {
	index    int
	n, props *jnode
	kind, id string
	geomType string
	rings    [][]rawPos // Polygon
	point    rawPos     // Point
	failed   bool       // a problem was reported: skip the checks that build on it
}

func (f *rawFeature) positions() []rawPos {
	if f.geomType == "Point" {
		return []rawPos{f.point}
	}
	var out []rawPos
	for _, r := range f.rings {
		out = append(out, r...)
	}
	return out
}

type decoder struct {
	opt   DecodeOptions
	data  []byte
	probs Problems
	warns []string
	proj  *ENU
	site  *Site
}

// Decode reads a map (a GeoJSON FeatureCollection in WGS 84 longitude/latitude, see the
// package documentation for the properties) strictly, validates it and builds the site model
// in local metres. Bad input gives a Problems error listing every problem found; other errors
// (reading r) are wrapped.
func Decode(r io.Reader, opt DecodeOptions) (*Site, error) {
	data, err := io.ReadAll(io.LimitReader(r, MaxMapBytes+1))
	if err != nil {
		return nil, fmt.Errorf("geo: reading map %s: %w", opt.File, err)
	}
	d := &decoder{opt: opt, data: data}
	if len(data) > MaxMapBytes {
		d.problem(nil, -1, "", "", fmt.Sprintf("the map is larger than %d MiB; a site map is a few kilobytes", MaxMapBytes>>20))
		return nil, d.probs
	}
	root, err := parseTree(data)
	if err != nil {
		d.syntaxProblem(err)
		return nil, d.probs
	}
	raws := d.structure(root)
	if len(d.probs) == 0 {
		d.build(raws)
	}
	if len(d.probs) > 0 {
		sort.SliceStable(d.probs, func(i, j int) bool {
			a, b := d.probs[i], d.probs[j]
			if a.Index != b.Index {
				return a.Index < b.Index
			}
			if a.Line != b.Line {
				return a.Line < b.Line
			}
			return a.Col < b.Col
		})
		return nil, d.probs
	}
	d.site.Warnings = append(d.site.Warnings, d.warns...)
	return d.site, nil
}

func (d *decoder) syntaxProblem(err error) {
	var off int64 = -1
	ptr := ""
	msg := err.Error()
	var se *json.SyntaxError
	var de *dupKeyError
	switch {
	case errors.As(err, &se):
		off = se.Offset
		msg = "not valid JSON (" + se.Error() + "); a map is a GeoJSON FeatureCollection"
	case errors.As(err, &de):
		off, ptr = de.off, de.ptr
		msg = fmt.Sprintf("member %q appears twice in one object; keep one", de.key)
	case errors.Is(err, io.ErrUnexpectedEOF):
		off = int64(len(d.data))
		msg = "the JSON ends too early; the file is cut short"
	}
	p := Problem{File: d.opt.File, Index: -1, Msg: msg, Pointer: ptr}
	if off >= 0 {
		p.Line, p.Col = lineCol(d.data, off)
	}
	d.probs = append(d.probs, p)
}

// problem records a problem at node n (nil: the file as a whole).
func (d *decoder) problem(n *jnode, index int, id, field, msg string) {
	p := Problem{File: d.opt.File, Index: index, ID: id, Field: field, Msg: msg}
	if n != nil {
		p.Pointer = n.ptr
		p.Line, p.Col = lineCol(d.data, n.off)
	}
	d.probs = append(d.probs, p)
}

func (d *decoder) fproblem(f *rawFeature, n *jnode, field, msg string) {
	if n == nil {
		n = f.n
	}
	d.problem(n, f.index, f.id, field, msg)
	f.failed = true
}

func (d *decoder) warn(f *rawFeature, msg string) {
	name := d.opt.File
	if name == "" {
		name = "map"
	}
	if f == nil {
		d.warns = append(d.warns, name+": "+msg)
		return
	}
	id := ""
	if f.id != "" {
		id = fmt.Sprintf(" (id %q)", f.id)
	}
	d.warns = append(d.warns, fmt.Sprintf("%s: feature %d%s: %s", name, f.index, id, msg))
}

// Known properties per kind; "kind" is common to all.
var knownProps = map[string][]string{
	"roof":  {"id", "pitch_deg", "aspect_deg", "eave_height_m"},
	"block": {"id", "height_m", "base_m", "ridge_m", "ridge_azimuth_deg"},
	"tree": {"id", "height_m", "crown_radius_m", "crown_base_m", "crown_shape",
		"leaf_off_transmittance", "leaf_off_months", "base_m"},
	"avoid": {"id"},
	"panel": {"id"},
}

var kindGeometry = map[string]string{
	"roof": "Polygon", "block": "Polygon", "tree": "Point", "avoid": "Polygon", "panel": "Polygon",
}

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
		d.fproblem(f, orNode(f.props, fn), "properties", "missing; every feature needs properties with a kind (roof, block, tree, avoid or panel) and an id")
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
		d.fproblem(f, f.props, "kind", "missing; say what the feature is: roof, block, tree, avoid or panel")
	case kn.kind != 's':
		d.fproblem(f, kn, "kind", "must be a string: roof, block, tree, avoid or panel; got "+kn.typeName())
	case kn.str == "module":
		// Modules echoed by an earlier export: output, not input. Ignoring them lets an
		// exported map be read again.
		f.kind = "module"
		return
	case kindGeometry[kn.str] == "":
		d.fproblem(f, kn, "kind", fmt.Sprintf("%q is not a known kind; use roof, block, tree, avoid or panel", kn.str))
	default:
		f.kind = kn.str
	}
	if f.kind == "roof" && strings.ContainsAny(f.id, ". \t\n") {
		d.fproblem(f, idn, "id", fmt.Sprintf("%q: a roof face id may not contain a dot or white space, which would break module ids <face>.<row>.<column>", f.id))
	}
	if f.kind == "" {
		return
	}
	for i, k := range f.props.keys {
		if k == "kind" || slices.Contains(knownProps[f.kind], k) {
			continue
		}
		_ = i
		d.warn(f, fmt.Sprintf("property %q is not used by a %s; ignored (known: %s)", k, f.kind, strings.Join(knownProps[f.kind], ", ")))
	}
	d.geometry(f)
}

func (d *decoder) geometry(f *rawFeature) {
	g := f.n.member("geometry")
	want := kindGeometry[f.kind]
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

// number returns a JSON number as a finite float64.
func number(n *jnode) (float64, bool) {
	if n == nil || n.kind != 'n' {
		return 0, false
	}
	x, err := strconv.ParseFloat(n.str, 64)
	if err != nil || math.IsInf(x, 0) || math.IsNaN(x) {
		return 0, false
	}
	return x, true
}

// prop reads an optional numeric property and checks its range [lo, hi] (hiOpen: [lo, hi)).
// It returns present=false when the property is absent or null.
func (d *decoder) prop(f *rawFeature, name string, lo, hi float64, hiOpen bool, rule string) (v float64, present, ok bool) {
	n := f.props.member(name)
	if n == nil || n.kind == 'z' {
		return 0, false, true
	}
	x, isNum := number(n)
	if !isNum {
		got := n.typeName()
		if n.kind == 's' {
			got = fmt.Sprintf("the string %q", n.str)
		}
		d.fproblem(f, n, name, fmt.Sprintf("must be a number, got %s; %s", got, rule))
		return 0, true, false
	}
	if x < lo || x > hi || hiOpen && x == hi {
		d.fproblem(f, n, name, fmt.Sprintf("%g is out of range; %s", x, rule))
		return x, true, false
	}
	return x, true, true
}

// need reads a required numeric property.
func (d *decoder) need(f *rawFeature, name string, lo, hi float64, hiOpen bool, rule string) (float64, bool) {
	v, present, ok := d.prop(f, name, lo, hi, hiOpen, rule)
	if !present {
		d.fproblem(f, f.props, name, "missing; "+rule)
		return 0, false
	}
	return v, ok
}

// build projects the checked features, validates their geometry and fills the site.
func (d *decoder) build(raws []*rawFeature) {
	d.site = &Site{}
	refLon, refLat, given := d.reference(raws)
	if !given {
		// Keep the extent check robust against one stray feature: measure from the median.
		refLon, refLat = medianFirst(raws)
	}
	d.extent(raws, refLon, refLat, given)
	if len(d.probs) > 0 {
		return
	}
	lon0, lat0 := refLon, refLat
	if !given {
		lon0, lat0 = bboxCentre(raws)
	}
	if d.opt.OriginLonDeg != nil {
		lon0 = *d.opt.OriginLonDeg
	}
	if d.opt.OriginLatDeg != nil {
		lat0 = *d.opt.OriginLatDeg
	}
	h0 := 0.0
	if d.opt.ElevationM != nil {
		h0 = *d.opt.ElevationM
	}
	d.proj = NewENU(lon0, lat0, h0)
	d.site.Proj = d.proj
	for _, f := range raws {
		if f.failed || f.kind == "" {
			continue
		}
		if !d.check3D(f) {
			continue
		}
		switch f.kind {
		case "roof":
			d.roof(f)
		case "block":
			d.block(f)
		case "tree":
			d.tree(f, lat0)
		case "avoid":
			if r, ok := d.ring(f); ok {
				d.site.Avoids = append(d.site.Avoids, Avoid{ID: f.id, Index: f.index, Area: r})
			}
		case "panel":
			if r, ok := d.ring(f); ok {
				d.site.Panels = append(d.site.Panels, Panel{ID: f.id, Index: f.index, Outline: r})
			}
		}
	}
	d.crossChecks(raws)
}

// reference returns the site's stated longitude and latitude, when given.
func (d *decoder) reference(raws []*rawFeature) (lon, lat float64, given bool) {
	if d.opt.OriginLonDeg == nil || d.opt.OriginLatDeg == nil {
		return 0, 0, false
	}
	lon, lat = *d.opt.OriginLonDeg, *d.opt.OriginLatDeg
	if math.IsNaN(lat) || lat < -90 || lat > 90 || math.IsNaN(lon) || lon < -180 || lon > 180 {
		d.problem(nil, -1, "", "latitude", fmt.Sprintf("the site's latitude %g / longitude %g are outside [-90, 90] / [-180, 180]", lat, lon))
		return 0, 0, false
	}
	return lon, lat, true
}

func medianFirst(raws []*rawFeature) (lon, lat float64) {
	var lons, lats []float64
	for _, f := range raws {
		if ps := f.positions(); len(ps) > 0 && !f.failed {
			lons = append(lons, ps[0].lon)
			lats = append(lats, ps[0].lat)
		}
	}
	if len(lons) == 0 {
		return 0, 0
	}
	slices.Sort(lons)
	slices.Sort(lats)
	return lons[len(lons)/2], lats[len(lats)/2]
}

func bboxCentre(raws []*rawFeature) (lon, lat float64) {
	minLon, minLat, maxLon, maxLat := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for _, f := range raws {
		for _, p := range f.positions() {
			minLon, maxLon = math.Min(minLon, p.lon), math.Max(maxLon, p.lon)
			minLat, maxLat = math.Min(minLat, p.lat), math.Max(maxLat, p.lat)
		}
	}
	if math.IsInf(minLon, 0) {
		return 0, 0
	}
	return (minLon + maxLon) / 2, (minLat + maxLat) / 2
}

// extent reports features far from the reference point, and says when swapping longitude and
// latitude would bring them home.
func (d *decoder) extent(raws []*rawFeature, lon, lat float64, given bool) {
	p := NewENU(lon, lat, 0)
	from := "the other features"
	if given {
		from = fmt.Sprintf("the site's latitude %g, longitude %g", lat, lon)
	}
	for _, f := range raws {
		if f.failed {
			continue
		}
		worst, far := 0.0, rawPos{}
		for _, q := range f.positions() {
			if dist := p.Forward(q.lon, q.lat, 0).Norm(); dist > worst {
				worst, far = dist, q
			}
		}
		if worst <= MaxExtentM {
			continue
		}
		msg := fmt.Sprintf("lies %.1f km from %s, more than the %g m a site may span", worst/1000, from, MaxExtentM)
		if math.Abs(far.lon) <= 90 && p.Forward(far.lat, far.lon, 0).Norm() <= MaxExtentM {
			msg += "; longitude and latitude look swapped: RFC 7946 writes [longitude, latitude]"
		}
		d.fproblem(f, far.n, "geometry", msg)
	}
}

// check3D reports whether the feature's third coordinates (if any) can be used.
func (d *decoder) check3D(f *rawFeature) bool {
	ps := f.positions()
	n3 := 0
	for _, p := range ps {
		if p.has3 {
			n3++
		}
	}
	if n3 == 0 {
		return true
	}
	if n3 != len(ps) {
		for _, p := range ps {
			if !p.has3 {
				d.fproblem(f, p.n, "geometry", "mixes 2-D and 3-D positions; give every position a height or none")
				return false
			}
		}
	}
	if d.opt.ElevationM == nil {
		d.fproblem(f, ps[0].n, "geometry", "3-D coordinates need the site's elevation_m (ground height above the WGS 84 ellipsoid) to become heights above ground; set elevation_m in the site file or drop the third coordinate")
		return false
	}
	return true
}

// local projects a position; U is height above the site's ground when the position is 3-D.
func (d *decoder) local(p rawPos) Vec3 {
	h := d.proj.HeightM
	if p.has3 {
		h = p.h
	}
	v := d.proj.Forward(p.lon, p.lat, h)
	if !p.has3 {
		v.U = 0
	}
	return v
}

// ring projects, cleans and checks the feature's outline: counter-clockwise, closed, without
// repeated neighbours, not crossing itself, with an area. Both windings are accepted.
func (d *decoder) ring(f *rawFeature) (orb.Ring, bool) {
	r, _, _, ok := d.ring3(f)
	return r, ok
}

func (d *decoder) ring3(f *rawFeature) (orb.Ring, []Vec3, []*jnode, bool) {
	raw := f.rings[0]
	var plan orb.Ring
	var pts []Vec3
	var nodes []*jnode
	for _, p := range raw[:len(raw)-1] {
		v := d.local(p)
		if k := len(plan); k > 0 && math.Hypot(v.E-plan[k-1][0], v.N-plan[k-1][1]) < 1e-4 {
			continue // a repeated vertex (a double click) carries no shape
		}
		plan = append(plan, v.Plan())
		pts = append(pts, v)
		nodes = append(nodes, p.n)
	}
	if k := len(plan); k > 1 && math.Hypot(plan[0][0]-plan[k-1][0], plan[0][1]-plan[k-1][1]) < 1e-4 {
		plan, pts, nodes = plan[:k-1], pts[:k-1], nodes[:k-1]
	}
	if len(plan) < 3 {
		d.fproblem(f, raw[0].n, "geometry", fmt.Sprintf("the ring has only %d distinct corners; an outline needs at least three", len(plan)))
		return nil, nil, nil, false
	}
	plan = append(plan, plan[0])
	if i, j := selfCrossing(plan); i >= 0 {
		d.fproblem(f, nodes[j], "geometry", fmt.Sprintf("the outline crosses itself: edge %d–%d meets edge %d–%d; draw it as a simple ring", i, (i+1)%(len(plan)-1), j, (j+1)%(len(plan)-1)))
		return nil, nil, nil, false
	}
	if math.Abs(planar.Area(plan)) < 0.01 {
		d.fproblem(f, raw[0].n, "geometry", "the outline has no area (under 0.01 m²)")
		return nil, nil, nil, false
	}
	if plan.Orientation() == orb.CW {
		plan.Reverse()
		slices.Reverse(pts)
		slices.Reverse(nodes)
	}
	return plan, pts, nodes, true
}

func (d *decoder) roof(f *rawFeature) {
	const (
		pitchRule  = "a roof face needs pitch_deg between 0 and 70°, or 3-D coordinates"
		aspectRule = "a roof face needs aspect_deg, the downhill direction: 0 north, 90 east, 180 south, 270 west, below 360"
		eaveRule   = "a roof face needs eave_height_m, its lowest edge above ground, between 0 and 300 m"
	)
	plan, pts, nodes, ok := d.ring3(f)
	if !ok {
		return
	}
	face := Face{ID: f.id, Index: f.index, Plan: plan}
	if !f.rings[0][0].has3 {
		pitch, ok1 := d.need(f, "pitch_deg", 0, MaxPitchDeg, false, pitchRule)
		aspect, ok2 := d.need(f, "aspect_deg", 0, 360, true, aspectRule)
		eave, ok3 := d.need(f, "eave_height_m", 0, 300, false, eaveRule)
		if !ok1 || !ok2 || !ok3 {
			return
		}
		face.PitchDeg, face.AspectDeg, face.EaveHeightM = pitch, aspect, eave
		face.SetEave()
		d.site.Faces = append(d.site.Faces, face)
		return
	}
	// 3-D: the vertices say it all; properties given as well must agree.
	for i, v := range pts {
		if v.U < -5 || v.U > 300 {
			d.fproblem(f, nodes[i], "geometry", fmt.Sprintf("the third coordinate puts this corner %.1f m above ground; it must be metres above the WGS 84 ellipsoid, on the same scale as the site's elevation_m", v.U))
			return
		}
	}
	pl, ok := fitPlane(pts)
	if !ok {
		d.fproblem(f, nodes[0], "geometry", "the 3-D corners lie on one line; a roof face needs an area")
		return
	}
	for i, v := range pts {
		if dist := pl.Distance(v); dist > PlaneToleranceM {
			d.fproblem(f, nodes[i], "geometry", fmt.Sprintf("this corner lies %.2f m off the plane through the face's corners (tolerance %.2f m); a roof face must be flat: split it into faces", dist, PlaneToleranceM))
			return
		}
	}
	face.PitchDeg, face.AspectDeg = pl.PitchDeg(), pl.AspectDeg()
	if face.PitchDeg > MaxPitchDeg {
		d.fproblem(f, nodes[0], "geometry", fmt.Sprintf("the 3-D corners give a pitch of %.1f°, steeper than %g°: a wall, not a roof face", face.PitchDeg, MaxPitchDeg))
		return
	}
	if p, present, ok := d.prop(f, "pitch_deg", 0, MaxPitchDeg, false, pitchRule); present && ok &&
		math.Abs(p-face.PitchDeg) > PitchAgreeDeg {
		d.fproblem(f, f.props.member("pitch_deg"), "pitch_deg", fmt.Sprintf("%g disagrees with the 3-D corners, which give %.1f° (tolerance %g°); correct one or omit pitch_deg", p, face.PitchDeg, PitchAgreeDeg))
	}
	if a, present, ok := d.prop(f, "aspect_deg", 0, 360, true, aspectRule); present && ok {
		if face.PitchDeg < 2 {
			// Too flat for the corners to fix a direction: the surveyor's aspect sets the rows.
			face.AspectDeg = a
		} else if angleDiffDeg(a, face.AspectDeg) > AspectAgreeDeg {
			d.fproblem(f, f.props.member("aspect_deg"), "aspect_deg", fmt.Sprintf("%g disagrees with the 3-D corners, which give %.1f° (tolerance %g°); correct one or omit aspect_deg", a, face.AspectDeg, AspectAgreeDeg))
		}
	}
	face.SetEave()
	dh := face.Downhill()
	// The plane's height where the eave line meets the downhill axis through the centroid.
	face.EaveHeightM = pl.Z0 - math.Tan(face.PitchDeg*math.Pi/180)*(face.EaveOffsetM-(pl.CE*dh[0]+pl.CN*dh[1]))
	if math.Abs(pl.GE)+math.Abs(pl.GN) < 1e-9 {
		face.EaveHeightM = pl.Z0
	}
	if e, present, ok := d.prop(f, "eave_height_m", 0, 300, false, eaveRule); present && ok &&
		math.Abs(e-face.EaveHeightM) > EaveAgreeM {
		d.fproblem(f, f.props.member("eave_height_m"), "eave_height_m", fmt.Sprintf("%g disagrees with the 3-D corners, which give %.2f m (tolerance %g m); correct one or omit eave_height_m", e, face.EaveHeightM, EaveAgreeM))
	}
	if face.EaveHeightM < -0.5 {
		d.fproblem(f, nodes[0], "geometry", fmt.Sprintf("the face's eave lies %.2f m below ground; check the third coordinates against elevation_m", -face.EaveHeightM))
	}
	if !f.failed {
		d.site.Faces = append(d.site.Faces, face)
	}
}

func (d *decoder) block(f *rawFeature) {
	const (
		heightRule = "a block needs height_m, its top (the eaves, for a gable roof) above ground, up to 1000 m"
		baseRule   = "base_m is the block's bottom above the site's ground, between -100 and 1000 m (default 0)"
		ridgeRule  = "ridge_m is the ridge height of a gable-roofed block above ground, higher than height_m"
		razRule    = "ridge_azimuth_deg is the ridge's direction clockwise from north, 0 to below 360"
	)
	plan, pts, _, ok := d.ring3(f)
	if !ok {
		return
	}
	b := Block{ID: f.id, Index: f.index, Footprint: plan}
	h, okH := d.need(f, "height_m", -100, 1000, false, heightRule)
	base, hasBase, okB := d.prop(f, "base_m", -100, 1000, false, baseRule)
	if !hasBase && f.rings[0][0].has3 {
		// 3-D footprint: the ground under the block, lowest corner.
		base = math.Inf(1)
		for _, v := range pts {
			base = math.Min(base, v.U)
		}
	}
	ridge, hasRidge, okR := d.prop(f, "ridge_m", -100, 1100, false, ridgeRule)
	raz, hasRaz, okA := d.prop(f, "ridge_azimuth_deg", 0, 360, true, razRule)
	if !okH || !okB || !okR || !okA {
		return
	}
	if h <= base {
		d.fproblem(f, f.props.member("height_m"), "height_m", fmt.Sprintf("%g is not above base_m %g; a block's top must be above its bottom", h, base))
		return
	}
	switch {
	case hasRidge && !hasRaz:
		d.fproblem(f, f.props.member("ridge_m"), "ridge_azimuth_deg", "missing; a block with ridge_m needs the ridge's direction, clockwise from north")
		return
	case hasRaz && !hasRidge:
		d.fproblem(f, f.props.member("ridge_azimuth_deg"), "ridge_m", "missing; ridge_azimuth_deg needs ridge_m, the ridge height above ground")
		return
	case hasRidge && ridge <= h:
		d.fproblem(f, f.props.member("ridge_m"), "ridge_m", fmt.Sprintf("%g is not above height_m %g; %s", ridge, h, ridgeRule))
		return
	}
	b.BaseM, b.HeightM, b.RidgeM, b.RidgeAzimuthDeg = base, h, ridge, raz
	d.site.Blocks = append(d.site.Blocks, b)
}

// DefaultLeafOffMonths returns the months a deciduous tree is bare when the map does not say:
// November to March north of the equator, May to September south of it (common practice for
// temperate broadleaf trees).
func DefaultLeafOffMonths(latDeg float64) []time.Month {
	if latDeg >= 0 {
		return []time.Month{time.January, time.February, time.March, time.November, time.December}
	}
	return []time.Month{time.May, time.June, time.July, time.August, time.September}
}

func (d *decoder) tree(f *rawFeature, latDeg float64) {
	const (
		heightRule = "a tree needs height_m, the top of its crown above the site's ground, at most 150 m above the tree's base_m"
		radiusRule = "a tree needs crown_radius_m, above 0 and up to 50 m"
		baseRule   = "crown_base_m is the bottom of the crown above the site's ground, from the tree's base_m to below height_m"
		transRule  = "leaf_off_transmittance is the share of sunlight a bare crown lets through, 0 to 1 (omit it for an evergreen)"
		groundRule = "base_m is the ground under the trunk above the site's ground, between -100 and 1000 m (default 0)"
	)
	t := Tree{ID: f.id, Index: f.index}
	v := d.local(f.point)
	t.Trunk = v.Plan()
	h, okH := d.need(f, "height_m", -100, 1150, false, heightRule)
	r, okR := d.need(f, "crown_radius_m", math.SmallestNonzeroFloat64, 50, false, radiusRule)
	ground, hasGround, okG := d.prop(f, "base_m", -100, 1000, false, groundRule)
	if !hasGround && f.point.has3 {
		ground = v.U
	}
	t.BaseM = ground
	shape := "ellipsoid"
	if sn := f.props.member("crown_shape"); sn != nil && sn.kind != 'z' {
		if sn.kind != 's' || (sn.str != "ellipsoid" && sn.str != "sphere" && sn.str != "cone") {
			d.fproblem(f, sn, "crown_shape", "must be \"ellipsoid\", \"sphere\" or \"cone\"")
			return
		}
		shape = sn.str
	}
	if !okH || !okR || !okG {
		return
	}
	if tall := h - ground; tall <= 0 || tall > 150 {
		d.fproblem(f, f.props.member("height_m"), "height_m", fmt.Sprintf("%g gives a tree %.1f m tall above its base_m %g; %s", h, tall, ground, heightRule))
		return
	}
	cb, hasCB, okCB := d.prop(f, "crown_base_m", ground, h, true, baseRule)
	if !okCB {
		return
	}
	switch shape {
	case "sphere":
		t.Shape = CrownSphere
		want := h - 2*r
		if want < ground-1e-9 {
			d.fproblem(f, f.props.member("crown_radius_m"), "crown_radius_m", fmt.Sprintf("a spherical crown of radius %g m does not fit a tree %g m tall; use a smaller radius or crown_shape \"ellipsoid\"", r, h-ground))
			return
		}
		if hasCB && math.Abs(cb-want) > 0.05 {
			d.fproblem(f, f.props.member("crown_base_m"), "crown_base_m", fmt.Sprintf("%g contradicts a spherical crown, whose base is height_m − 2·crown_radius_m = %g m; omit crown_base_m or use crown_shape \"ellipsoid\"", cb, want))
			return
		}
		cb = math.Max(ground, want)
	case "cone":
		t.Shape = CrownCone
		fallthrough
	default:
		if !hasCB {
			d.fproblem(f, f.props, "crown_base_m", "missing; "+baseRule)
			return
		}
	}
	t.HeightM, t.CrownRadiusM, t.CrownBaseM = h, r, cb
	tr, hasTr, okTr := d.prop(f, "leaf_off_transmittance", 0, 1, false, transRule)
	if !okTr {
		return
	}
	mn := f.props.member("leaf_off_months")
	if mn != nil && mn.kind == 'z' {
		mn = nil
	}
	if !hasTr {
		if mn != nil {
			d.fproblem(f, mn, "leaf_off_months", "given without leaf_off_transmittance; an evergreen has no leaf-off months: add leaf_off_transmittance or remove leaf_off_months")
		}
		d.site.Trees = append(d.site.Trees, t)
		return
	}
	t.Deciduous, t.LeafOffTransmittance = true, tr
	if mn == nil {
		t.LeafOffMonths = DefaultLeafOffMonths(latDeg)
	} else {
		const monthRule = "leaf_off_months is a list of month numbers 1 (January) to 12 (December), each once"
		if mn.kind != 'a' {
			d.fproblem(f, mn, "leaf_off_months", "must be an array; "+monthRule)
			return
		}
		seen := map[int]bool{}
		for _, e := range mn.vals {
			x, ok := number(e)
			if !ok || x != math.Trunc(x) || x < 1 || x > 12 || seen[int(x)] {
				d.fproblem(f, e, "leaf_off_months", fmt.Sprintf("%s is not a new month number; %s", strings.TrimSpace(jsonText(d.data, e)), monthRule))
				return
			}
			seen[int(x)] = true
			t.LeafOffMonths = append(t.LeafOffMonths, time.Month(int(x)))
		}
		slices.Sort(t.LeafOffMonths)
	}
	d.site.Trees = append(d.site.Trees, t)
}

// jsonText returns a short excerpt of the input at n, for messages.
func jsonText(data []byte, n *jnode) string {
	switch n.kind {
	case 'n':
		return n.str
	case 's':
		return strconv.Quote(n.str)
	}
	return n.typeName()
}

// crossChecks looks at features together: faces overlapping in plan, panels off every face,
// avoid areas off every face.
func (d *decoder) crossChecks(raws []*rawFeature) {
	byIndex := map[int]*rawFeature{}
	for _, f := range raws {
		byIndex[f.index] = f
	}
	faces := d.site.Faces
	for j := range faces {
		for i := range j {
			if ringsOverlap(faces[i].Plan, faces[j].Plan, overlapTolM) {
				f := byIndex[faces[j].Index]
				d.fproblem(f, f.n.member("geometry"), "geometry", fmt.Sprintf("overlaps roof face %q (feature %d) in plan; faces may share edges but not cover each other", faces[i].ID, faces[i].Index))
			}
		}
	}
	for _, p := range d.site.Panels {
		if faceAt(faces, interiorPoint(p.Outline)) < 0 {
			f := byIndex[p.Index]
			d.fproblem(f, f.n.member("geometry"), "geometry", "a panel must lie on a roof face; its centre is on none")
		}
	}
	for _, a := range d.site.Avoids {
		on := false
		for i := range faces {
			if ringsOverlap(a.Area, faces[i].Plan, 0) {
				on = true
				break
			}
		}
		if !on {
			d.warn(byIndex[a.Index], "the avoid area touches no roof face; it has no effect")
		}
	}
	// A tree standing on a face with its crown reaching below the roof surface is most likely
	// drawn on the wrong spot (or its heights are above the wrong ground): its crown would
	// pass through the roof and shade the modules under it completely.
	for _, t := range d.site.Trees {
		if i := faceAt(faces, t.Trunk); i >= 0 && t.CrownBaseM < faces[i].HeightAt(t.Trunk) {
			d.warn(byIndex[t.Index], fmt.Sprintf("the tree stands on roof face %q and its crown starts %.1f m above ground, below the roof's %.1f m there: the crown passes through the roof; check its position and heights",
				faces[i].ID, t.CrownBaseM, faces[i].HeightAt(t.Trunk)))
		}
	}
}

// faceAt returns the index of the face whose plan contains p, or −1.
func faceAt(faces []Face, p orb.Point) int {
	for i := range faces {
		if planar.RingContains(faces[i].Plan, p) {
			return i
		}
	}
	return -1
}
