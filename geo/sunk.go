package geo

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// SunkBlocks returns a warning for every block that stands on a roof face (some of its
// footprint inside the face's outline) but nowhere rises above the face's surface: a chimney
// or dormer whose height was given above the roof instead of above the ground. Such a block
// casts no shade and does not keep modules away, so the proposal would place modules over it.
// Each Problem names the block, the face, the heights and the height above the ground the
// block would have if the number given was meant above the roof; File is left empty for the
// caller to fill.
func (s *Site) SunkBlocks() []Problem {
	if s == nil {
		return nil
	}
	var out []Problem
	for _, b := range s.Blocks {
		pts := footprintSamples(b.Footprint)
		for _, f := range s.Faces {
			var inside int
			lo, hi := math.Inf(1), math.Inf(-1)
			clear := false // the block rises above the face at some sampled point
			top := math.Inf(-1)
			for _, p := range pts {
				if !planar.RingContains(f.Plan, p) {
					continue
				}
				inside++
				r := f.HeightAt(p)
				lo, hi = math.Min(lo, r), math.Max(hi, r)
				t := b.TopAt(p)
				top = math.Max(top, t)
				if t > r {
					clear = true
				}
			}
			if inside == 0 || clear {
				continue
			}
			above := b.HeightM - b.BaseM
			if b.Pitched() {
				above = b.RidgeM - b.BaseM
			}
			out = append(out, Problem{Index: b.Index, ID: b.ID, Field: "height_m",
				Msg: fmt.Sprintf("the block's top (%.2f m above the ground) is below the surface of roof face %q under it (%.2f to %.2f m above the ground), so it casts no shade and modules may be placed over it. Heights are above the ground: if %.2f m is the height above the roof, give height_m: %.2f (or height_above_roof_m: %.2f)",
					top, f.ID, lo, hi, above, hi+above, above)})
		}
	}
	return out
}

// footprintSamples returns the footprint's corners, the midpoints of its edges and its vertex
// centroid: enough to tell whether a block stands on a face and how high the roof is under it.
func footprintSamples(r orb.Ring) []orb.Point {
	n := len(r)
	if n > 1 && r[0] == r[n-1] {
		n--
	}
	if n == 0 {
		return nil
	}
	pts := make([]orb.Point, 0, 2*n+1)
	var c orb.Point
	for i := range n {
		p, q := r[i], r[(i+1)%n]
		pts = append(pts, p, orb.Point{(p[0] + q[0]) / 2, (p[1] + q[1]) / 2})
		c[0] += p[0] / float64(n)
		c[1] += p[1] / float64(n)
	}
	return append(pts, c)
}
