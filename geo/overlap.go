package geo

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// OverlapTolM is how wide a strip one roof face may share with another in plan and still be
// accepted as drawn, with a note: hand-drawn outlines of neighbouring faces rarely meet to
// the centimetre along a ridge or a valley. A wider overlap is an error that gives its area
// and place.
const OverlapTolM = 0.05

// overlapSampleM is the finest grid on which an overlap's area is measured: fine against the
// tolerance.
const overlapSampleM = 0.01

// overlapArea measures the area two rings share (m²), its centre and its width (the area over
// its longest extent: the width of a strip), on a grid of overlapSampleM, coarser when the
// rings' common bound is large (at most about 40 000 samples, so a sliver narrower than the
// grid may go unmeasured: it is then within the tolerance anyway).
func overlapArea(a, b orb.Ring) (area float64, centre orb.Point, width float64) {
	ba, bb := a.Bound(), b.Bound()
	lo := orb.Point{math.Max(ba.Min[0], bb.Min[0]), math.Max(ba.Min[1], bb.Min[1])}
	hi := orb.Point{math.Min(ba.Max[0], bb.Max[0]), math.Min(ba.Max[1], bb.Max[1])}
	if hi[0] <= lo[0] || hi[1] <= lo[1] {
		return 0, orb.Point{}, 0
	}
	step := math.Max(overlapSampleM, math.Sqrt((hi[0]-lo[0])*(hi[1]-lo[1])/4e4))
	var n int
	var c orb.Point
	in := orb.Bound{Min: orb.Point{math.Inf(1), math.Inf(1)}, Max: orb.Point{math.Inf(-1), math.Inf(-1)}}
	for y := lo[1] + step/2; y < hi[1]; y += step {
		for x := lo[0] + step/2; x < hi[0]; x += step {
			p := orb.Point{x, y}
			if planar.RingContains(a, p) && planar.RingContains(b, p) {
				n++
				c[0] += x
				c[1] += y
				in = in.Extend(p)
			}
		}
	}
	if n == 0 {
		return 0, orb.Point{}, 0
	}
	area = float64(n) * step * step
	long := math.Max(in.Max[0]-in.Min[0], in.Max[1]-in.Min[1]) + step
	return area, orb.Point{c[0] / float64(n), c[1] / float64(n)}, area / long
}

// faceOverlap words an overlap between faces i < j: accepted with a note when the shared
// strip is no wider than OverlapTolM, otherwise a message with the area and the place, for
// an error. ok is false when the faces share no measurable area.
func (d *decoder) faceOverlap(i, j int) (accepted bool, msg string, ok bool) {
	fi := &d.site.Faces[i]
	area, at, width := overlapArea(fi.Plan, d.site.Faces[j].Plan)
	if area == 0 {
		return false, "", false
	}
	where := fmt.Sprintf("around %.1f m east, %.1f m north of the map's centre", at[0], at[1])
	if d.site.Proj != nil {
		lon, lat, _ := d.site.Proj.Inverse(Vec3{E: at[0], N: at[1]})
		where += fmt.Sprintf(" (longitude %.6f, latitude %.6f)", lon, lat)
	}
	if width <= OverlapTolM {
		return true, fmt.Sprintf("overlaps roof face %q (feature %d) by a strip about %.0f cm wide (%.2f m²) %s: within the %.0f cm drawing tolerance, accepted as drawn; modules keep the setback from both outlines",
			fi.ID, fi.Index, width*100, area, where, OverlapTolM*100), true
	}
	return false, fmt.Sprintf("overlaps roof face %q (feature %d) by %.2f m² %s, about %.2f m wide (more than the %.0f cm accepted as a drawing error); faces may share edges but not cover each other: move the shared corners onto one line",
		fi.ID, fi.Index, area, where, width, OverlapTolM*100), true
}
