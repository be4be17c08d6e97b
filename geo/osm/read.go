package osm

import (
	"bytes"
	"context"
	"encoding/xml"
	"errors"
	"fmt"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
	posm "github.com/paulmach/osm"
	"github.com/paulmach/osm/osmxml"

	"sunstring/geo"
)

// Defaults for what an extract does not say. Each use is listed as a warning.
const (
	// DefaultStoreyM is the height of one storey, floor to floor (common practice for houses
	// and flats).
	DefaultStoreyM = 3.0
	// DefaultLevels is the storeys of a building tagged with neither height nor levels: a
	// house of two storeys (common practice).
	DefaultLevels = 2
	// DefaultRoofPitchDeg gives a pitched roof its height when no tag does (common practice
	// for a tiled roof).
	DefaultRoofPitchDeg = 35.0
	// DefaultTreeHeightM is a tree's height when the extract gives none (common practice for a
	// grown garden or street tree).
	DefaultTreeHeightM = 10.0
	// DefaultCrownFraction is a crown's diameter as a share of the tree's height when
	// diameter_crown is missing (common practice for broadleaf trees).
	DefaultCrownFraction = 0.6
	// MaxBytes bounds the extract read into memory: a neighbourhood is a few megabytes.
	MaxBytes = 256 << 20
)

// Options tells Read what the extract does not. The zero value names the file "extract" and
// uses DefaultStoreyM.
type Options struct {
	File    string  // for messages and as the Source of every obstacle
	StoreyM float64 // storey height; 0 → DefaultStoreyM
}

// start is one element's opening tag in the file, for line numbers and for what the decoded
// element forgets (whether lat and lon were given at all).
type start struct {
	kind, id string
	line     int
	tag      string
}

var startTag = regexp.MustCompile(`<(node|way|relation|bounds)[\s/>][^>]*>`)
var idAttr = regexp.MustCompile(`\sid\s*=\s*["']([^"']*)["']`)

var (
	osmRoot = regexp.MustCompile(`<osm[\s>]`)
	latAttr = regexp.MustCompile(`\slat\s*=`)
	lonAttr = regexp.MustCompile(`\slon\s*=`)
)

type reader struct {
	opt    Options
	proj   *geo.ENU
	starts []start
	line   map[string]int // "way/12" → line
	probs  geo.Problems
	out    geo.Surroundings
	nodes  map[posm.NodeID]*posm.Node
	// feature is the feature index of each id read from GeoJSON, for messages.
	feature map[string]int
}

// Read reads an OSM XML extract and returns its buildings as blocks and its trees as trees, in
// the local metres of proj, with a warning for every height it had to assume. Bad input gives a
// geo.Problems error naming the file, the line and the element.
func Read(r io.Reader, proj *geo.ENU, opt Options) (*geo.Surroundings, error) {
	data, opt, err := begin(r, proj, opt, "Read")
	if err != nil {
		return nil, err
	}
	rd := &reader{opt: opt, proj: proj, line: map[string]int{}, nodes: map[posm.NodeID]*posm.Node{}}
	if len(data) > MaxBytes {
		return nil, rd.fail(0, fmt.Sprintf("the extract is larger than %d MiB; cut it to the site's neighbourhood", MaxBytes>>20))
	}
	body := bytes.TrimLeft(bytes.TrimPrefix(data, []byte("\xef\xbb\xbf")), " \t\r\n")
	switch {
	case bytes.Contains(data[:min(len(data), 64)], []byte("OSMHeader")):
		return nil, rd.fail(0, "this is an OSM PBF file; export the neighbourhood as OSM XML (.osm) instead")
	case !bytes.HasPrefix(body, []byte("<")) || !osmRoot.Match(data):
		return nil, rd.fail(1, "not an OSM XML extract (it must start with <?xml …?> or <osm …>); export the neighbourhood as OSM XML")
	}
	rd.index(data)
	var ways []*posm.Way
	var rels []*posm.Relation
	sc := osmxml.New(context.Background(), bytes.NewReader(data))
	defer sc.Close()
	k := 0
	for sc.Scan() {
		switch o := sc.Object().(type) {
		case *posm.Node:
			rd.node(o, k)
		case *posm.Way:
			ways = append(ways, o)
		case *posm.Relation:
			rels = append(rels, o)
		}
		k++
	}
	if err := sc.Err(); err != nil {
		var se *xml.SyntaxError
		switch {
		case errors.As(err, &se):
			return nil, rd.fail(se.Line, "not valid XML: "+se.Msg)
		case k < len(rd.starts):
			s := rd.starts[k]
			return nil, rd.fail(s.line, fmt.Sprintf("%s %s: does not read (%v); check its attributes", s.kind, s.id, err))
		}
		return nil, rd.fail(0, fmt.Sprintf("does not read: %v", err))
	}
	if len(rd.probs) > 0 {
		return nil, rd.probs
	}
	for _, w := range ways {
		if isBuilding(w.Tags) {
			rd.building(fmt.Sprintf("way/%d", w.ID), w.Tags, w.Nodes, rd.line[fmt.Sprintf("way/%d", w.ID)])
		}
	}
	byID := map[posm.WayID]*posm.Way{}
	for _, w := range ways {
		byID[w.ID] = w
	}
	for _, rel := range rels {
		if rel.Tags.Find("type") != "multipolygon" || !isBuilding(rel.Tags) {
			continue
		}
		id := fmt.Sprintf("relation/%d", rel.ID)
		n := 0
		for _, m := range rel.Members {
			if m.Type != posm.TypeWay || m.Role != "outer" {
				continue
			}
			w := byID[posm.WayID(m.Ref)]
			if w == nil || len(w.Nodes) < 4 || w.Nodes[0].ID != w.Nodes[len(w.Nodes)-1].ID {
				rd.warn(id, fmt.Sprintf("outer way %d is missing from the extract or not closed on its own; left out (draw it as a block if it matters)", m.Ref))
				continue
			}
			n++
			rid := id
			if n > 1 {
				rid = fmt.Sprintf("%s#%d", id, n)
			}
			rd.building(rid, rel.Tags, w.Nodes, rd.line[id])
		}
	}
	if len(rd.probs) > 0 {
		return nil, rd.probs
	}
	return &rd.out, nil
}

// index finds every element's opening tag with its line.
func (rd *reader) index(data []byte) {
	line, last := 1, 0
	for _, m := range startTag.FindAllSubmatchIndex(data, -1) {
		line += bytes.Count(data[last:m[0]], []byte("\n"))
		last = m[0]
		tag := string(data[m[0]:m[1]])
		s := start{kind: string(data[m[2]:m[3]]), line: line, tag: tag}
		if id := idAttr.FindStringSubmatch(tag); id != nil {
			s.id = id[1]
		}
		rd.starts = append(rd.starts, s)
		if _, seen := rd.line[s.kind+"/"+s.id]; !seen {
			rd.line[s.kind+"/"+s.id] = line
		}
	}
}

func (rd *reader) fail(line int, msg string) geo.Problems {
	rd.probs = append(rd.probs, geo.Problem{File: rd.opt.File, Index: -1, Line: line, Msg: msg})
	return rd.probs
}

// problem records a problem with an element.
func (rd *reader) problem(id, field, msg string) {
	if i, ok := rd.feature[id]; ok {
		rd.probs = append(rd.probs, geo.Problem{File: rd.opt.File, Index: i, ID: id, Field: field, Msg: msg})
		return
	}
	if field != "" {
		msg = field + ": " + msg
	}
	rd.probs = append(rd.probs, geo.Problem{File: rd.opt.File, Index: -1, Line: rd.lineOf(id),
		Msg: strings.Replace(id, "/", " ", 1) + ": " + msg})
}

func (rd *reader) lineOf(id string) int {
	if i := strings.IndexByte(id, '#'); i >= 0 {
		id = id[:i]
	}
	return rd.line[id]
}

// warn notes what had to be assumed about an element; it reaches the surveyor only when the
// element is used.
func (rd *reader) warn(id, msg string) {
	if rd.out.Assumed == nil {
		rd.out.Assumed = map[string][]string{}
	}
	rd.out.Assumed[id] = append(rd.out.Assumed[id], msg)
}

func (rd *reader) node(n *posm.Node, k int) {
	id := fmt.Sprintf("node/%d", n.ID)
	if k < len(rd.starts) && rd.starts[k].kind == "node" {
		tag := rd.starts[k].tag
		if !latAttr.MatchString(tag) || !lonAttr.MatchString(tag) {
			rd.problem(id, "", "a node needs lat and lon")
			return
		}
	}
	if math.IsNaN(n.Lat) || n.Lat < -90 || n.Lat > 90 || math.IsNaN(n.Lon) || n.Lon < -180 || n.Lon > 180 {
		rd.problem(id, "", fmt.Sprintf("lat %g / lon %g are outside [-90, 90] / [-180, 180]", n.Lat, n.Lon))
		return
	}
	rd.nodes[n.ID] = n
	if n.Tags.Find("natural") == "tree" {
		rd.tree(id, n.Tags, n.Lon, n.Lat)
	}
}

func isBuilding(ts posm.Tags) bool {
	for _, k := range []string{"building", "building:part"} {
		if v := ts.Find(k); v != "" && v != "no" {
			return true
		}
	}
	return false
}

// metres reads a length tag: "12", "12.5", "12 m" or "12m". present is false when the tag is
// absent; a value that is not a length is a problem.
func (rd *reader) metres(id string, ts posm.Tags, key string) (v float64, present, ok bool) {
	s := strings.TrimSpace(ts.Find(key))
	if s == "" {
		return 0, false, true
	}
	num := strings.TrimSpace(strings.TrimSuffix(s, "m"))
	x, err := strconv.ParseFloat(num, 64)
	if err != nil || math.IsNaN(x) || math.IsInf(x, 0) || x < 0 || x > 1000 {
		rd.problem(id, key, fmt.Sprintf("%q is not a length in metres from 0 to 1000 (write 12 or 12.5 m)", s))
		return 0, true, false
	}
	return x, true, true
}

// count reads a storey count or an angle: a plain number from lo to hi.
func (rd *reader) count(id string, ts posm.Tags, key string, lo, hi float64, what string) (v float64, present, ok bool) {
	s := strings.TrimSpace(ts.Find(key))
	if s == "" {
		return 0, false, true
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(x) || x < lo || x > hi {
		rd.problem(id, key, fmt.Sprintf("%q is not %s from %g to %g", s, what, lo, hi))
		return 0, true, false
	}
	return x, true, true
}

var compass = map[string]float64{"N": 0, "NNE": 22.5, "NE": 45, "ENE": 67.5, "E": 90, "ESE": 112.5, "SE": 135, "SSE": 157.5,
	"S": 180, "SSW": 202.5, "SW": 225, "WSW": 247.5, "W": 270, "WNW": 292.5, "NW": 315, "NNW": 337.5}

func (rd *reader) tree(id string, ts posm.Tags, lon, lat float64) {
	h, hasH, okH := rd.metres(id, ts, "height")
	d, hasD, okD := rd.metres(id, ts, "diameter_crown")
	if !okH || !okD {
		return
	}
	if !hasH || h <= 0 {
		h = DefaultTreeHeightM
		rd.warn(id, fmt.Sprintf("a tree without height: assumed %g m (measure it on site)", h))
	}
	if !hasD || d <= 0 {
		d = DefaultCrownFraction * h
		rd.warn(id, fmt.Sprintf("a tree without diameter_crown: assumed %g m, %g of its height (measure it on site)", d, DefaultCrownFraction))
	}
	trunk := rd.proj.Forward(lon, lat, rd.proj.HeightM).Plan()
	rd.out.Trees = append(rd.out.Trees, geo.Tree{ID: id, Trunk: trunk, HeightM: h, CrownRadiusM: d / 2,
		CrownBaseM: math.Max(0, h-d), Shape: geo.CrownEllipsoid})
}

// building turns one way and its tags into a block.
func (rd *reader) building(id string, ts posm.Tags, nds posm.WayNodes, line int) {
	if line > 0 {
		rd.line[id] = line
	}
	if len(nds) < 4 || nds[0].ID != nds[len(nds)-1].ID {
		rd.problem(id, "", fmt.Sprintf("a building outline must be closed (its last node the first) with at least three corners; it has %d nodes", len(nds)))
		return
	}
	var lonlat []orb.Point
	for _, nd := range nds[:len(nds)-1] {
		n := rd.nodes[nd.ID]
		if n == nil {
			rd.problem(id, "", fmt.Sprintf("node %d is not in the file; export the extract with every node of its ways", nd.ID))
			return
		}
		lonlat = append(lonlat, orb.Point{n.Lon, n.Lat})
	}
	rd.block(id, ts, lonlat)
}

// block turns an outline (longitude/latitude, without its closing corner) and its tags into a
// block.
func (rd *reader) block(id string, ts posm.Tags, lonlat []orb.Point) {
	var ring orb.Ring
	for _, q := range lonlat {
		p := rd.proj.Forward(q[0], q[1], rd.proj.HeightM).Plan()
		if k := len(ring); k > 0 && math.Hypot(p[0]-ring[k-1][0], p[1]-ring[k-1][1]) < 1e-3 {
			continue
		}
		ring = append(ring, p)
	}
	if len(ring) < 3 {
		rd.problem(id, "", "the outline has fewer than three distinct corners")
		return
	}
	ring = append(ring, ring[0])
	if ring.Orientation() == orb.CW {
		ring.Reverse()
	}
	b := geo.Block{ID: id, Footprint: ring}
	storey := rd.opt.StoreyM
	base, hasBase, ok1 := rd.metres(id, ts, "min_height")
	minLevel, hasMinLevel, ok2 := rd.count(id, ts, "building:min_level", 0, 200, "a storey count")
	height, hasHeight, ok3 := rd.metres(id, ts, "height")
	levels, hasLevels, ok4 := rd.count(id, ts, "building:levels", 0, 200, "a storey count")
	roofH, hasRoofH, ok5 := rd.metres(id, ts, "roof:height")
	roofLevels, hasRoofLevels, ok6 := rd.count(id, ts, "roof:levels", 0, 20, "a storey count")
	angle, hasAngle, ok7 := rd.count(id, ts, "roof:angle", 0, 80, "an angle in degrees")
	if !ok1 || !ok2 || !ok3 || !ok4 || !ok5 || !ok6 || !ok7 {
		return
	}
	if !hasBase && hasMinLevel {
		base = minLevel * storey
	}
	shape := strings.TrimSpace(ts.Find("roof:shape"))
	pitched := false
	switch shape {
	case "", "flat":
	case "gabled", "saltbox":
		pitched = true
	case "hipped", "half-hipped", "pyramidal":
		pitched, b.Hipped = true, true
	default:
		rd.warn(id, fmt.Sprintf("roof:shape=%s is drawn as a flat top at the building's full height, which shades at least as much", shape))
	}
	if pitched {
		az, ok := rd.ridge(id, ts, ring)
		if !ok {
			return
		}
		b.RidgeAzimuthDeg = az
	}
	half := halfWidth(ring, b.RidgeAzimuthDeg)
	switch {
	case !pitched:
		roofH = 0
	case hasRoofH:
	case hasAngle:
		roofH = half * math.Tan(angle*math.Pi/180)
	case hasRoofLevels:
		roofH = roofLevels * storey
	default:
		roofH = half * math.Tan(DefaultRoofPitchDeg*math.Pi/180)
		rd.warn(id, fmt.Sprintf("no roof:height: a %g° pitch assumed, a roof %.1f m high (measure it on site)", DefaultRoofPitchDeg, roofH))
	}
	switch {
	case hasHeight:
	case hasLevels:
		// building:levels counts the storeys from the ground, under the roof (Simple 3D
		// Buildings), also when min_height or building:min_level lift the bottom.
		height = levels*storey + roofH
		rd.warn(id, fmt.Sprintf("no height: %g storeys of %g m and the roof, %.1f m in all (measure it on site)", levels, storey, height))
	default:
		height = base + DefaultLevels*storey + roofH
		rd.warn(id, fmt.Sprintf("no height or building:levels: assumed %d storeys of %g m and the roof, %.1f m in all (measure it on site)", DefaultLevels, storey, height))
	}
	eave := height - roofH
	if height <= base {
		rd.problem(id, "height", fmt.Sprintf("the top at %g m is not above the bottom at %g m (min_height or building:min_level)", height, base))
		return
	}
	if eave <= base {
		if hasRoofH {
			rd.problem(id, "roof:height", fmt.Sprintf("%g m leaves no walls under a top at %g m above a bottom at %g m", roofH, height, base))
			return
		}
		eave = base + (height-base)/2
	}
	b.BaseM, b.HeightM = base, eave
	if pitched && height > eave {
		b.RidgeM = height
	} else {
		b.HeightM, b.Hipped = height, false
	}
	rd.out.Blocks = append(rd.out.Blocks, b)
}

// ridge returns the ridge's azimuth: across roof:direction when tagged, else along the longest
// wall (across it with roof:orientation=across).
func (rd *reader) ridge(id string, ts posm.Tags, ring orb.Ring) (float64, bool) {
	if s := strings.TrimSpace(ts.Find("roof:direction")); s != "" {
		dir, ok := compass[strings.ToUpper(s)]
		if !ok {
			x, err := strconv.ParseFloat(s, 64)
			if err != nil || x < 0 || x >= 360 {
				rd.problem(id, "roof:direction", fmt.Sprintf("%q is neither degrees from 0 to below 360 nor a compass point (N, NE, …)", s))
				return 0, false
			}
			dir = x
		}
		return math.Mod(dir+90, 180), true
	}
	best, az := -1.0, 0.0
	for i := 0; i+1 < len(ring); i++ {
		a, b := ring[i], ring[i+1]
		if l := math.Hypot(b[0]-a[0], b[1]-a[1]); l > best+1e-9 {
			best = l
			az = math.Mod(math.Atan2(b[0]-a[0], b[1]-a[1])*180/math.Pi+360, 180)
		}
	}
	switch o := ts.Find("roof:orientation"); o {
	case "", "along":
	case "across":
		az = math.Mod(az+90, 180)
	default:
		rd.problem(id, "roof:orientation", fmt.Sprintf("%q is neither along nor across", o))
		return 0, false
	}
	return az, true
}

// halfWidth is the largest distance of a corner from the ridge line through the corners'
// centroid, as geo.Block draws its roof.
func halfWidth(ring orb.Ring, azDeg float64) float64 {
	var c orb.Point
	n := float64(len(ring) - 1)
	for _, p := range ring[:len(ring)-1] {
		c[0] += p[0] / n
		c[1] += p[1] / n
	}
	a := azDeg * math.Pi / 180
	half := 0.0
	for _, p := range ring {
		half = math.Max(half, math.Abs((p[0]-c[0])*math.Cos(a)-(p[1]-c[1])*math.Sin(a)))
	}
	return half
}

// begin checks a reader's arguments, fills in the options' defaults and reads the whole
// input, at most MaxBytes+1 of it (the caller refuses more).
func begin(r io.Reader, proj *geo.ENU, opt Options, fn string) ([]byte, Options, error) {
	if proj == nil {
		return nil, opt, fmt.Errorf("osm: %s needs the site's projection", fn)
	}
	if opt.File == "" {
		opt.File = "extract"
	}
	if opt.StoreyM <= 0 {
		opt.StoreyM = DefaultStoreyM
	}
	data, err := io.ReadAll(io.LimitReader(r, MaxBytes+1))
	if err != nil {
		return nil, opt, fmt.Errorf("osm: reading %s: %w", opt.File, err)
	}
	return data, opt, nil
}
