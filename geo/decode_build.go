package geo

import (
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// build projects the checked features, validates their geometry and fills the site.
func (d *decoder) build(raws []*rawFeature) {
	d.site = &Site{}
	refLon, refLat, given := d.reference(raws)
	if !given {
		// Keep the extent check robust against one stray feature: measure from the median.
		refLon, refLat = medianFirst(raws)
	}
	d.extent(raws, refLon, refLat, given)
	if len(d.probs) > 0 {
		return
	}
	lon0, lat0 := refLon, refLat
	if !given {
		lon0, lat0 = bboxCentre(raws)
	}
	if d.opt.OriginLonDeg != nil {
		lon0 = *d.opt.OriginLonDeg
	}
	if d.opt.OriginLatDeg != nil {
		lat0 = *d.opt.OriginLatDeg
	}
	h0 := 0.0
	if d.opt.ElevationM != nil {
		h0 = *d.opt.ElevationM
	}
	d.proj, d.lat0 = NewENU(lon0, lat0, h0), lat0
	d.site.Proj = d.proj
	for _, f := range raws {
		if f.failed || f.kind == "" {
			continue
		}
		if !d.check3D(f) {
			continue
		}
		kindNamed(f.kind).build(d, f)
	}
	d.crossChecks(raws)
}

// reference returns the site's stated longitude and latitude, when given.
func (d *decoder) reference(raws []*rawFeature) (lon, lat float64, given bool) {
	if d.opt.OriginLonDeg == nil || d.opt.OriginLatDeg == nil {
		return 0, 0, false
	}
	lon, lat = *d.opt.OriginLonDeg, *d.opt.OriginLatDeg
	if math.IsNaN(lat) || lat < -90 || lat > 90 || math.IsNaN(lon) || lon < -180 || lon > 180 {
		d.problem(nil, -1, "", "latitude", fmt.Sprintf("the site's latitude %g / longitude %g are outside [-90, 90] / [-180, 180]", lat, lon))
		return 0, 0, false
	}
	return lon, lat, true
}

func medianFirst(raws []*rawFeature) (lon, lat float64) {
	var lons, lats []float64
	for _, f := range raws {
		if ps := f.positions(); len(ps) > 0 && !f.failed {
			lons = append(lons, ps[0].lon)
			lats = append(lats, ps[0].lat)
		}
	}
	if len(lons) == 0 {
		return 0, 0
	}
	slices.Sort(lons)
	slices.Sort(lats)
	return lons[len(lons)/2], lats[len(lats)/2]
}

func bboxCentre(raws []*rawFeature) (lon, lat float64) {
	minLon, minLat, maxLon, maxLat := math.Inf(1), math.Inf(1), math.Inf(-1), math.Inf(-1)
	for _, f := range raws {
		for _, p := range f.positions() {
			minLon, maxLon = math.Min(minLon, p.lon), math.Max(maxLon, p.lon)
			minLat, maxLat = math.Min(minLat, p.lat), math.Max(maxLat, p.lat)
		}
	}
	if math.IsInf(minLon, 0) {
		return 0, 0
	}
	if maxLon-minLon > 180 {
		// Across the antimeridian (a site in Fiji or the Chukchi Sea): the drawing spans a few
		// metres from 179.99… to −179.99…, so measure the longitudes eastward from 0 to 360
		// and bring the centre back to [−180, 180).
		minLon, maxLon = math.Inf(1), math.Inf(-1)
		for _, f := range raws {
			for _, p := range f.positions() {
				l := p.lon
				if l < 0 {
					l += 360
				}
				minLon, maxLon = math.Min(minLon, l), math.Max(maxLon, l)
			}
		}
		c := (minLon + maxLon) / 2
		if c >= 180 {
			c -= 360
		}
		return c, (minLat + maxLat) / 2
	}
	return (minLon + maxLon) / 2, (minLat + maxLat) / 2
}

// extent reports features far from the reference point, and says when swapping longitude and
// latitude would bring them home.
func (d *decoder) extent(raws []*rawFeature, lon, lat float64, given bool) {
	p := NewENU(lon, lat, 0)
	from := "the other features"
	if given {
		from = fmt.Sprintf("the site's latitude %g, longitude %g", lat, lon)
	}
	for _, f := range raws {
		if f.failed {
			continue
		}
		worst, far := 0.0, rawPos{}
		for _, q := range f.positions() {
			if dist := p.Forward(q.lon, q.lat, 0).Norm(); dist > worst {
				worst, far = dist, q
			}
		}
		if worst <= MaxExtentM {
			continue
		}
		msg := fmt.Sprintf("lies %.1f km from %s, more than the %g m a site may span", worst/1000, from, MaxExtentM)
		if math.Abs(far.lon) <= 90 && p.Forward(far.lat, far.lon, 0).Norm() <= MaxExtentM {
			msg += "; longitude and latitude look swapped: RFC 7946 writes [longitude, latitude]"
		}
		d.fproblem(f, far.n, "geometry", msg)
	}
}

// check3D reports whether the feature's third coordinates (if any) can be used.
func (d *decoder) check3D(f *rawFeature) bool {
	ps := f.positions()
	n3 := 0
	for _, p := range ps {
		if p.has3 {
			n3++
		}
	}
	if n3 == 0 {
		return true
	}
	if n3 != len(ps) {
		for _, p := range ps {
			if !p.has3 {
				d.fproblem(f, p.n, "geometry", "mixes 2-D and 3-D positions; give every position a height or none")
				return false
			}
		}
	}
	if d.opt.ElevationM == nil {
		d.fproblem(f, ps[0].n, "geometry", "3-D coordinates need the site's elevation_m (ground height above the WGS 84 ellipsoid) to become heights above ground; set elevation_m in the site file or drop the third coordinate")
		return false
	}
	return true
}

// local projects a position; U is height above the site's ground when the position is 3-D.
func (d *decoder) local(p rawPos) Vec3 {
	h := d.proj.HeightM
	if p.has3 {
		h = p.h
	}
	v := d.proj.Forward(p.lon, p.lat, h)
	if !p.has3 {
		v.U = 0
	}
	return v
}

// ring projects, cleans and checks the feature's outline: counter-clockwise, closed, without
// repeated neighbours, not crossing itself, with an area. Both windings are accepted.
func (d *decoder) ring(f *rawFeature) (orb.Ring, bool) {
	r, _, _, ok := d.ring3(f)
	return r, ok
}

func (d *decoder) ring3(f *rawFeature) (orb.Ring, []Vec3, []*jnode, bool) {
	raw := f.rings[0]
	var plan orb.Ring
	var pts []Vec3
	var nodes []*jnode
	for _, p := range raw[:len(raw)-1] {
		v := d.local(p)
		if k := len(plan); k > 0 && math.Hypot(v.E-plan[k-1][0], v.N-plan[k-1][1]) < 1e-4 {
			continue // a repeated vertex (a double click) carries no shape
		}
		plan = append(plan, v.Plan())
		pts = append(pts, v)
		nodes = append(nodes, p.n)
	}
	if k := len(plan); k > 1 && math.Hypot(plan[0][0]-plan[k-1][0], plan[0][1]-plan[k-1][1]) < 1e-4 {
		plan, pts, nodes = plan[:k-1], pts[:k-1], nodes[:k-1]
	}
	if len(plan) < 3 {
		d.fproblem(f, raw[0].n, "geometry", fmt.Sprintf("the ring has only %d distinct corners; an outline needs at least three", len(plan)))
		return nil, nil, nil, false
	}
	plan = append(plan, plan[0])
	if i, j := selfCrossing(plan); i >= 0 {
		d.fproblem(f, nodes[j], "geometry", fmt.Sprintf("the outline crosses itself: edge %d–%d meets edge %d–%d; draw it as a simple ring", i, (i+1)%(len(plan)-1), j, (j+1)%(len(plan)-1)))
		return nil, nil, nil, false
	}
	if math.Abs(planar.Area(plan)) < 0.01 {
		d.fproblem(f, raw[0].n, "geometry", "the outline has no area (under 0.01 m²)")
		return nil, nil, nil, false
	}
	if plan.Orientation() == orb.CW {
		plan.Reverse()
		slices.Reverse(pts)
		slices.Reverse(nodes)
	}
	return plan, pts, nodes, true
}
