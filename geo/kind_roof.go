package geo

import (
	"bytes"
	"fmt"
	"math"
)

// roofKind is a planar roof face that takes modules; it shades the other faces' modules as a
// face, not as an obstacle.
var roofKind = kind{
	name:     "roof",
	geometry: "Polygon",
	props:    []string{"id", "pitch_deg", "aspect_deg", "eave_height_m", "keep_empty"},
	build:    (*decoder).roof,
	export: func(e *exporter, s *Site) []exportItem {
		var out []exportItem
		for i := range s.Faces {
			f := &s.Faces[i]
			if f.Building != "" {
				continue // written as its building
			}
			out = append(out, exportItem{index: f.Index, write: func(b *bytes.Buffer) error {
				ps := []kv{{"kind", "roof"}, {"id", f.ID},
					{"pitch_deg", round(f.PitchDeg)}, {"aspect_deg", round(f.AspectDeg)}, {"eave_height_m", round(f.EaveHeightM)}}
				if f.KeepEmpty {
					ps = append(ps, kv{"keep_empty", true})
				}
				return e.feature(b, e.ring(f.Plan), ps...)
			}})
		}
		return out
	},
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
	face := Face{ID: f.id, Index: f.index, Plan: plan, KeepEmpty: d.flag(f, "keep_empty")}
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
