package geo

import (
	"fmt"

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
