package shading

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/geo"
)

// The direction grid reproduces the isotropic sky fraction (1+cos β)/2 of a plane tilted by β
// and the projected solid angle π of a hemisphere (analytic, the isotropic sky model).
func TestSkyDirsIsotropic(t *testing.T) {
	cases := []struct {
		name string
		tilt float64
	}{
		{"flat", 0}, {"20°", 20}, {"45°", 45}, {"60°", 60}, {"vertical", 90}, {"overhang 120°", 120},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			b := c.tilt * math.Pi / 180
			n := geo.Vec3{N: -math.Sin(b), U: math.Cos(b)}
			sky, all := 0.0, 0.0
			for _, s := range skyDirs() {
				if w := s.d.Dot(n) * s.omega; w > 0 {
					all += w
					if s.el > 0 {
						sky += w
					}
				}
			}
			want := (1 + math.Cos(b)) / 2
			// midpoint rule on 2°×0.5..3° bins, cut by the plane's edge
			if got := sky / all; !scalar.EqualWithinAbs(got, want, 1e-3) {
				t.Errorf("sky share %g, want %g", got, want)
			}
			if !scalar.EqualWithinRel(all, math.Pi, 2e-3) {
				t.Errorf("projected solid angle %g, want π", all)
			}
		})
	}
}

// wallBand integrates, for a horizontal element, the share of the 0..HorizonBandDeg band left
// visible by an infinitely long wall of height h at distance d to the south (analytic: the
// wall hides a direction when tan(el) < (h/d)·(−cos az); weight sin el · cos el, midpoint rule
// on 0.05° × 0.005° cells).
func wallBand(h, d float64) float64 {
	var vis, all float64
	for az := 0.025; az < 360; az += 0.05 {
		ca := math.Cos(az * math.Pi / 180)
		for el := 0.0025; el < HorizonBandDeg; el += 0.005 {
			e := el * math.Pi / 180
			w := math.Sin(e) * math.Cos(e)
			all += w
			if !(ca < 0 && math.Tan(e) < h/d*-ca) {
				vis += w
			}
		}
	}
	return vis / all
}

func TestDiffuseViews(t *testing.T) {
	const half = 2000.0 // "long" wall half-length, ≫ the distances below
	deg := math.Pi / 180
	horizontal := func(z float64) geo.Module { return flatModule("M", geo.Vec3{E: -0.5, N: -0.5, U: z}, 1, 1) }
	vertical := func(z float64) geo.Module { // facing south, centre at (0, 0, z)
		return geo.Module{ID: "V", Origin: geo.Vec3{E: -0.5, U: z - 0.5}, U: geo.Vec3{E: 1}, V: geo.Vec3{U: 1}, WidthM: 1, LengthM: 1}
	}
	wall := func(d, h float64) geo.Block { // north face at y = -d
		return geo.Block{ID: "wall", Footprint: rect(-half, -d-0.2, half, -d), HeightM: h}
	}
	flat := func(el float64) *Horizon {
		h, err := HorizonFromPoints([]float64{0}, []float64{el})
		if err != nil {
			panic(err)
		}
		return h
	}
	z0 := rayOffsetM // centre height of a horizontal module at z = 0 plus the ray lift
	cases := []struct {
		name    string
		mod     geo.Module
		blocks  []geo.Block
		horizon *Horizon
		want    Diffuse
		tol     float64
	}{
		// nothing around: every share is whole (analytic)
		{"open horizontal", horizontal(0), nil, nil, Diffuse{1, 1, 1}, 0},
		{"open vertical", vertical(3), nil, nil, Diffuse{1, 1, 1}, 0},
		// view factor of an infinitely long wall from a parallel differential strip,
		// F = (1 − cos φ)/2 with φ the wall's profile angle (catalogue of configuration factors,
		// two-dimensional strip to a semi-infinite plane; from memory); the ground is unseen
		{"wall h3 d5 horizontal", horizontal(0), []geo.Block{wall(5, 3+z0)}, nil,
			Diffuse{SkyView: (1 + math.Cos(math.Atan(3.0/5))) / 2, HorizonView: wallBand(3, 5), GroundView: 1}, 0.01},
		{"wall h2 d8 horizontal", horizontal(0), []geo.Block{wall(8, 2+z0)}, nil,
			Diffuse{SkyView: (1 + math.Cos(math.Atan(2.0/8))) / 2, HorizonView: wallBand(2, 8), GroundView: 1}, 0.01},
		// a vertical strip facing the wall: the sky beyond angle φ = atan((h−z)/d) above the
		// horizontal is (1 − sin φ)/2 of the view, the ground nearer than the wall's foot is
		// (1 − sin ψ)/2 with ψ = atan(z/d) (same catalogue formula), each over the open ½
		{"vertical facing wall", vertical(3), []geo.Block{wall(6, 7)}, nil,
			Diffuse{SkyView: 1 - math.Sin(math.Atan(4.0/6)), HorizonView: 0, GroundView: 1 - math.Sin(math.Atan(3.0/6))}, 0.01},
		// a uniform far horizon of elevation ε hides sin²ε of a horizontal plane's
		// cosine-weighted sky (analytic: ∫ 2 sin θ cos θ dθ over the hidden zenith angles);
		// of the 0..6° band it hides sin²ε / sin²6°, about 100 samples, so a looser tolerance
		{"horizon 3°", horizontal(0), nil, flat(3),
			Diffuse{SkyView: math.Pow(math.Cos(3*deg), 2), HorizonView: 1 - math.Pow(math.Sin(3*deg)/math.Sin(6*deg), 2), GroundView: 1}, 0.04},
		{"horizon 10°", horizontal(0), nil, flat(10),
			Diffuse{SkyView: math.Pow(math.Cos(10*deg), 2), HorizonView: 0, GroundView: 1}, 0.005},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			sc, err := NewScene(&geo.Site{Blocks: c.blocks}, []geo.Module{c.mod}, Options{Horizon: c.horizon})
			if err != nil {
				t.Fatal(err)
			}
			got := sc.Diffuse(0)
			if !scalar.EqualWithinAbs(got.SkyView, c.want.SkyView, c.tol) ||
				!scalar.EqualWithinAbs(got.HorizonView, c.want.HorizonView, c.tol) ||
				!scalar.EqualWithinAbs(got.GroundView, c.want.GroundView, c.tol) {
				writeArtifact(t, "diffuse.geojson", sceneFeatures(&geo.Site{Blocks: c.blocks}, []geo.Module{c.mod}))
				t.Errorf("got %+v, want %+v ±%g", got, c.want, c.tol)
			}
		})
	}
}

// Silhouette: a wide block due south shows its top edge at atan(h/d) (analytic) and the far
// horizon outline equals the profile.
func TestSilhouette(t *testing.T) {
	cases := []struct {
		name   string
		h, d   float64 // wall top above the module centre's ray origin, distance south
		azStep float64
	}{
		{"h3 d5 1°", 3, 5, 1},
		{"h10 d4 5°", 10, 4, 5},
		{"h1 d30 2.5°", 1, 30, 2.5},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			mod := flatModule("M", geo.Vec3{E: -0.5, N: -0.5}, 1, 1)
			blk := geo.Block{ID: "wall", Footprint: rect(-200, -c.d-1, 200, -c.d), HeightM: rayOffsetM + c.h}
			hz := readTestHorizon(t)
			sc, err := NewScene(&geo.Site{Blocks: []geo.Block{blk}}, []geo.Module{mod}, Options{Horizon: hz})
			if err != nil {
				t.Fatal(err)
			}
			out := sc.Silhouette(0, c.azStep)
			if len(out) != 2 || out[0].Kind != "horizon" || out[1].ID != "wall" {
				t.Fatalf("outlines %+v, want the horizon and the wall", out)
			}
			south := int(math.Round(180 / c.azStep))
			want := math.Atan2(c.h, c.d) * 180 / math.Pi
			if got := out[1].ElevationDeg[south]; !scalar.EqualWithinAbs(got, want, 0.002) { // bisection to 0.1°/2⁷
				t.Errorf("wall at 180°: %g°, want %g°", got, want)
			}
			if got := out[1].ElevationDeg[0]; !scalar.EqualWithinAbs(got, 0, 0) { // nothing to the north
				t.Errorf("wall at 0°: %g°, want 0", got)
			}
			for b, e := range out[0].ElevationDeg {
				if w := hz.ElevationDeg(float64(b) * c.azStep); !scalar.EqualWithinAbs(e, w, 1e-12) { // the profile itself
					t.Fatalf("horizon bin %d: %g, want %g", b, e, w)
				}
			}
		})
	}
	t.Run("bad step", func(t *testing.T) {
		sc, err := NewScene(nil, []geo.Module{flatModule("M", geo.Vec3{}, 1, 1)}, Options{})
		if err != nil {
			t.Fatal(err)
		}
		if out := sc.Silhouette(0, 0); out != nil {
			t.Errorf("step 0 gave %d outlines, want none", len(out))
		}
	})
}
