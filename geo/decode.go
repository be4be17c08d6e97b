package geo

import (
	"cmp"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"sort"
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
	notes []string
	proj  *ENU
	lat0  float64        // the site origin's latitude, for hemisphere defaults
	ids   map[string]int // feature index by id, for ids that kinds derive
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
	d.site.Notes = append(d.site.Notes, d.notes...)
	return d.site, nil
}

func (d *decoder) syntaxProblem(err error) {
	var off int64 = -1
	ptr := ""
	msg := err.Error()
	var se *json.SyntaxError
	var de *dupKeyError
	var le *limitError
	switch {
	case errors.As(err, &se):
		off = se.Offset
		msg = "not valid JSON (" + se.Error() + "); a map is a GeoJSON FeatureCollection"
	case errors.As(err, &de):
		off, ptr = de.off, de.ptr
		msg = fmt.Sprintf("member %q appears twice in one object; keep one", de.key)
	case errors.As(err, &le):
		off, ptr = le.off, le.ptr
		msg = fmt.Sprintf("at %s: %s", cmp.Or(ptr, "/"), le.msg)
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
		p.Pointer = n.pointer()
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

// note records a remark for the record (Site.Notes), located like a warning.
func (d *decoder) note(f *rawFeature, msg string) {
	name := d.opt.File
	if name == "" {
		name = "map"
	}
	if f == nil {
		d.notes = append(d.notes, name+": "+msg)
		return
	}
	id := ""
	if f.id != "" {
		id = fmt.Sprintf(" (id %q)", f.id)
	}
	d.notes = append(d.notes, fmt.Sprintf("%s: feature %d%s: %s", name, f.index, id, msg))
}
