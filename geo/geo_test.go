package geo

import (
	"bytes"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"github.com/golang/geo/s2"
	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
	"gonum.org/v1/gonum/floats/scalar"
)

func TestFitPlane(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 5))
	tests := []struct {
		name          string
		pitch, aspect float64
	}{
		{"level", 0, 180}, // aspect of a level plane: 180 by convention
		{"south 30", 30, 180},
		{"east 45", 45, 90},
		{"north-west 12.5", 12.5, 315},
		{"steep north 70", 70, 0},
		{"wrap 359", 20, 359},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			// Analytic plane z = 4 − tan(pitch)·(downhill · p): random plan points on it.
			a := tc.aspect * math.Pi / 180
			d := [2]float64{math.Sin(a), math.Cos(a)}
			k := math.Tan(tc.pitch * math.Pi / 180)
			var pts []Vec3
			for range 7 {
				e, n := rng.Float64()*10-5, rng.Float64()*10-5
				pts = append(pts, Vec3{e, n, 4 - k*(d[0]*e+d[1]*n)})
			}
			p, ok := fitPlane(pts)
			if !ok {
				t.Fatal("fit failed")
			}
			// 1e-9°: an exact plane, only rounding in a 2×2 solve.
			if !scalar.EqualWithinAbs(p.PitchDeg(), tc.pitch, 1e-9) || angleDiffDeg(p.AspectDeg(), tc.aspect) > 1e-9 {
				t.Errorf("pitch %.12f aspect %.12f", p.PitchDeg(), p.AspectDeg())
			}
			for _, v := range pts {
				if p.Distance(v) > 1e-9 {
					t.Errorf("residual %g", p.Distance(v))
				}
			}
			// Four corners of a 4 m × 2 m rectangle on the plane, one raised by 0.4 m: the bump
			// splits into a plane part and the twist x·y, orthogonal to 1, x and y on a symmetric
			// rectangle, so every corner is left 0.4/4 = 0.1 m off vertically (hand-worked).
			rect := []Vec3{{-2, -1, 0}, {2, -1, 0}, {2, 1, 0}, {-2, 1, 0}}
			for i := range rect {
				rect[i].U = 4 - k*(d[0]*rect[i].E+d[1]*rect[i].N)
			}
			rect[2].U += 0.4
			q, _ := fitPlane(rect)
			for i, v := range rect {
				if got := math.Abs(v.U - q.At(v.E, v.N)); !scalar.EqualWithinAbs(got, 0.1, 1e-9) {
					t.Errorf("bumped corner %d: vertical residual %.12f, want 0.1", i, got)
				}
			}
		})
	}
	if _, ok := fitPlane([]Vec3{{0, 0, 1}, {1, 1, 2}, {2, 2, 3}}); ok {
		t.Error("collinear corners fitted")
	}
}

// Mean Earth radius R1 of GRS 80 (Moritz, Geodetic Reference System 1980, from memory):
// 6371008.7714 m. WGS 84's radii of curvature lie within 0.6% of it (meridian 6335 km at the
// equator, prime vertical 6400 km at the poles, from a and f in NIMA TR8350.2), so distances
// on a site agree with the sphere to 0.6% and areas to 1.2%.
const meanRadiusM = 6371008.7714

func TestProjectionAgainstS2(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, lat0 := range []float64{0, 47.1, -33.9, 64.5} {
		lon0 := rng.Float64()*360 - 180
		p := NewENU(lon0, lat0, 0)
		for i := range 20 {
			// Two points within 300 m of the origin.
			a := Vec3{rng.Float64()*600 - 300, rng.Float64()*600 - 300, 0}
			b := Vec3{rng.Float64()*600 - 300, rng.Float64()*600 - 300, 0}
			lonA, latA, _ := p.Inverse(a)
			lonB, latB, _ := p.Inverse(b)
			ours := p.Forward(lonA, latA, 0).Sub(p.Forward(lonB, latB, 0)).Norm()
			sphere := s2.LatLngFromDegrees(latA, lonA).Distance(s2.LatLngFromDegrees(latB, lonB)).Radians() * meanRadiusM
			if !scalar.EqualWithinRel(ours, sphere, 0.006) {
				t.Errorf("lat %.1f case %d: distance %.3f m, s2 %.3f m", lat0, i, ours, sphere)
			}
			// A quadrilateral about a: plan area against the s2 loop's area.
			w, h := 5+rng.Float64()*30, 5+rng.Float64()*30
			ring := orb.Ring{{a.E, a.N}, {a.E + w, a.N}, {a.E + w, a.N + h}, {a.E, a.N + h}, {a.E, a.N}}
			var pts []s2.Point
			for _, q := range ring[:4] { // s2: counter-clockwise, no closing vertex
				lon, lat, _ := p.Inverse(Vec3{q[0], q[1], 0})
				pts = append(pts, s2.PointFromLatLng(s2.LatLngFromDegrees(lat, lon)))
			}
			s2Area := s2.LoopFromPoints(pts).Area() * meanRadiusM * meanRadiusM
			if !scalar.EqualWithinRel(planar.Area(ring), s2Area, 0.012) {
				t.Errorf("lat %.1f case %d: area %.3f m², s2 %.3f m²", lat0, i, planar.Area(ring), s2Area)
			}
		}
	}
}

func TestENURoundTrip(t *testing.T) {
	// Forward then Inverse returns the point: 1e-9° ≈ 0.1 mm, 1e-6 m in height.
	rng := rand.New(rand.NewPCG(9, 9))
	for i := range 200 {
		p := NewENU(rng.Float64()*360-180, rng.Float64()*170-85, rng.Float64()*3000)
		v := Vec3{rng.Float64()*1000 - 500, rng.Float64()*1000 - 500, rng.Float64()*100 - 10}
		lon, lat, h := p.Inverse(v)
		w := p.Forward(lon, lat, h)
		if w.Sub(v).Norm() > 1e-6 {
			t.Fatalf("case %d: %v → %v", i, v, w)
		}
	}
}

func TestExportRoundTrip(t *testing.T) {
	for _, tc := range []struct {
		file string
		opt  DecodeOptions
	}{
		{"testdata/site.geojson", DecodeOptions{}},
		{"testdata/site3d.geojson", DecodeOptions{ElevationM: ptr(420)}},
	} {
		t.Run(tc.file, func(t *testing.T) {
			s1, err := decodeFile(t, tc.file, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			mods, _, err := Fill(s1, FillOptions{SetbackM: 0.4, GapM: 0.02})
			if err != nil {
				t.Fatal(err)
			}
			props := func(i int) map[string]any { return map[string]any{"string": i % 2, "shade_loss_pct": 1.5} }
			out, err := ExportGeoJSON(s1, mods, props)
			if err != nil {
				t.Fatal(err)
			}
			again, _ := ExportGeoJSON(s1, mods, props)
			if !bytes.Equal(out, again) {
				t.Fatal("export not deterministic")
			}
			// The same origin: the map's centroid, which modules (skipped on import) do not move.
			s2site, err := Decode(bytes.NewReader(out), DecodeOptions{File: "export", OriginLonDeg: &s1.Proj.LonDeg, OriginLatDeg: &s1.Proj.LatDeg, ElevationM: tc.opt.ElevationM})
			if err != nil {
				t.Fatal(err)
			}
			if len(s2site.Faces) != len(s1.Faces) || len(s2site.Blocks) != len(s1.Blocks) || len(s2site.Trees) != len(s1.Trees) ||
				len(s2site.Avoids) != len(s1.Avoids) || len(s2site.Panels) != len(s1.Panels) {
				t.Fatalf("feature counts differ")
			}
			// 1e-3 m: exported longitudes/latitudes are rounded to 1e-9° (0.1 mm); angles and
			// heights to 1e-6.
			const tolM, tolDeg = 1e-3, 1e-5
			for i, f := range s1.Faces {
				g := s2site.Faces[i]
				if f.ID != g.ID || !scalar.EqualWithinAbs(f.PitchDeg, g.PitchDeg, tolDeg) || angleDiffDeg(f.AspectDeg, g.AspectDeg) > tolDeg ||
					!scalar.EqualWithinAbs(f.EaveHeightM, g.EaveHeightM, tolM) || !scalar.EqualWithinAbs(f.EaveOffsetM, g.EaveOffsetM, tolM) {
					t.Errorf("face %s: %+v != %+v", f.ID, f, g)
				}
				for k := range f.Plan {
					if f.Plan[k].Equal(g.Plan[k]) || math.Hypot(f.Plan[k][0]-g.Plan[k][0], f.Plan[k][1]-g.Plan[k][1]) < tolM {
						continue
					}
					t.Errorf("face %s vertex %d: %v != %v", f.ID, k, f.Plan[k], g.Plan[k])
				}
			}
			for i, b := range s1.Blocks {
				c := s2site.Blocks[i]
				if b.ID != c.ID || !scalar.EqualWithinAbs(b.HeightM, c.HeightM, tolM) || !scalar.EqualWithinAbs(b.RidgeM, c.RidgeM, tolM) || !scalar.EqualWithinAbs(b.BaseM, c.BaseM, tolM) {
					t.Errorf("block %+v != %+v", b, c)
				}
			}
			for i, tr := range s1.Trees {
				u := s2site.Trees[i]
				if tr.ID != u.ID || tr.Shape != u.Shape || tr.Deciduous != u.Deciduous || len(tr.LeafOffMonths) != len(u.LeafOffMonths) ||
					!scalar.EqualWithinAbs(tr.CrownBaseM, u.CrownBaseM, tolM) || math.Hypot(tr.Trunk[0]-u.Trunk[0], tr.Trunk[1]-u.Trunk[1]) > tolM {
					t.Errorf("tree %+v != %+v", tr, u)
				}
			}
			// Refilling the re-read site places the same modules.
			mods2, _, _ := Fill(s2site, FillOptions{SetbackM: 0.4, GapM: 0.02})
			if len(mods2) != len(mods) {
				t.Fatalf("refill: %d modules, first time %d", len(mods2), len(mods))
			}
			for i := range mods {
				if mods[i].ID != mods2[i].ID || mods[i].Origin.Sub(mods2[i].Origin).Norm() > tolM {
					t.Errorf("module %s moved: %v → %v", mods[i].ID, mods[i].Origin, mods2[i].Origin)
				}
			}
		})
	}
}

func FuzzDecode(f *testing.F) {
	for _, pat := range []string{"testdata/*.geojson", "testdata/bad/*.geojson"} {
		names, _ := filepath.Glob(pat)
		for _, n := range names {
			b, err := os.ReadFile(n)
			if err != nil {
				f.Fatal(err)
			}
			f.Add(b)
		}
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := Decode(bytes.NewReader(data), DecodeOptions{File: "fuzz", ElevationM: ptr(420)})
		if err != nil {
			if _, ok := err.(Problems); !ok {
				t.Fatalf("error of type %T: %v", err, err)
			}
			return
		}
		finite := func(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
		for _, fc := range s.Faces {
			n := len(fc.Plan)
			if n < 4 || fc.Plan[0] != fc.Plan[n-1] || fc.Plan.Orientation() != orb.CCW {
				t.Fatalf("face %s ring not closed counter-clockwise: %v", fc.ID, fc.Plan)
			}
			for _, p := range fc.Plan {
				if !finite(p[0]) || !finite(p[1]) || math.Hypot(p[0], p[1]) > 2*MaxExtentM {
					t.Fatalf("face %s vertex %v", fc.ID, p)
				}
			}
			if !(fc.PitchDeg >= 0 && fc.PitchDeg <= MaxPitchDeg) || !(fc.AspectDeg >= 0 && fc.AspectDeg < 360) || !finite(fc.EaveHeightM) || !finite(fc.EaveOffsetM) {
				t.Fatalf("face %+v", fc)
			}
		}
		for _, tr := range s.Trees {
			if !(tr.CrownBaseM < tr.HeightM) || !(tr.CrownRadiusM > 0) || !(tr.BaseM <= tr.CrownBaseM) {
				t.Fatalf("tree %+v", tr)
			}
		}
		for _, b := range s.Blocks {
			if !(b.HeightM > b.BaseM) || b.Footprint.Orientation() != orb.CCW {
				t.Fatalf("block %+v", b)
			}
		}
	})
}

func BenchmarkDecodeFill(b *testing.B) {
	data, err := os.ReadFile("testdata/bench.geojson")
	if err != nil {
		b.Fatal(err)
	}
	opt := FillOptions{SetbackM: 0.4, GapM: 0.02}
	for b.Loop() {
		s, err := Decode(bytes.NewReader(data), DecodeOptions{File: "bench.geojson"})
		if err != nil {
			b.Fatal(err)
		}
		mods, _, err := Fill(s, opt)
		if err != nil || len(mods) != 120 {
			b.Fatalf("%d modules, %v", len(mods), err)
		}
	}
	b.ReportAllocs()
}
