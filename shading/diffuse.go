package shading

import (
	"math"

	"sunstring/geo"
)

// Diffuse says how much of each diffuse component a module receives, as fractions of what an
// unobstructed module in the same plane receives: SkyView of the isotropic sky, HorizonView of
// the horizon band (the sky between elevation 0 and HorizonBandDeg), GroundView of the ground
// (for reflected light). A component the plane cannot see at all (the ground, for a flat
// module) has the fraction 1, so multiplying by it never loses anything.
type Diffuse struct {
	SkyView, HorizonView, GroundView float64
}

// HorizonBandDeg is the height of the horizon band whose visibility Diffuse.HorizonView
// reports. Diffuse-sky models that brighten the horizon put the excess in a narrow band just
// above it; six degrees covers it (our choice, documented in doc.go).
const HorizonBandDeg = 6.0

// diffuseGrid is the side of the stratified grid of sample directions: 96² = 9216 rays, each
// carrying the same share of the cosine-weighted hemisphere, so a component's fraction is a
// count ratio. Checked against the isotropic (1+cos β)/2 in the tests to better than 0.5 %.
const diffuseGrid = 96

// Diffuse returns the diffuse view fractions of a module, seen from its centre. Tree crowns
// pass their transmittance averaged over the year; the far horizon hides the sky below it.
// The first call per module computes and caches it.
func (sc *Scene) Diffuse(module int) Diffuse {
	sc.diffOnce[module].Do(func() { sc.diff[module] = sc.computeDiffuse(module) })
	return sc.diff[module]
}

// hemisphere calls f for each of diffuseGrid² directions that split the hemisphere around n
// into parts of equal projected solid angle: stratified points of the unit square mapped to
// the disc by the concentric map (Shirley & Chiu 1997, "A low distortion map between disk
// and square", J. Graphics Tools 2(3)) and lifted onto the hemisphere (Malley's method).
func hemisphere(u, n geo.Vec3, f func(d geo.Vec3)) {
	e1 := u.Sub(n.Scale(u.Dot(n))).Unit()
	e2 := n.Cross(e1)
	for i := range diffuseGrid {
		for j := range diffuseGrid {
			a := 2*(float64(i)+0.5)/diffuseGrid - 1
			b := 2*(float64(j)+0.5)/diffuseGrid - 1
			var r, phi float64
			if math.Abs(a) > math.Abs(b) {
				r, phi = a, math.Pi/4*b/a
			} else {
				r, phi = b, math.Pi/2-math.Pi/4*a/b
			}
			x, y := r*math.Cos(phi), r*math.Sin(phi)
			z := math.Sqrt(math.Max(0, 1-x*x-y*y))
			f(e1.Scale(x).Add(e2.Scale(y)).Add(n.Scale(z)))
		}
	}
}

func (sc *Scene) computeDiffuse(i int) Diffuse {
	m := &sc.mods[i]
	p := &sc.preps[i]
	var sky, skyVis, band, bandVis, ground, groundVis float64
	hemisphere(m.U, p.normal, func(d geo.Vec3) {
		t := sc.passes(p, p.centre, d)
		if d.U > 0 {
			el := math.Asin(math.Min(1, d.U)) * 180 / math.Pi
			if el < sc.horizon.ElevationDeg(math.Atan2(d.E, d.N)*180/math.Pi) {
				t = 0
			}
			sky++
			skyVis += t
			if el < HorizonBandDeg {
				band++
				bandVis += t
			}
		} else {
			ground++
			groundVis += t
		}
	})
	ratio := func(v, all float64) float64 {
		if all == 0 {
			return 1
		}
		return v / all
	}
	return Diffuse{SkyView: ratio(skyVis, sky), HorizonView: ratio(bandVis, band), GroundView: ratio(groundVis, ground)}
}

// passes returns the fraction of light along direction d that reaches q (a point of the
// module prepared in p) past the near objects, with crowns at their annual mean.
func (sc *Scene) passes(p *modPrep, q, d geo.Vec3) float64 {
	t := 1.0
	for j, c := range p.cones {
		if !c.contains(d) {
			continue
		}
		o := &sc.objs[p.objs[j]]
		if p.front[j] && d.Dot(o.n) >= 0 {
			continue
		}
		if o.hit(q, d) {
			t *= o.meanTransmittance()
			if t == 0 {
				return 0
			}
		}
	}
	return t
}
