package geo

import (
	"bytes"
	"fmt"
	"math"
	"slices"
	"strings"
)

// buildingKind is a house drawn by its footprint and roof shape: Decode makes its roof faces
// (which take modules like drawn ones) and its walls (an obstacle for the other roofs).
var buildingKind = kind{
	name:     "building",
	geometry: "Polygon",
	props:    []string{"id", "roof_shape", "pitch_deg", "eave_height_m", "ridge_azimuth_deg"},
	build:    (*decoder).building,
	export: func(e *exporter, s *Site) []exportItem {
		var out []exportItem
		for i := range s.Buildings {
			bl := &s.Buildings[i]
			out = append(out, exportItem{index: bl.Index, write: func(b *bytes.Buffer) error {
				ps := []kv{{"kind", "building"}, {"id", bl.ID}, {"roof_shape", bl.RoofShape}}
				if bl.RoofShape != RoofFlat {
					ps = append(ps, kv{"pitch_deg", round(bl.PitchDeg)})
				}
				ps = append(ps, kv{"eave_height_m", round(bl.EaveHeightM)})
				if bl.RoofShape != RoofFlat {
					ps = append(ps, kv{"ridge_azimuth_deg", round(bl.RidgeAzimuthDeg)})
				}
				return e.feature(b, e.ring(bl.Footprint), ps...)
			}})
		}
		return out
	},
	obstacles: func(s *Site) []Obstacle {
		var out []Obstacle
		for i := range s.Buildings {
			b := &s.Buildings[i]
			out = append(out, Obstacle{Kind: "building", ID: b.ID, Index: b.Index, Prism: &b.Walls})
		}
		return out
	},
}

var roofShapes = []string{RoofGabled, RoofHipped, RoofSkillion, RoofFlat}

func (d *decoder) building(f *rawFeature) {
	const (
		pitchRule = "a gabled, hipped or skillion roof needs pitch_deg above 0 and up to 70°"
		eaveRule  = "a building needs eave_height_m, its eaves (a flat roof: the roof) above ground, between 0 and 300 m"
		razRule   = "ridge_azimuth_deg is the ridge's direction (gabled, hipped) or the direction the slope faces (skillion), clockwise from north, 0 to below 360"
	)
	if f.rings[0][0].has3 {
		d.fproblem(f, f.rings[0][0].n, "geometry", "a building's footprint is 2-D; its heights come from eave_height_m and pitch_deg (or draw its faces in 3-D as roof features)")
		return
	}
	if strings.ContainsAny(f.id, ". \t\n") {
		d.fproblem(f, f.props.member("id"), "id", fmt.Sprintf("%q: a building id may not contain a dot or white space, which would break the ids of its faces and modules", f.id))
		return
	}
	plan, ok := d.ring(f)
	if !ok {
		return
	}
	b := Building{ID: f.id, Index: f.index, Footprint: plan}
	sn := f.props.member("roof_shape")
	switch {
	case sn == nil || sn.kind == 'z':
		d.fproblem(f, f.props, "roof_shape", "missing; say the roof's shape: "+strings.Join(roofShapes, ", "))
		return
	case sn.kind != 's' || !slices.Contains(roofShapes, sn.str):
		d.fproblem(f, sn, "roof_shape", fmt.Sprintf("%s is not a roof shape this tool makes; use %s, or draw the faces as roof features", strings.TrimSpace(jsonText(d.data, sn)), strings.Join(roofShapes, ", ")))
		return
	}
	b.RoofShape = sn.str
	eave, okE := d.need(f, "eave_height_m", 0, 300, false, eaveRule)
	raz, hasRaz, okA := d.prop(f, "ridge_azimuth_deg", 0, 360, true, razRule)
	var pitch float64
	okP := true
	if b.RoofShape == RoofFlat {
		if p, present, ok := d.prop(f, "pitch_deg", 0, 0, false, "a flat roof has pitch_deg 0 or none"); present && !ok {
			okP = false
		} else {
			pitch = p
		}
		if hasRaz {
			d.warn(f, "ridge_azimuth_deg is not used by a flat roof; its rows run along the longest wall")
		}
	} else {
		pitch, okP = d.need(f, "pitch_deg", math.SmallestNonzeroFloat64, MaxPitchDeg, false, pitchRule)
		if b.RoofShape == RoofSkillion && !hasRaz {
			d.fproblem(f, f.props, "ridge_azimuth_deg", "missing; a skillion roof needs the direction its slope faces (downhill), clockwise from north")
			return
		}
	}
	if !okE || !okA || !okP {
		return
	}
	b.PitchDeg, b.EaveHeightM, b.RidgeAzimuthDeg = pitch, eave, raz
	pieces, field, msg := b.roofPieces(d.lat0, hasRaz)
	if msg != "" {
		n := f.props.member(field)
		if n == nil {
			n = f.n.member("geometry")
		}
		d.fproblem(f, n, field, msg)
		return
	}
	if !hasRaz && b.RoofShape != RoofFlat {
		// Record the ridge the roof was made with, so that an export reads back the same.
		b.RidgeAzimuthDeg = normDeg(math.Mod(longestEdge(corners(b.Footprint)), 180))
	}
	for _, p := range pieces {
		id := b.ID + "-" + compassPoint(p.aspectDeg)
		if first, used := d.ids[id]; used {
			d.fproblem(f, f.props.member("id"), "id", fmt.Sprintf("the roof face %q this building makes has the id of feature %d; rename one", id, first))
			return
		}
	}
	for _, p := range pieces {
		face := Face{ID: b.ID + "-" + compassPoint(p.aspectDeg), Index: f.index, Plan: p.ring,
			PitchDeg: b.PitchDeg, AspectDeg: p.aspectDeg, EaveHeightM: b.EaveHeightM, Building: b.ID}
		face.SetEave()
		d.site.Faces = append(d.site.Faces, face)
		b.FaceIDs = append(b.FaceIDs, face.ID)
		d.ids[face.ID] = f.index
	}
	b.Walls = Block{ID: b.ID, Index: b.Index, Footprint: b.Footprint, HeightM: b.EaveHeightM}
	d.site.Buildings = append(d.site.Buildings, b)
}
