package shading

import (
	"math"

	"sunstring/geo"
)

// Outline is the upper edge of one obstruction seen from a module's centre, for drawing on a
// sun-path chart: ElevationDeg[i] is the highest elevation (degrees) at which the object
// stands in the azimuth i·step, 0 where it does not rise above the horizontal there. Kind is
// "face", "block", "tree" or "horizon" (the far horizon, with an empty ID).
type Outline struct {
	ID, Kind     string
	ElevationDeg []float64
}

// silhouetteScanDeg is the elevation scan step; an edge found by the scan is refined by
// bisection to about 0.001°, but an object narrower than the scan step in elevation can slip
// through, which a chart does not notice.
const silhouetteScanDeg = 0.1

// Silhouette returns the outlines of every object (and of the far horizon, when there is one)
// that rises above the horizontal as seen from the centre of a module, sampled every
// azStepDeg degrees of azimuth from north. A step outside (0, 360] gives nil.
func (sc *Scene) Silhouette(module int, azStepDeg float64) []Outline {
	if !(azStepDeg > 0 && azStepDeg <= 360) {
		return nil
	}
	bins := int(math.Ceil(360/azStepDeg - 1e-9))
	p := &sc.preps[module]
	q := p.centre
	var out []Outline
	if sc.horizon != nil {
		o := Outline{Kind: "horizon", ElevationDeg: make([]float64, bins)}
		for b := range bins {
			o.ElevationDeg[b] = sc.horizon.ElevationDeg(float64(b) * azStepDeg)
		}
		out = append(out, o)
	}
	for j := range sc.objs {
		ob := &sc.objs[j]
		c, sin := coneTo(q, 0, ob.centre, ob.radius)
		// Elevation range of the cone, to bound the scan.
		e0 := math.Asin(math.Max(-1, math.Min(1, c.axis.U))) * 180 / math.Pi
		alpha := math.Asin(math.Min(1, sin)) * 180 / math.Pi
		top, bottom := math.Min(90, e0+alpha), math.Max(0, e0-alpha)
		if top <= 0 {
			continue
		}
		o := Outline{ID: ob.id, Kind: ob.kind.String(), ElevationDeg: make([]float64, bins)}
		any := false
		for b := range bins {
			az := float64(b) * azStepDeg * math.Pi / 180
			dir := func(el float64) geo.Vec3 {
				e := el * math.Pi / 180
				return geo.Vec3{E: math.Sin(az) * math.Cos(e), N: math.Cos(az) * math.Cos(e), U: math.Sin(e)}
			}
			for el := top; el >= bottom; el -= silhouetteScanDeg {
				d := dir(el)
				if !c.contains(d) || !ob.hit(q, d) {
					continue
				}
				lo, hi := el, math.Min(90, el+silhouetteScanDeg)
				for range 7 {
					mid := (lo + hi) / 2
					if ob.hit(q, dir(mid)) {
						lo = mid
					} else {
						hi = mid
					}
				}
				o.ElevationDeg[b] = lo
				any = any || lo > 0
				break
			}
		}
		if any {
			out = append(out, o)
		}
	}
	return out
}
