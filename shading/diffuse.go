package shading

import (
	"math"
	"sync"

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

// skyDir is one direction of the sampling grid of the whole sphere, with its solid angle.
type skyDir struct {
	d      geo.Vec3
	omega  float64 // steradians
	el, az float64 // degrees
}

// Azimuth bins of skyAzDeg; elevation bins of skyFineDeg within skyFineBandDeg of the
// horizontal, where the horizon band and the edges of walls and the far horizon lie, and of
// skyCoarseDeg elsewhere. About 9 900 directions in front of any plane. Each direction carries
// the exact solid angle of its bin; the midpoint rule in cos θ reproduces the isotropic
// (1+cos β)/2 to about 1e-4 (tests).
const (
	skyAzDeg       = 2.0
	skyFineDeg     = 0.5
	skyFineBandDeg = 15.0
	skyCoarseDeg   = 3.0
)

var skyDirs = sync.OnceValue(func() []skyDir {
	var edges []float64
	for e := -90.0; e < -skyFineBandDeg; e += skyCoarseDeg {
		edges = append(edges, e)
	}
	for e := -skyFineBandDeg; e < skyFineBandDeg; e += skyFineDeg {
		edges = append(edges, e)
	}
	for e := skyFineBandDeg; e <= 90; e += skyCoarseDeg {
		edges = append(edges, e)
	}
	const rad = math.Pi / 180
	var out []skyDir
	for i := 0; i+1 < len(edges); i++ {
		lo, hi := edges[i], edges[i+1]
		el := (lo + hi) / 2
		for az := skyAzDeg / 2; az < 360; az += skyAzDeg {
			out = append(out, skyDir{
				d: geo.Vec3{E: math.Sin(az*rad) * math.Cos(el*rad), N: math.Cos(az*rad) * math.Cos(el*rad), U: math.Sin(el * rad)},
				// the bin's exact solid angle: Δaz·(sin hi − sin lo)
				omega: skyAzDeg * rad * (math.Sin(hi*rad) - math.Sin(lo*rad)),
				el:    el, az: az,
			})
		}
	}
	return out
})

// Diffuse returns the diffuse view fractions of a module, seen from its centre. Tree crowns
// pass their transmittance averaged over the year; the far horizon hides the sky below it.
// The first call per module computes and caches it.
func (sc *Scene) Diffuse(module int) Diffuse {
	sc.diffOnce[module].Do(func() { sc.diff[module] = sc.computeDiffuse(module) })
	return sc.diff[module]
}

func (sc *Scene) computeDiffuse(i int) Diffuse {
	p := &sc.preps[i]
	var sky, skyVis, band, bandVis, ground, groundVis float64
	for _, s := range skyDirs() {
		c := s.d.Dot(p.normal)
		if c <= 0 {
			continue
		}
		w := c * s.omega
		t := w * sc.passes(p, p.centre, s.d)
		if s.el > 0 {
			if s.el < sc.horizon.ElevationDeg(s.az) {
				t = 0
			}
			sky += w
			skyVis += t
			if s.el < HorizonBandDeg {
				band += w
				bandVis += t
			}
		} else {
			ground += w
			groundVis += t
		}
	}
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
