package geo

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

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
			// Measured, not only tested: outlines drawn along each other's edges share area
			// without any corner inside the other. A strip within the tolerance is cut off
			// one of the two here, before anything below looks up the face under a point.
			accepted, msg, shared := d.faceOverlap(i, j)
			if !shared && ringsOverlap(faces[i].Plan, faces[j].Plan, overlapTolM) {
				accepted, msg = false, fmt.Sprintf("overlaps roof face %q (feature %d) in plan; faces may share edges but not cover each other", faces[i].ID, faces[i].Index)
			} else if !shared {
				continue
			}
			f := byIndex[faces[j].Index]
			if accepted {
				d.note(f, msg)
			} else {
				d.fproblem(f, f.n.member("geometry"), "geometry", msg)
			}
		}
	}
	for i := range d.site.Blocks {
		b := &d.site.Blocks[i]
		if b.AboveRoofM == 0 && b.HeightM != b.BaseM { // height_m given (a block from height_m is never flat at its base)
			continue
		}
		roof := math.Inf(-1)
		for _, p := range footprintSamples(b.Footprint) {
			if k := faceAt(faces, p); k >= 0 {
				roof = math.Max(roof, faces[k].HeightAt(p))
			}
		}
		f := byIndex[b.Index]
		if math.IsInf(roof, -1) {
			d.fproblem(f, f.props.member("height_above_roof_m"), "height_above_roof_m", "the block stands on no roof face, so there is no roof to measure from; give height_m, its top above the ground")
			continue
		}
		b.HeightM = roof + b.AboveRoofM
	}
	// Hand-drawn panels are modules: two on one spot would count the same roof twice.
	panels := d.site.Panels
	for j := range panels {
		for i := range j {
			if area, _, width := overlapArea(panels[i].Outline, panels[j].Outline); width > overlapTolM || ringsOverlap(panels[i].Outline, panels[j].Outline, overlapTolM) {
				f := byIndex[panels[j].Index]
				d.fproblem(f, f.n.member("geometry"), "geometry", fmt.Sprintf("overlaps panel %q (feature %d) by %.2f m²; panels drawn by hand are modules and cannot overlap: move or delete one", panels[i].ID, panels[i].Index, area))
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
