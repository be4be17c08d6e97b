package geo

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// OverlapTolM is how wide a strip one roof face may share with another in plan and still be
// taken as a drawing error, cut off one of them with a note: hand-drawn outlines of
// neighbouring faces rarely meet to the centimetre along a ridge or a valley. A wider overlap
// is an error that gives its area and place.
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

// overlapNoiseM2 is the shared area below which two faces count as meeting along an edge:
// a square centimetre, the rounding of outlines snapped to the same corners and far below
// anything a module notices.
const overlapNoiseM2 = 1e-4

// overlapOf measures, exactly, the area two rings share (m²), its centroid and its width: the
// area over the longest extent of its bounding box, the width of a strip along an edge (for a
// square at a corner, its side).
func overlapOf(a, b orb.Ring) (area float64, centre orb.Point, width float64) {
	parts := ringIntersection(a, b)
	bd := orb.Bound{Min: orb.Point{math.Inf(1), math.Inf(1)}, Max: orb.Point{math.Inf(-1), math.Inf(-1)}}
	for _, r := range parts {
		c, ar := planar.CentroidArea(r)
		ar = math.Abs(ar)
		area += ar
		centre[0] += c[0] * ar
		centre[1] += c[1] * ar
		bd = bd.Union(r.Bound())
	}
	if area == 0 {
		return 0, orb.Point{}, 0
	}
	centre = orb.Point{centre[0] / area, centre[1] / area}
	return area, centre, area / math.Max(bd.Max[0]-bd.Min[0], bd.Max[1]-bd.Min[1])
}

// tenth rounds x to a tenth, never to −0 (a place a hair south of the centre reads 0.0).
func tenth(x float64) float64 {
	r := math.Round(x*10) / 10
	if r == 0 {
		return 0
	}
	return r
}

// areaText gives an overlap's area in cm² below a hundredth of a square metre, else in m².
func areaText(m2 float64) string {
	if m2 < 0.01 {
		return fmt.Sprintf("%.0f cm²", m2*1e4)
	}
	return fmt.Sprintf("%.2f m²", m2)
}

// widthText gives a strip's width in centimetres, to the millimetre below one.
func widthText(m float64) string {
	if m < 0.01 {
		return fmt.Sprintf("%.1f cm", m*100)
	}
	return fmt.Sprintf("%.0f cm", m*100)
}

// faceOverlap settles an overlap between faces i < j. A strip no wider than OverlapTolM is a
// drawing error: it is cut off the face that comes later in the map (the later feature, or
// the later face of one building), which then ends at the other's edge, and a note says so.
// The later face gives way because it is normally the one traced against the other's edge,
// the one that missed it; the planes cannot tell which outline is right at this size (a
// height measured two centimetres off moves the line where two 35° faces meet by more than
// the strip), and the rule can be read off the map alone. A wider overlap, or a strip whose
// cutting would split the face, hollow it or leave nothing of it, gives an error message
// with the area and the place. ok is false when the faces share no measurable area.
func (d *decoder) faceOverlap(i, j int) (accepted bool, msg string, ok bool) {
	faces := d.site.Faces
	fi, fj := &faces[i], &faces[j]
	area, at, width := overlapOf(fi.Plan, fj.Plan)
	if area < overlapNoiseM2 {
		return false, "", false
	}
	where := fmt.Sprintf("around %.1f m east, %.1f m north of the map's centre", tenth(at[0]), tenth(at[1]))
	if d.site.Proj != nil {
		lon, lat, _ := d.site.Proj.Inverse(Vec3{E: at[0], N: at[1]})
		where += fmt.Sprintf(" (longitude %.6f, latitude %.6f)", lon, lat)
	}
	// A nanometre of slack, so that a strip drawn exactly at the tolerance is within it
	// whatever the last bit of the arithmetic.
	if width > OverlapTolM+1e-9 {
		return false, fmt.Sprintf("overlaps roof face %q (feature %d) by %s %s, about %.2f m wide (more than the %.0f cm accepted as a drawing error); faces may share edges but not cover each other: move the shared corners onto one line",
			fi.ID, fi.Index, areaText(area), where, width, OverlapTolM*100), true
	}
	cut, keep := fj, fi
	if fi.Index > fj.Index {
		cut, keep = fi, fj
	}
	rest, why := trimmed(cut.Plan, keep.Plan)
	if why != "" {
		return false, fmt.Sprintf("overlaps roof face %q (feature %d) by a strip about %s wide (%s) %s, within the %.0f cm drawing tolerance, but cutting it off face %q (feature %d) would %s; move the shared corners onto one line",
			fi.ID, fi.Index, widthText(width), areaText(area), where, OverlapTolM*100, cut.ID, cut.Index, why), true
	}
	cut.Plan = rest
	return true, fmt.Sprintf("overlaps roof face %q (feature %d) by a strip about %s wide (%s) %s: within the %.0f cm drawing tolerance, so the strip is cut off face %q (feature %d), the later of the two in the map, which now ends at the edge of face %q; modules are placed on what is left",
		fi.ID, fi.Index, widthText(width), areaText(area), where, OverlapTolM*100, cut.ID, cut.Index, keep.ID), true
}

// trimmed returns the outline cut less the outline keep, or why that is no outline: the
// result must be one piece without a hole (pieces below overlapNoiseM2, the rounding of the
// cut, are dropped).
func trimmed(cut, keep orb.Ring) (orb.Ring, string) {
	parts, ok := ringDifference(cut, keep)
	if !ok {
		return nil, "leave a hole in it"
	}
	var big []orb.Ring
	for _, r := range parts {
		if planar.Area(r) >= overlapNoiseM2 {
			big = append(big, r)
		}
	}
	switch len(big) {
	case 0:
		return nil, "leave nothing of it"
	case 1:
		return big[0], ""
	}
	return nil, fmt.Sprintf("split it in %d pieces", len(big))
}
