package shading

import (
	"math"

	"sunstring/geo"
)

// Blocker is something that stands between a module and the sun at some step.
type Blocker struct {
	ID   string // the object's id; empty for the far horizon
	Kind string // "face", "block", "tree" or "horizon", as in Outline
	// Steps counts the steps at which it shades at least one of the module's cells (a tree
	// whatever its season: a bare crown still takes some of the light).
	Steps int
}

// Blockers returns what shades a module over the given steps, the far horizon first, then
// the objects in the scene's order, each with the number of steps it shades. r is what
// Compute found for the same steps (on any cell grid): only the steps at which it shows the
// module less than fully lit are looked at, which is what makes naming the culprits cheap; nil
// (or a result over other steps) looks at every step. At such a step, with the sun up and in
// front of the module, the far horizon is the blocker when the sun is below it; otherwise
// every object that stands between one of the module's cells and the sun is. A module index
// out of range gives nil.
func (sc *Scene) Blockers(module int, steps []Step, r *Result) []Blocker {
	if module < 0 || module >= len(sc.preps) {
		return nil
	}
	if r != nil && (r.Steps() != len(steps) || module >= len(r.mods)) {
		r = nil
	}
	p := &sc.preps[module]
	counts := make([]int, len(sc.objs))
	horizon := 0
	for s, st := range steps {
		if r != nil && r.LitFraction(module, s) >= 1 {
			continue
		}
		d := geo.Vec3{E: st.Sun[0], N: st.Sun[1], U: st.Sun[2]}.Unit()
		if !(d.U > 0) || d.Dot(p.normal) <= 0 {
			continue // night, or the sun behind the module: nothing of anyone's doing
		}
		if sc.horizon != nil {
			el := math.Asin(math.Min(1, d.U)) * 180 / math.Pi
			az := math.Atan2(d.E, d.N) * 180 / math.Pi
			if el < sc.horizon.ElevationDeg(az) {
				horizon++
				continue
			}
		}
		for _, j := range p.objs {
			o := &sc.objs[j]
			for _, q := range p.cells {
				if o.hit(q, d) {
					counts[j]++
					break
				}
			}
		}
	}
	var out []Blocker
	if horizon > 0 {
		out = append(out, Blocker{Kind: "horizon", Steps: horizon})
	}
	for j, n := range counts {
		if n > 0 {
			out = append(out, Blocker{ID: sc.objs[j].id, Kind: sc.objs[j].kind.String(), Steps: n})
		}
	}
	return out
}
