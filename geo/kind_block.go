package geo

import (
	"bytes"
	"fmt"
	"math"
)

// blockKind is a vertical prism with a flat or gabled top: a chimney, a dormer, a wall, a
// neighbouring building.
var blockKind = kind{
	name:     "block",
	geometry: "Polygon",
	props:    []string{"id", "height_m", "height_above_roof_m", "base_m", "ridge_m", "ridge_azimuth_deg", "roof_shape", "source"},
	build:    (*decoder).block,
	export: func(e *exporter, s *Site) []exportItem {
		var out []exportItem
		for i := range s.Blocks {
			bl := &s.Blocks[i]
			out = append(out, exportItem{index: bl.Index, write: func(b *bytes.Buffer) error {
				ps := []kv{{"kind", "block"}, {"id", bl.ID}, {"height_m", round(bl.HeightM)}, {"base_m", round(bl.BaseM)}}
				if bl.RidgeM != 0 {
					ps = append(ps, kv{"ridge_m", round(bl.RidgeM)}, kv{"ridge_azimuth_deg", round(bl.RidgeAzimuthDeg)})
					if bl.Hipped {
						ps = append(ps, kv{"roof_shape", RoofHipped})
					}
				}
				if bl.Source != "" {
					ps = append(ps, kv{"source", bl.Source})
				}
				return e.feature(b, e.ring(bl.Footprint), ps...)
			}, imported: bl.Source != ""})
		}
		return out
	},
	obstacles: func(s *Site) []Obstacle {
		var out []Obstacle
		for i := range s.Blocks {
			b := &s.Blocks[i]
			out = append(out, Obstacle{Kind: "block", ID: b.ID, Index: b.Index, Prism: b})
		}
		return out
	},
}

func (d *decoder) block(f *rawFeature) {
	const (
		heightRule = "a block needs height_m, its top (the eaves, for a gable roof) above ground, up to 1000 m"
		baseRule   = "base_m is the block's bottom above the site's ground, between -100 and 1000 m (default 0)"
		ridgeRule  = "ridge_m is the ridge height of a gable-roofed block above ground, higher than height_m"
		razRule    = "ridge_azimuth_deg is the ridge's direction clockwise from north, 0 to below 360"
		aboveRule  = "height_above_roof_m is a chimney's top above the roof face it stands on, 0 to 100 m (instead of height_m)"
	)
	plan, pts, _, ok := d.ring3(f)
	if !ok {
		return
	}
	b := Block{ID: f.id, Index: f.index, Footprint: plan}
	// A chimney is measured on the roof: its height above the roof may be given instead, and
	// becomes a height above the ground once the faces are known (crossChecks).
	above, hasAbove, okAbove := d.prop(f, "height_above_roof_m", 0, 100, false, aboveRule)
	if hasAbove {
		switch {
		case !okAbove:
			return
		case f.props.member("height_m") != nil:
			d.fproblem(f, f.props.member("height_above_roof_m"), "height_above_roof_m", "give height_m (the top above the ground) or height_above_roof_m (the top above the roof it stands on), not both")
			return
		case f.props.member("ridge_m") != nil:
			d.fproblem(f, f.props.member("height_above_roof_m"), "height_above_roof_m", "is for flat-topped blocks such as chimneys; for a gable-roofed block give height_m and ridge_m above the ground")
			return
		}
		base, _, okB := d.prop(f, "base_m", -100, 1000, false, baseRule)
		if !okB {
			return
		}
		b.BaseM, b.AboveRoofM, b.HeightM = base, above, base+above // HeightM is settled in crossChecks
		b.Source = d.source(f)
		d.site.Blocks = append(d.site.Blocks, b)
		return
	}
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
	if sn := f.props.member("roof_shape"); sn != nil && sn.kind != 'z' {
		switch {
		case sn.kind != 's' || sn.str != RoofGabled && sn.str != RoofHipped:
			d.fproblem(f, sn, "roof_shape", "must be \"gabled\" or \"hipped\" (a block with ridge_m; without it the top is flat)")
			return
		case !hasRidge:
			d.fproblem(f, sn, "ridge_m", "missing; a gabled or hipped block needs ridge_m, the ridge height above ground")
			return
		}
		b.Hipped = sn.str == RoofHipped
	}
	b.Source = d.source(f)
	b.BaseM, b.HeightM, b.RidgeM, b.RidgeAzimuthDeg = base, h, ridge, raz
	d.site.Blocks = append(d.site.Blocks, b)
}
