package geo

import (
	"math"

	"github.com/paulmach/orb"
)

// WGS 84 ellipsoid, NIMA TR8350.2 (2000), table 3.1.
const (
	wgs84A  = 6378137.0
	wgs84F  = 1 / 298.257223563
	wgs84E2 = wgs84F * (2 - wgs84F)
)

// Vec3 is a point or direction in local east-north-up metres.
type Vec3 struct{ E, N, U float64 }

// Add returns a+b.
func (a Vec3) Add(b Vec3) Vec3 { return Vec3{a.E + b.E, a.N + b.N, a.U + b.U} }

// Sub returns a−b.
func (a Vec3) Sub(b Vec3) Vec3 { return Vec3{a.E - b.E, a.N - b.N, a.U - b.U} }

// Scale returns a·k.
func (a Vec3) Scale(k float64) Vec3 { return Vec3{a.E * k, a.N * k, a.U * k} }

// Dot returns the scalar product.
func (a Vec3) Dot(b Vec3) float64 { return a.E*b.E + a.N*b.N + a.U*b.U }

// Cross returns the vector product a×b.
func (a Vec3) Cross(b Vec3) Vec3 {
	return Vec3{a.N*b.U - a.U*b.N, a.U*b.E - a.E*b.U, a.E*b.N - a.N*b.E}
}

// Norm returns the length of a.
func (a Vec3) Norm() float64 { return math.Sqrt(a.Dot(a)) }

// Unit returns a scaled to length 1 (the zero vector stays zero).
func (a Vec3) Unit() Vec3 {
	n := a.Norm()
	if n == 0 {
		return a
	}
	return a.Scale(1 / n)
}

// Plan returns the point's horizontal position as an orb.Point (X east, Y north).
func (a Vec3) Plan() orb.Point { return orb.Point{a.E, a.N} }

// ENU projects WGS 84 longitude, latitude and ellipsoidal height to local east-north-up
// metres about an origin. It is the one place where the site leaves the ellipsoid.
type ENU struct {
	LonDeg, LatDeg, HeightM float64 // the origin
	x0, y0, z0              float64 // origin in ECEF
	sinLat, cosLat          float64
	sinLon, cosLon          float64
}

// NewENU returns the projection about the given origin.
func NewENU(lonDeg, latDeg, heightM float64) *ENU {
	p := &ENU{LonDeg: lonDeg, LatDeg: latDeg, HeightM: heightM}
	p.x0, p.y0, p.z0 = ecef(lonDeg, latDeg, heightM)
	lat, lon := latDeg*math.Pi/180, lonDeg*math.Pi/180
	p.sinLat, p.cosLat = math.Sin(lat), math.Cos(lat)
	p.sinLon, p.cosLon = math.Sin(lon), math.Cos(lon)
	return p
}

func ecef(lonDeg, latDeg, h float64) (x, y, z float64) {
	lat, lon := latDeg*math.Pi/180, lonDeg*math.Pi/180
	s, c := math.Sin(lat), math.Cos(lat)
	n := wgs84A / math.Sqrt(1-wgs84E2*s*s)
	return (n + h) * c * math.Cos(lon), (n + h) * c * math.Sin(lon), (n*(1-wgs84E2) + h) * s
}

// Forward returns the local coordinates of a geodetic point; heightM is above the ellipsoid.
// The result's U is measured from the origin's height.
func (p *ENU) Forward(lonDeg, latDeg, heightM float64) Vec3 {
	x, y, z := ecef(lonDeg, latDeg, heightM)
	dx, dy, dz := x-p.x0, y-p.y0, z-p.z0
	return Vec3{
		E: -p.sinLon*dx + p.cosLon*dy,
		N: -p.sinLat*p.cosLon*dx - p.sinLat*p.sinLon*dy + p.cosLat*dz,
		U: p.cosLat*p.cosLon*dx + p.cosLat*p.sinLon*dy + p.sinLat*dz,
	}
}

// Inverse returns the longitude, latitude (degrees) and ellipsoidal height of a local point,
// by Bowring's iteration (converged to well below a millimetre in three steps at any height
// a building reaches).
func (p *ENU) Inverse(v Vec3) (lonDeg, latDeg, heightM float64) {
	x := p.x0 - p.sinLon*v.E - p.sinLat*p.cosLon*v.N + p.cosLat*p.cosLon*v.U
	y := p.y0 + p.cosLon*v.E - p.sinLat*p.sinLon*v.N + p.cosLat*p.sinLon*v.U
	z := p.z0 + p.cosLat*v.N + p.sinLat*v.U
	lon := math.Atan2(y, x)
	r := math.Hypot(x, y)
	lat := math.Atan2(z, r*(1-wgs84E2))
	var h float64
	for range 5 {
		s := math.Sin(lat)
		n := wgs84A / math.Sqrt(1-wgs84E2*s*s)
		h = r/math.Cos(lat) - n
		lat = math.Atan2(z, r*(1-wgs84E2*n/(n+h)))
	}
	return lon * 180 / math.Pi, lat * 180 / math.Pi, h
}
