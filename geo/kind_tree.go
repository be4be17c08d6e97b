package geo

import (
	"bytes"
	"fmt"
	"math"
	"slices"
	"strings"
	"time"
)

// treeKind is a tree: a trunk point and a crown of revolution, evergreen or deciduous.
var treeKind = kind{
	name:     "tree",
	geometry: "Point",
	props: []string{"id", "height_m", "crown_radius_m", "crown_base_m", "crown_shape",
		"leaf_off_transmittance", "leaf_off_months", "base_m", "source"},
	build: (*decoder).tree,
	export: func(e *exporter, s *Site) []exportItem {
		var out []exportItem
		for i := range s.Trees {
			t := &s.Trees[i]
			out = append(out, exportItem{index: t.Index, write: func(b *bytes.Buffer) error {
				ps := []kv{{"kind", "tree"}, {"id", t.ID}, {"height_m", round(t.HeightM)}, {"crown_radius_m", round(t.CrownRadiusM)},
					{"crown_base_m", round(t.CrownBaseM)}, {"crown_shape", t.Shape.String()}, {"base_m", round(t.BaseM)}}
				if t.Deciduous {
					ms := make([]int, len(t.LeafOffMonths))
					for k, m := range t.LeafOffMonths {
						ms[k] = int(m)
					}
					ps = append(ps, kv{"leaf_off_transmittance", round(t.LeafOffTransmittance)}, kv{"leaf_off_months", ms})
				}
				if t.Source != "" {
					ps = append(ps, kv{"source", t.Source})
				}
				return e.feature(b, e.point(t.Trunk), ps...)
			}, imported: t.Source != ""})
		}
		return out
	},
	obstacles: func(s *Site) []Obstacle {
		var out []Obstacle
		for i := range s.Trees {
			t := &s.Trees[i]
			out = append(out, Obstacle{Kind: "tree", ID: t.ID, Index: t.Index, Crown: t})
		}
		return out
	},
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

func (d *decoder) tree(f *rawFeature) {
	const (
		heightRule = "a tree needs height_m, the top of its crown above the site's ground, at most 150 m above the tree's base_m"
		radiusRule = "a tree needs crown_radius_m, above 0 and up to 50 m"
		baseRule   = "crown_base_m is the bottom of the crown above the site's ground, from the tree's base_m to below height_m"
		transRule  = "leaf_off_transmittance is the share of sunlight a bare crown lets through, 0 to 1 (omit it for an evergreen)"
		groundRule = "base_m is the ground under the trunk above the site's ground, between -100 and 1000 m (default 0)"
	)
	t := Tree{ID: f.id, Index: f.index, Source: d.source(f)}
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
		t.LeafOffMonths = DefaultLeafOffMonths(d.lat0)
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
