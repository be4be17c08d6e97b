package shading

import (
	"context"
	"fmt"
	"math"
	"testing"
	"time"

	"github.com/paulmach/orb"
	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/geo"
)

func compute(t *testing.T, site *geo.Site, mods []geo.Module, opt Options, steps []Step) *Result {
	t.Helper()
	sc, err := NewScene(site, mods, opt)
	if err != nil {
		t.Fatalf("NewScene: %v", err)
	}
	r, err := sc.Compute(context.Background(), steps, nil)
	if err != nil {
		t.Fatalf("Compute: %v", err)
	}
	return r
}

var paths = []struct {
	name  string
	brute bool
}{{"fast", false}, {"brute", true}}

// A long wall of height h (above the ray origin) at distance d south of a point shades it
// exactly when the sun is south of the wall's line and its profile angle is below atan(h/d)
// (analytic: the profile angle is the sun's elevation projected onto the north–south plane,
// tan p = up / south). Each hour of a year.
func TestLongWallProfileAngle(t *testing.T) {
	cases := []struct {
		name      string
		h, d, lat float64
	}{
		{"h2 d5 lat47", 2, 5, 47},
		{"h10 d3 lat47", 10, 3, 47},
		{"h1 d20 lat30", 1, 20, 30},
		{"h6 d4 lat-35", 6, 4, -35},
		{"h3 d3 lat60", 3, 3, 60},
	}
	for _, c := range cases {
		for _, p := range paths {
			t.Run(c.name+" "+p.name, func(t *testing.T) {
				mod := flatModule("P", geo.Vec3{U: 1}, 0.02, 0.02)
				cell := geo.Vec3{E: 0.01, N: 0.01, U: 1 + rayOffsetM} // the ray origin
				const half = 5000.0                                   // wall half-length
				wall := geo.Block{ID: "wall", Footprint: rect(-half, cell.N-c.d-0.3, half, cell.N-c.d), HeightM: cell.U + c.h}
				site := &geo.Site{Blocks: []geo.Block{wall}}
				steps := sunYear(c.lat, 1, 1)
				r := compute(t, site, []geo.Module{mod}, Options{Grid: geo.CellGrid{Cols: 1, Rows: 1}, BruteForce: p.brute}, steps)
				crit := math.Atan2(c.h, c.d)
				shaded := 0
				for s, st := range steps {
					d := vec(st.Sun)
					want := 1.0
					if d.N < 0 {
						if x := cell.E + c.d*d.E/-d.N; math.Abs(x) > half-1 {
							continue // the ray passes the wall's end: outside the long-wall case
						}
						prof := math.Atan2(d.U, -d.N)
						if math.Abs(prof-crit) < 1e-9 {
							continue // grazing the top edge: either answer is right
						}
						if prof < crit {
							want = 0
							shaded++
						}
					}
					got := r.LitFraction(0, s)
					if !scalar.EqualWithinAbs(got, want, 0) { // transmittance is exactly 0 or 255 here
						fs := sceneFeatures(site, []geo.Module{mod})
						fs = append(fs, pointFeature(cell.E+10*d.E/math.Hypot(d.E, d.N), cell.N+10*d.N/math.Hypot(d.E, d.N),
							map[string]any{"role": "sun direction", "step": s, "expected": want, "result": got}))
						writeArtifact(t, "wall.geojson", fs)
						t.Fatalf("step %d sun %.4v profile %.4f° limit %.4f°: lit %g, want %g", s, st.Sun,
							math.Atan2(d.U, -d.N)*180/math.Pi, crit*180/math.Pi, got, want)
					}
				}
				t.Logf("%d of %d steps shaded", shaded, len(steps))
			})
		}
	}
}

// A vertical pole of height h casts a shadow of length h/tan(elevation) on the ground,
// pointing away from the sun (analytic). A strip of 2000 cells along the anti-sun line
// measures the tip; a strip toward the sun must stay lit.
func TestPoleShadowLength(t *testing.T) {
	cases := []struct {
		name, h, az, el float64
	}{
		{0, 3, 180, 30},
		{0, 5, 135, 20},
		{0, 2, 250, 55},
		{0, 10, 90, 70},
		{0, 4, 10, 40},
	}
	for i, c := range cases {
		name := fmt.Sprintf("h%g az%g el%g", c.h, c.az, c.el)
		_ = i
		for _, p := range paths {
			t.Run(name+" "+p.name, func(t *testing.T) {
				const hw = 0.005 // pole half-width
				ground := rayOffsetM
				pole := geo.Block{ID: "pole", Footprint: rect(-hw, -hw, hw, hw), HeightM: ground + c.h}
				sun := sunAt(c.az, c.el)
				s := geo.Vec3{E: -sun[0], N: -sun[1]}.Unit() // shadow direction on the ground
				L := c.h / math.Tan(c.el*math.Pi/180)
				// The square top's shadow reaches past the centre line's tip by the half-width
				// measured along s (analytic).
				tip := L + hw/math.Max(math.Abs(s.E), math.Abs(s.N))
				const n, w, start = 2000, 0.004, 0.02
				length := 1.5*tip + 0.5
				strip := func(id string, dir geo.Vec3) geo.Module {
					u := geo.Vec3{E: dir.N, N: -dir.E} // u × dir = up
					o := dir.Scale(start).Add(u.Scale(-w / 2))
					return geo.Module{ID: id, Origin: o, U: u, V: dir, WidthM: w, LengthM: length}
				}
				mods := []geo.Module{strip("away", s), strip("toward", s.Scale(-1))}
				site := &geo.Site{Blocks: []geo.Block{pole}}
				r := compute(t, site, mods, Options{Grid: geo.CellGrid{Cols: 1, Rows: n}, BruteForce: p.brute}, []Step{{Sun: sun}})
				cellL := length / n
				far := 0.0
				for k, v := range r.Lit(0, 0) {
					if v == 0 {
						far = start + (float64(k)+0.5)*cellL
					}
				}
				if !scalar.EqualWithinAbs(far, tip, cellL) { // the tip lies within one cell of the last shaded centre
					fs := sceneFeatures(site, mods)
					fs = append(fs, pointFeature(s.E*tip, s.N*tip, map[string]any{"role": "expected tip"}),
						pointFeature(s.E*far, s.N*far, map[string]any{"role": "result tip"}))
					writeArtifact(t, "pole.geojson", fs)
					t.Errorf("shadow tip at %.4f m, want %.4f m (±%.4f)", far, tip, cellL)
				}
				if got := r.LitFraction(1, 0); !scalar.EqualWithinAbs(got, 1, 0) { // nothing lies toward the sun
					t.Errorf("strip toward the sun lit %g, want 1", got)
				}
			})
		}
	}
}

// An open roof with nothing around shows no beam shading: every step with the sun in front of
// the modules is fully lit, every step behind is dark (analytic).
func TestOpenRoofNoShade(t *testing.T) {
	cases := []struct {
		name          string
		pitch, aspect float64
		lat           float64
	}{
		{"flat", 0, 180, 47},
		{"south 35", 35, 180, 47},
		{"east 45", 45, 90, 47},
		{"north 30", 30, 0, 52},
		{"west 60 south hemisphere", 60, 270, -33},
	}
	for _, c := range cases {
		for _, p := range paths {
			t.Run(c.name+" "+p.name, func(t *testing.T) {
				f := geo.Face{ID: "R", Plan: rect(0, 0, 10, 6), PitchDeg: c.pitch, AspectDeg: c.aspect, EaveHeightM: 4}
				f.SetEave()
				mods := fillFace(&f, orb.Point{5, 3}, 2, 2, 1.13, 1.72, 0.02)
				site := &geo.Site{Faces: []geo.Face{f}}
				steps := sunYear(c.lat, 2, 1)
				r := compute(t, site, mods, Options{BruteForce: p.brute}, steps)
				for i := range mods {
					n := mods[i].Normal()
					for s, st := range steps {
						want := 0.0
						if n.Dot(vec(st.Sun)) > 0 {
							want = 1
						}
						if got := r.LitFraction(i, s); !scalar.EqualWithinAbs(got, want, 0) { // nothing to shade: exact
							writeArtifact(t, "open.geojson", sceneFeatures(site, mods))
							t.Fatalf("module %d step %d: lit %g, want %g", i, s, got, want)
						}
						if want == 1 && r.Lit(i, s) != nil {
							t.Fatalf("module %d step %d: Lit not nil for a fully lit module", i, s)
						}
					}
				}
			})
		}
	}
}

// A deciduous tree between the sun and a module passes its stated fraction in leaf-off
// months and nothing in leaf; an evergreen passes nothing; two crowns in line multiply.
func TestTreeTransmittanceByMonth(t *testing.T) {
	off := []time.Month{time.November, time.December, time.January, time.February, time.March}
	tree := func(id string, dist float64, shape geo.CrownShape, decid bool, tr float64) geo.Tree {
		// crown centre on the ray at elevation 30° due south of the module's centre
		c := dist
		h := 1.01 + c*math.Tan(30*math.Pi/180)
		return geo.Tree{ID: id, Trunk: orb.Point{0.5, 0.5 - c}, HeightM: h + 3, CrownBaseM: h - 3, CrownRadiusM: 4,
			Shape: shape, Deciduous: decid, LeafOffTransmittance: tr, LeafOffMonths: off}
	}
	cases := []struct {
		name  string
		trees []geo.Tree
		want  float64 // leaf-off transmittance
	}{
		{"ellipsoid 0.6", []geo.Tree{tree("T", 12, geo.CrownEllipsoid, true, 0.6)}, 0.6},
		{"cone 0.35", []geo.Tree{tree("T", 15, geo.CrownCone, true, 0.35)}, 0.35},
		{"evergreen", []geo.Tree{tree("T", 12, geo.CrownEllipsoid, false, 0.9)}, 0},
		{"two in line 0.7×0.5", []geo.Tree{tree("A", 12, geo.CrownEllipsoid, true, 0.7), tree("B", 25, geo.CrownEllipsoid, true, 0.5)}, 0.35},
	}
	for _, c := range cases {
		for _, p := range paths {
			t.Run(c.name+" "+p.name, func(t *testing.T) {
				mod := flatModule("M", geo.Vec3{U: 1}, 1, 1)
				site := &geo.Site{Trees: c.trees}
				var steps []Step
				for m := time.January; m <= time.December; m++ {
					steps = append(steps, Step{Sun: sunAt(180, 30), Month: m})
				}
				r := compute(t, site, []geo.Module{mod}, Options{Grid: geo.CellGrid{Cols: 2, Rows: 2}, BruteForce: p.brute}, steps)
				for s, st := range steps {
					want := 0.0
					for _, o := range off {
						if o == st.Month {
							want = c.want
						}
					}
					// stored as 0..255: rounding costs at most half a step
					if got := r.LitFraction(0, s); !scalar.EqualWithinAbs(got, want, 0.5/255) {
						writeArtifact(t, "tree.geojson", sceneFeatures(site, []geo.Module{mod}))
						t.Errorf("%v: lit %g, want %g", st.Month, got, want)
					}
				}
			})
		}
	}
}

// mirror returns the site and modules reflected in the north–south axis x = 0.
func mirror(site *geo.Site, mods []geo.Module) (*geo.Site, []geo.Module) {
	ring := func(r orb.Ring) orb.Ring {
		out := make(orb.Ring, len(r))
		for i, p := range r {
			out[len(r)-1-i] = orb.Point{-p[0], p[1]} // reversed to stay counter-clockwise
		}
		return out
	}
	m := &geo.Site{}
	for _, f := range site.Faces {
		f.Plan = ring(f.Plan)
		f.AspectDeg = math.Mod(360-f.AspectDeg, 360)
		f.SetEave()
		m.Faces = append(m.Faces, f)
	}
	for _, b := range site.Blocks {
		b.Footprint = ring(b.Footprint)
		b.RidgeAzimuthDeg = math.Mod(360-b.RidgeAzimuthDeg, 360)
		m.Blocks = append(m.Blocks, b)
	}
	for _, tr := range site.Trees {
		tr.Trunk[0] = -tr.Trunk[0]
		m.Trees = append(m.Trees, tr)
	}
	var mm []geo.Module
	for _, md := range mods {
		// The mirror of a module spans from its mirrored far-east corner with U reversed back.
		c := md.Corners()[1]
		md.Origin = geo.Vec3{E: -c.E, N: c.N, U: c.U}
		md.V = geo.Vec3{E: -md.V.E, N: md.V.N, U: md.V.U}
		md.U = geo.Vec3{E: md.U.E, N: -md.U.N, U: -md.U.U}
		mm = append(mm, md)
	}
	return m, mm
}

// A scene symmetric about the north–south axis, under a sun path symmetric about solar noon,
// gives mirror-image annual beam losses.
func TestMirrorSymmetry(t *testing.T) {
	for _, seed := range []uint64{1, 2, 3} {
		t.Run(fmt.Sprintf("seed %d", seed), func(t *testing.T) {
			half, mods := randomScene(seed, 8, 4)
			// keep only the objects east of the axis, then add their mirror images
			east := &geo.Site{Faces: half.Faces[:2]}
			for _, b := range half.Blocks {
				if b.Footprint.Bound().Min[0] > 0.5 {
					east.Blocks = append(east.Blocks, b)
				}
			}
			for _, tr := range half.Trees {
				if tr.Trunk[0]-tr.CrownRadiusM > 0.5 {
					east.Trees = append(east.Trees, tr)
				}
			}
			west, wmods := mirror(east, mods)
			site := &geo.Site{Faces: append(append([]geo.Face(nil), east.Faces...), west.Faces...),
				Blocks: append(append([]geo.Block(nil), east.Blocks...), west.Blocks...),
				Trees:  append(append([]geo.Tree(nil), east.Trees...), west.Trees...)}
			all := append(append([]geo.Module(nil), mods...), wmods...)
			steps := sunYear(47, 3, 1)
			r := compute(t, site, all, Options{}, steps)
			beam := annualBeam(r, all, steps)
			open := annualBeam(&Result{cells: 1, steps: len(steps), mods: litAll(len(all), len(steps))}, all, steps)
			sum := 0.0
			for i := range mods {
				j := i + len(mods)
				li, lj := 1-beam[i]/open[i], 1-beam[j]/open[j]
				sum += li
				// A grazing ray may round to a different cell on either side; 0.1 % of the
				// annual beam is far below one cell-hour here (common practice for float noise).
				if !scalar.EqualWithinAbs(li, lj, 1e-3) {
					writeArtifact(t, "mirror.geojson", sceneFeatures(site, all))
					t.Errorf("module %s loss %.5f, mirror %s loss %.5f", all[i].ID, li, all[j].ID, lj)
				}
			}
			t.Logf("mean annual beam loss %.2f %%", 100*sum/float64(len(mods)))
		})
	}
}

// litAll is a result in which everything is lit, for the unshaded reference.
func litAll(mods, steps int) []modResult {
	out := make([]modResult, mods)
	for i := range out {
		out[i].idx = make([]int32, steps)
		for s := range out[i].idx {
			out[i].idx[s] = stepLit
		}
	}
	return out
}
