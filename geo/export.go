package geo

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strconv"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// exportDecimals rounds exported longitudes and latitudes: 1e-9° is about 0.1 mm, below any
// drawing's accuracy, and keeps the file short and its bytes stable.
const exportDecimals = 9

// ExportGeoJSON writes the site's features and the placed modules as one FeatureCollection in
// WGS 84 longitude/latitude, in that order: roofs, blocks, trees, avoid areas and panels as the
// map gave them (roof faces with pitch_deg, aspect_deg and eave_height_m, whether the map drew
// them in 2-D or 3-D), then modules as 2-D polygons of their outline in plan with kind
// "module", id, face, row, column and the properties props(i) adds for module i (props may be
// nil). Reading the result with Decode and the same options gives the same site; modules are
// output and Decode skips them. The bytes depend only on the inputs.
func ExportGeoJSON(site *Site, mods []Module, props func(i int) map[string]any) ([]byte, error) {
	if site == nil || site.Proj == nil {
		return nil, errors.New("geo: export: the site has no projection (build it with Decode)")
	}
	var items []exportItem
	e := &exporter{p: site.Proj}
	for _, k := range kinds {
		items = append(items, k.export(e, site)...)
	}
	// Features keep the map's order; Index is unique per feature within one map.
	before := func(a, b exportItem) bool {
		if a.imported != b.imported {
			return !a.imported
		}
		return a.index < b.index
	}
	for i := 1; i < len(items); i++ {
		for j := i; j > 0 && before(items[j], items[j-1]); j-- {
			items[j], items[j-1] = items[j-1], items[j]
		}
	}
	var b bytes.Buffer
	b.WriteString(`{"type":"FeatureCollection","features":[`)
	n := 0
	sep := func() {
		if n > 0 {
			b.WriteString(",")
		}
		b.WriteString("\n")
		n++
	}
	for _, it := range items {
		sep()
		if err := it.write(&b); err != nil {
			return nil, err
		}
	}
	for i := range mods {
		m := &mods[i]
		c := m.Corners()
		ring := orb.Ring{c[0].Plan(), c[1].Plan(), c[2].Plan(), c[3].Plan(), c[0].Plan()}
		ps := []kv{{"kind", "module"}, {"id", m.ID}, {"face", m.Face}, {"row", m.Row}, {"column", m.Col}}
		if props != nil {
			extra, err := json.Marshal(props(i)) // map keys come out sorted: stable bytes
			if err != nil {
				return nil, fmt.Errorf("geo: export: properties of module %q: %w", m.ID, err)
			}
			ps = append(ps, kv{"", json.RawMessage(extra)})
		}
		sep()
		if err := e.feature(&b, e.ring(ring), ps...); err != nil {
			return nil, fmt.Errorf("geo: export: module %q: %w", m.ID, err)
		}
	}
	b.WriteString("\n]}\n")
	return b.Bytes(), nil
}

// exportItem is one feature of the site for ExportGeoJSON: its index in the map (the output
// keeps the map's order) and how to write it.
type exportItem struct {
	index    int
	write    func(*bytes.Buffer) error
	imported bool // from a surroundings file: after the map's features
}

// kv is one property in output order; an empty key splices a JSON object's members.
type kv struct {
	k string
	v any
}

type exporter struct{ p *ENU }

// round keeps exported heights and angles at a micrometre / microdegree, so that projection
// noise does not reach the bytes.
func round(x float64) float64 { return math.Round(x*1e6) / 1e6 }

func (e *exporter) lonlat(p orb.Point) string {
	lon, lat, _ := e.p.Inverse(Vec3{p[0], p[1], 0})
	return "[" + strconv.FormatFloat(roundTo(lon, exportDecimals), 'f', -1, 64) + "," +
		strconv.FormatFloat(roundTo(lat, exportDecimals), 'f', -1, 64) + "]"
}

func roundTo(x float64, d int) float64 {
	k := math.Pow(10, float64(d))
	return math.Round(x*k) / k
}

func (e *exporter) ring(r orb.Ring) string {
	var b bytes.Buffer
	b.WriteString(`{"type":"Polygon","coordinates":[[`)
	for i, p := range r {
		if i > 0 {
			b.WriteString(",")
		}
		b.WriteString(e.lonlat(p))
	}
	b.WriteString("]]}")
	return b.String()
}

func (e *exporter) point(p orb.Point) string {
	return `{"type":"Point","coordinates":` + e.lonlat(p) + "}"
}

func (e *exporter) feature(b *bytes.Buffer, geom string, ps ...kv) error {
	b.WriteString(`{"type":"Feature","properties":{`)
	n := 0
	for _, p := range ps {
		if p.k == "" {
			raw := bytes.TrimSpace(p.v.(json.RawMessage))
			if len(raw) > 2 && string(raw) != "null" {
				if n > 0 {
					b.WriteString(",")
				}
				b.Write(raw[1 : len(raw)-1])
				n++
			}
			continue
		}
		v, err := json.Marshal(p.v)
		if err != nil {
			return err
		}
		if n > 0 {
			b.WriteString(",")
		}
		k, _ := json.Marshal(p.k)
		b.Write(k)
		b.WriteString(":")
		b.Write(v)
		n++
	}
	b.WriteString(`},"geometry":`)
	b.WriteString(geom)
	b.WriteString("}")
	return nil
}

// FaceSummary is one roof face's figures for a report.
type FaceSummary struct {
	ID           string
	PlanAreaM2   float64 // outline seen from above
	SlopedAreaM2 float64 // on the roof surface: plan area / cos(pitch)
	PitchDeg     float64
	AspectDeg    float64
	Modules      int // modules placed on the face
}

// Summarize returns one summary per roof face, in the site's order.
func Summarize(site *Site, mods []Module) []FaceSummary {
	if site == nil {
		return nil
	}
	n := map[string]int{}
	for _, m := range mods {
		n[m.Face]++
	}
	out := make([]FaceSummary, len(site.Faces))
	for i, f := range site.Faces {
		a := planar.Area(f.Plan)
		out[i] = FaceSummary{ID: f.ID, PlanAreaM2: a, SlopedAreaM2: a / math.Cos(f.PitchDeg*math.Pi/180),
			PitchDeg: f.PitchDeg, AspectDeg: f.AspectDeg, Modules: n[f.ID]}
	}
	return out
}
