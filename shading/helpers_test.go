package shading

import (
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"
	"time"

	"github.com/paulmach/orb"

	"sunstring/geo"
)

// sunYear returns the steps with the sun up over a year at latitude latDeg, every stepH hours
// of apparent solar time from 00:30, every dayStep-th day. The sun's declination follows
// Cooper (1969), "The absorption of radiation in solar stills", Solar Energy 12(3),
// δ = 23.45° sin(360°(284+n)/365), good to about 1°, which is plenty for a test geometry. The
// hour angles are symmetric about noon, so mirrored scenes see mirrored suns exactly.
func sunYear(latDeg float64, dayStep int, stepH float64) []Step {
	var out []Step
	phi := latDeg * math.Pi / 180
	for n := 1; n <= 365; n += dayStep {
		decl := 23.45 * math.Pi / 180 * math.Sin(2*math.Pi*float64(284+n)/365)
		month := time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC).AddDate(0, 0, n-1).Month()
		for h := 0.5; h < 24; h += stepH {
			w := (h - 12) * 15 * math.Pi / 180
			d := [3]float64{
				-math.Cos(decl) * math.Sin(w),
				math.Cos(phi)*math.Sin(decl) - math.Sin(phi)*math.Cos(decl)*math.Cos(w),
				math.Sin(phi)*math.Sin(decl) + math.Cos(phi)*math.Cos(decl)*math.Cos(w),
			}
			if d[2] > 0 {
				out = append(out, Step{Sun: d, Month: month})
			}
		}
	}
	return out
}

// sunAt returns the unit vector toward a sun at azimuth and elevation (degrees).
func sunAt(azDeg, elDeg float64) [3]float64 {
	a, e := azDeg*math.Pi/180, elDeg*math.Pi/180
	return [3]float64{math.Sin(a) * math.Cos(e), math.Cos(a) * math.Cos(e), math.Sin(e)}
}

func vec(s [3]float64) geo.Vec3 { return geo.Vec3{E: s[0], N: s[1], U: s[2]} }

// flatModule is a horizontal module with its origin corner at o, width along east.
func flatModule(id string, o geo.Vec3, w, l float64) geo.Module {
	return geo.Module{ID: id, Origin: o, U: geo.Vec3{E: 1}, V: geo.Vec3{N: 1}, WidthM: w, LengthM: l}
}

// rect returns a closed counter-clockwise plan rectangle.
func rect(x0, y0, x1, y1 float64) orb.Ring {
	return orb.Ring{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}, {x0, y0}}
}

// gableFaces returns the two faces of a gable roof over [x0,x1]×[y0,y1] with an east–west
// ridge at mid-depth: the south face first.
func gableFaces(id string, x0, y0, x1, y1, pitch, eave float64) []geo.Face {
	ym := (y0 + y1) / 2
	s := geo.Face{ID: id + "S", Plan: rect(x0, y0, x1, ym), PitchDeg: pitch, AspectDeg: 180, EaveHeightM: eave}
	n := geo.Face{ID: id + "N", Plan: rect(x0, ym, x1, y1), PitchDeg: pitch, AspectDeg: 0, EaveHeightM: eave}
	s.SetEave()
	n.SetEave()
	return []geo.Face{s, n}
}

// fillFace places rows×cols portrait modules on a face starting at plan point base on the
// eave, running across the slope in the horizontal direction of the face's U.
func fillFace(f *geo.Face, base orb.Point, cols, rows int, w, l, gap float64) []geo.Module {
	b := f.PitchDeg * math.Pi / 180
	dh := f.Downhill()
	v := geo.Vec3{E: -dh[0] * math.Cos(b), N: -dh[1] * math.Cos(b), U: math.Sin(b)}
	u := v.Cross(f.Normal()).Unit()
	var out []geo.Module
	for r := range rows {
		for c := range cols {
			a := float64(c) * (w + gap)
			s := float64(r) * (l + gap)
			p := orb.Point{base[0] + u.E*a - dh[0]*s*math.Cos(b), base[1] + u.N*a - dh[1]*s*math.Cos(b)}
			out = append(out, geo.Module{ID: f.ID + "." + itoa(r+1) + "." + itoa(c+1), Face: f.ID,
				Row: r + 1, Col: c + 1, Portrait: true, Origin: f.Lift(p), U: u, V: v, WidthM: w, LengthM: l})
		}
	}
	return out
}

func itoa(i int) string {
	b := []byte{}
	for {
		b = append([]byte{byte('0' + i%10)}, b...)
		i /= 10
		if i == 0 {
			return string(b)
		}
	}
}

// randomScene draws a gable house with modules on its south face and blocks, gabled blocks,
// trees and a second house around it, all from the seed.
func randomScene(seed uint64, nBlocks, nTrees int) (*geo.Site, []geo.Module) {
	rng := rand.New(rand.NewPCG(seed, 0x5eed))
	u := func(a, b float64) float64 { return a + (b-a)*rng.Float64() }
	site := &geo.Site{}
	site.Faces = gableFaces("H", 0, 0, 12, 10, u(20, 45), u(3, 6))
	site.Faces = append(site.Faces, gableFaces("G", u(-25, -15), u(-5, 5), u(-12, -8), u(8, 14), u(15, 40), u(2, 5))...)
	mods := fillFace(&site.Faces[0], orb.Point{0.5, 0.3}, 6, 2, 1.13, 1.72, 0.02)
	for i := range nBlocks {
		cx, cy := u(-20, 30), u(-25, 25)
		if cx > -1 && cx < 13 && cy > -1 && cy < 11 { // a chimney or dormer on the house
			cx, cy = u(1, 11), u(6, 9)
		}
		hw, hd := u(0.3, 5), u(0.3, 5)
		b := geo.Block{ID: "B" + itoa(i), Footprint: rect(cx-hw, cy-hd, cx+hw, cy+hd), BaseM: u(0, 1), HeightM: u(2, 12)}
		if rng.IntN(3) == 0 {
			b.RidgeM = b.HeightM + u(0.5, 4)
			b.RidgeAzimuthDeg = u(0, 180)
		}
		if rng.IntN(4) == 0 { // a rotated footprint
			a := u(0, math.Pi)
			var r orb.Ring
			for _, p := range b.Footprint {
				dx, dy := p[0]-cx, p[1]-cy
				r = append(r, orb.Point{cx + dx*math.Cos(a) - dy*math.Sin(a), cy + dx*math.Sin(a) + dy*math.Cos(a)})
			}
			b.Footprint = r
		}
		site.Blocks = append(site.Blocks, b)
	}
	for i := range nTrees {
		h := u(5, 20)
		t := geo.Tree{ID: "T" + itoa(i), Trunk: orb.Point{u(-25, 35), u(-30, -3)}, HeightM: h,
			CrownRadiusM: u(1, 5), CrownBaseM: u(1, h/2), Shape: geo.CrownShape(rng.IntN(2))}
		if rng.IntN(2) == 0 {
			t.Deciduous = true
			t.LeafOffTransmittance = u(0.3, 0.8)
			t.LeafOffMonths = []time.Month{time.November, time.December, time.January, time.February, time.March}
		}
		site.Trees = append(site.Trees, t)
	}
	return site, mods
}

// annualBeam returns, per module, Σ cos θ · LitFraction over the steps (the beam irradiation
// for a unit normal irradiance, in the units of the steps).
func annualBeam(r *Result, mods []geo.Module, steps []Step) []float64 {
	out := make([]float64, len(mods))
	for i := range mods {
		n := mods[i].Normal()
		for s, st := range steps {
			if c := n.Dot(vec(st.Sun)); c > 0 {
				out[i] += c * r.LitFraction(i, s)
			}
		}
	}
	return out
}

// feature is one GeoJSON feature in local metres (x east, y north), for a person to look at.
type feature struct {
	Type       string         `json:"type"`
	Geometry   map[string]any `json:"geometry"`
	Properties map[string]any `json:"properties"`
}

func polygonFeature(ring [][2]float64, props map[string]any) feature {
	coords := make([][]float64, 0, len(ring)+1)
	for _, p := range ring {
		coords = append(coords, []float64{p[0], p[1]})
	}
	coords = append(coords, coords[0])
	return feature{"Feature", map[string]any{"type": "Polygon", "coordinates": [][][]float64{coords}}, props}
}

func pointFeature(x, y float64, props map[string]any) feature {
	return feature{"Feature", map[string]any{"type": "Point", "coordinates": []float64{x, y}}, props}
}

// sceneFeatures draws the site and modules in plan.
func sceneFeatures(site *geo.Site, mods []geo.Module) []feature {
	var fs []feature
	ring := func(r orb.Ring) [][2]float64 {
		var out [][2]float64
		for _, p := range openRing(r) {
			out = append(out, [2]float64{p[0], p[1]})
		}
		return out
	}
	if site != nil {
		for _, f := range site.Faces {
			fs = append(fs, polygonFeature(ring(f.Plan), map[string]any{"role": "input", "kind": "face", "id": f.ID}))
		}
		for _, b := range site.Blocks {
			fs = append(fs, polygonFeature(ring(b.Footprint), map[string]any{"role": "input", "kind": "block", "id": b.ID, "height_m": b.HeightM}))
		}
		for _, t := range site.Trees {
			fs = append(fs, pointFeature(t.Trunk[0], t.Trunk[1], map[string]any{"role": "input", "kind": "tree", "id": t.ID, "crown_radius_m": t.CrownRadiusM}))
		}
	}
	for _, m := range mods {
		c := m.Corners()
		fs = append(fs, polygonFeature([][2]float64{{c[0].E, c[0].N}, {c[1].E, c[1].N}, {c[2].E, c[2].N}, {c[3].E, c[3].N}},
			map[string]any{"role": "input", "kind": "module", "id": m.ID}))
	}
	return fs
}

// writeArtifact saves a GeoJSON FeatureCollection of a failing case into the test's artifact
// directory, so that a person can open it in a map viewer (coordinates are local metres).
func writeArtifact(t *testing.T, name string, fs []feature) {
	t.Helper()
	b, err := json.MarshalIndent(map[string]any{"type": "FeatureCollection", "features": fs}, "", " ")
	if err != nil {
		t.Logf("artifact %s: %v", name, err)
		return
	}
	p := filepath.Join(t.ArtifactDir(), name)
	if err := os.WriteFile(p, b, 0o644); err != nil {
		t.Logf("artifact %s: %v", name, err)
		return
	}
	t.Logf("wrote %s", p)
}
