package geo

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
	"gonum.org/v1/gonum/floats/scalar"
)

// pitch34 is atan(3/4) = 36.87°: cos 0.8, so a plan depth of 4 m is 5 m up the slope and the
// hand arithmetic stays in round numbers.
var pitch34 = math.Atan(0.75) * 180 / math.Pi

// southFace is a south-facing face (eave on the south side) over the plan ring r.
func southFace(id string, r orb.Ring, pitchDeg float64) Face {
	f := Face{ID: id, Plan: r, PitchDeg: pitchDeg, AspectDeg: 180, EaveHeightM: 3}
	f.SetEave()
	return f
}

// TestFillShapes counts modules on the roof shapes that are not rectangles, worked by hand.
//
// Frame: s along the eave (plan x), w up the slope (plan y / cos pitch). Module 1.72 × 1.13 m,
// gap 0.02 m, setback 0.3 m (common practice). A module row of n needs n·ds + (n−1)·0.02 along
// the eave, so n = floor((L + 0.02)/(ds + 0.02)) for a free length L.
//
// before is what the previous fill (rows from the setback line, each scanned left to right in
// 5 mm steps) placed on the same face, measured on it before the change.
func TestFillShapes(t *testing.T) {
	hip := southFace("H", orb.Ring{{0, 0}, {12, 0}, {8, 4}, {4, 4}, {0, 0}}, pitch34)
	gable := southFace("G", orb.Ring{{0, 0}, {8, 0}, {4, 4}, {0, 0}}, pitch34)
	valley := southFace("V", orb.Ring{{2, 0}, {10, 0}, {12, 4}, {0, 4}, {2, 0}}, pitch34)
	base := FillOptions{LengthM: 1.72, WidthM: 1.13, SetbackM: 0.3, GapM: 0.02}
	land := base
	land.Orientation = Landscape
	best := base
	best.Orientation = Best
	chimney := func(s *Site) {
		s.Blocks = []Block{{ID: "chimney", Footprint: orb.Ring{{4.7, 1.5}, {5.3, 1.5}, {5.3, 2.1}, {4.7, 2.1}, {4.7, 1.5}}, HeightM: 9}}
	}
	chimOpt := FillOptions{LengthM: 1.72, WidthM: 1.13, SetbackM: 0.4, GapM: 0.02, ObstacleClearanceM: 0.2}
	tests := []struct {
		name   string
		face   Face
		extra  func(*Site)
		opt    FillOptions
		want   int
		before int
		perRow []int
		// firstW is where row 1's lower edge lies up the slope, m; tolerance one offset
		// step (0.01 m) plus the 1 mm fit slack, as the offsets are tried on a grid.
		firstW float64
	}{
		// Hip face: eave 12 m, ridge 4 m, hips at 45° in plan; up the slope 5 m. Frame: left
		// hip from (0, 0) to (4, 5). Kept 0.3 m from it: s ≥ 0.8·w + 0.3·√41/5 = 0.8·w + 0.3842,
		// and the right hip likewise, so a row whose top is at w1 has L = 12 − 1.6·w1 − 0.7684.
		// Up the slope 0.3 … 4.7 = 4.4 m: two portrait rows (3.46 m). Rows only narrow upward,
		// so the lowest start is best: tops 2.02 and 3.76, L = 8.000 and 5.216:
		// floor(8.02/1.15) = 6, floor(5.236/1.15) = 4.
		{"hip portrait", hip, nil, base, 10, 10, []int{6, 4}, 0.3},
		// Landscape: three rows (3.43 m), tops 1.43, 2.58, 3.73: L = 8.944, 7.104, 5.264:
		// floor(8.964/1.74) = 5, floor(7.124/1.74) = 4, floor(5.284/1.74) = 3.
		{"hip landscape", hip, nil, land, 12, 12, []int{5, 4, 3}, 0.3},
		// Gable end: base 8 m, apex 5 m up the slope; L = 8 − 1.6·w1 − 0.7684. Portrait tops
		// 2.02, 3.76: L = 4.000, 1.216: floor(4.02/1.15) = 3, floor(1.236/1.15) = 1.
		{"gable portrait", gable, nil, base, 4, 4, []int{3, 1}, 0.3},
		// Landscape tops 1.43, 2.58, 3.73: L = 4.944, 3.104, 1.264: 2, 1, 0 (1.264 < 1.72).
		// Best keeps portrait, 4 against 3.
		{"gable best", gable, nil, best, 4, 4, []int{3, 1}, 0.3},
		// Face beside a valley, widening upward: eave s 2 … 10, top s 0 … 12 at w = 5. The
		// left edge from (2, 0) to (0, 5), kept 0.3 m: s ≥ 2 − 0.4·w + 0.3·√29/5 = 2.3231 − 0.4·w,
		// binding at a module's lower corner w0; so L = 7.3538 + 0.8·w0. Two portrait rows
		// with 4.4 − 3.46 = 0.94 m to spare. Lowest start: w0 = 0.3, 2.04, L = 7.594, 8.986:
		// 6 + 7 = 13 (what the old fill placed). Row 2 gets 8 once L + 0.02 ≥ 9.18, i.e.
		// w0 ≥ 2.2828 (start 0.243 up); row 1 gets 7 once L + 0.02 ≥ 8.03, i.e. w0 ≥ 0.8453
		// (start 0.545 up), within the 0.94 m: 7 + 8 = 15, rows from w = 0.845 (grid 0.85).
		{"valley portrait", valley, nil, base, 15, 13, []int{7, 8}, 0.85},
		// Landscape: three rows, 0.97 m to spare; n = floor((L + 0.02)/1.74). Lowest start
		// w0 = 0.3, 1.45, 2.6: L = 7.594, 8.514, 9.434: 4 + 4 + 5 = 13. Row 2 gets 5 from
		// w0 ≥ 1.6578 (start 0.208 up); row 1 would need 1.358 up and row 3 1.233 up, more than
		// the 0.97: 4 + 5 + 5 = 14 from w = 0.508 (grid 0.51).
		{"valley landscape", valley, nil, land, 14, 13, []int{4, 5, 5}, 0.51},
		// A 10 m × 5 m face at 30° with a chimney in the middle: plan x 4.7 … 5.3, y 1.5 … 2.1,
		// up the slope w 1.7321 … 2.4249, grown by the 0.2 m clearance to s 4.5 … 5.5,
		// w 1.5321 … 2.6249. Up the slope 5.7735 − 0.8 = 4.9735: two portrait rows, 1.5135 to
		// spare. A row clear of the chimney has 8 modules (floor(9.22/1.15)); a row through it
		// loses s0 in (4.5 − 1.13, 5.5): 0.4 … 3.37 takes 3 and 5.5 … 8.47 takes 3, so 6. At the
		// lowest start rows at 0.4 … 2.12 and 2.14 … 3.86 both meet it: 12. Starting 0.485 up
		// or more, row 2 (lower edge 2.625) clears it: 6 + 8 = 14, rows from w = 0.885 (grid 0.89).
		{"chimney in the middle", rectFace("C", 10, 5, 30, 180, 3), chimney, chimOpt, 14, 12, []int{6, 8}, 0.89},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			site := &Site{Faces: []Face{tc.face}}
			if tc.extra != nil {
				tc.extra(site)
			}
			mods, _, err := Fill(site, tc.opt)
			if err != nil {
				t.Fatal(err)
			}
			var perRow []int
			for _, m := range mods {
				if m.Row > len(perRow) {
					perRow = append(perRow, 0)
				}
				perRow[m.Row-1]++
			}
			// Counts are exact (tolerance 0): every floor above is at least 0.03 modules from
			// the next integer, far more than the 1 mm fit slack moves it.
			if len(mods) < tc.before || len(mods) != tc.want || fmt.Sprint(perRow) != fmt.Sprint(tc.perRow) {
				writeArtifact(t, t.Name(), site, mods, fmt.Sprintf("%d modules, rows %v", tc.want, tc.perRow))
				t.Fatalf("placed %d modules, rows %v; want %d, rows %v (hand count; before %d)", len(mods), perRow, tc.want, tc.perRow, tc.before)
			}
			// Row 1's lower edge, up the slope from the eave: its height above the eave over
			// sin(pitch). The module's lowest corner is its Origin in portrait and its
			// Origin + U·width in landscape (U points down the slope).
			low := math.Inf(1)
			for _, c := range mods[0].Corners() {
				low = math.Min(low, c.U)
			}
			w := (low - tc.face.EaveHeightM) / math.Sin(tc.face.PitchDeg*math.Pi/180)
			if !scalar.EqualWithinAbs(w, tc.firstW, 0.011) {
				t.Errorf("row 1 starts %.4f m up the slope, want %.2f", w, tc.firstW)
			}
		})
	}
}

// TestFillCentred checks that each row's run is centred on its free length: on the symmetric
// hip face every row's middle lies on the face's axis, plan x = 6.
func TestFillCentred(t *testing.T) {
	hip := southFace("H", orb.Ring{{0, 0}, {12, 0}, {8, 4}, {4, 4}, {0, 0}}, pitch34)
	for _, o := range []Orientation{Portrait, Landscape} {
		t.Run(o.String(), func(t *testing.T) {
			site := &Site{Faces: []Face{hip}}
			mods, _, err := Fill(site, FillOptions{LengthM: 1.72, WidthM: 1.13, SetbackM: 0.3, GapM: 0.02, Orientation: o})
			if err != nil {
				t.Fatal(err)
			}
			lo, hi := map[int]float64{}, map[int]float64{}
			for _, m := range mods {
				for _, c := range m.Corners() {
					if v, ok := lo[m.Row]; !ok || c.E < v {
						lo[m.Row] = c.E
					}
					if v, ok := hi[m.Row]; !ok || c.E > v {
						hi[m.Row] = c.E
					}
				}
			}
			for r := range lo {
				// 1e-9 m: the free length is found from the two hips, mirror images, so the
				// middle is 6 up to rounding.
				if mid := (lo[r] + hi[r]) / 2; !scalar.EqualWithinAbs(mid, 6, 1e-9) {
					writeArtifact(t, t.Name(), site, mods, "rows centred on x = 6")
					t.Errorf("row %d runs %.4f … %.4f, middle %.6f, want 6", r, lo[r], hi[r], mid)
				}
			}
		})
	}
}

// TestFillProperties fills seeded random convex and concave faces, with avoid areas and
// chimneys, and checks what any fill must keep: every module inside the face at least the
// setback from its edges (on the roof surface), at least the clearance from every obstacle and
// not over one, modules apart by at least the gap, rows and columns numbered 1, 2, … without
// holes, and the same result twice.
func TestFillProperties(t *testing.T) {
	rng := rand.New(rand.NewPCG(2024, 7))
	placed := 0
	for i := range 300 {
		concave := i%2 == 1
		k := 3 + rng.IntN(7)
		ax, ay := 4+rng.Float64()*6, 3+rng.Float64()*5
		th := make([]float64, k)
		for j := range th {
			th[j] = rng.Float64() * 2 * math.Pi
		}
		// Sorted angles around the centre give a simple ring; on an ellipse a convex one.
		slices.Sort(th)
		var ring orb.Ring
		for _, a := range th {
			r := 1.0
			if concave {
				r = 0.45 + 0.55*rng.Float64()
			}
			ring = append(ring, orb.Point{r * ax * math.Cos(a), r * ay * math.Sin(a)})
		}
		ring = append(ring, ring[0])
		if planar.Area(ring) < 1 {
			continue
		}
		f := Face{ID: "P", Plan: ring, PitchDeg: rng.Float64() * 55, AspectDeg: rng.Float64() * 360, EaveHeightM: 3}
		f.SetEave()
		site := &Site{Faces: []Face{f}}
		d := f.Downhill()
		for j := range rng.IntN(3) {
			cx, cy := (rng.Float64()-0.5)*ax, (rng.Float64()-0.5)*ay
			w, h := 0.2+rng.Float64(), 0.2+rng.Float64()
			switch {
			case i%5 == 0 && j == 0:
				// Large enough to swallow a module whole (a roof window).
				w, h = 2.5+rng.Float64()*1.5, 2.5+rng.Float64()*1.5
			case i%7 == 0:
				// A strip 5 mm wide running down the slope: thinner than the gap, so with no
				// clearance the modules either side must still keep the gap.
				w, h = 0.005, 4
			}
			// A rectangle w along the eave and h down the slope, from (cx, cy).
			rt := orb.Point{-d[1], d[0]}
			pt := func(s, u float64) orb.Point { return orb.Point{cx + s*rt[0] + u*d[0], cy + s*rt[1] + u*d[1]} }
			ob := orb.Ring{pt(0, 0), pt(0, h), pt(w, h), pt(w, 0), pt(0, 0)}
			if ob.Orientation() == orb.CW {
				ob.Reverse()
			}
			if j%2 == 0 {
				site.Avoids = append(site.Avoids, Avoid{ID: fmt.Sprint("a", j), Area: ob})
			} else {
				site.Blocks = append(site.Blocks, Block{ID: fmt.Sprint("b", j), Footprint: ob, HeightM: 40})
			}
		}
		opt := FillOptions{
			Orientation: Orientation(i % 3), SetbackM: rng.Float64() * 0.5, GapM: rng.Float64() * 0.03,
			ObstacleClearanceM: rng.Float64() * 0.3,
		}
		if i%4 == 0 {
			opt.ObstacleClearanceM = 0
		}
		mods, _, err := Fill(site, opt)
		if err != nil {
			t.Fatal(err)
		}
		placed += len(mods)
		again, _, _ := Fill(site, opt)
		if fmt.Sprint(again) != fmt.Sprint(mods) {
			t.Fatalf("case %d: a second fill differs", i)
		}
		if msg := checkFill(f, site, mods, opt); msg != "" {
			writeArtifact(t, fmt.Sprintf("%s_case%d", t.Name(), i), site, mods, msg)
			t.Fatalf("case %d (concave %v, %d vertices, pitch %.1f°, aspect %.1f°, %+v): %s", i, concave, k, f.PitchDeg, f.AspectDeg, opt, msg)
		}
	}
	// Guard against a generator that never lets a module on: the faces are 3 to 10 m across.
	if placed < 1000 {
		t.Fatalf("only %d modules over all cases", placed)
	}
}

// checkFill returns what is wrong with mods on face f, or "". It works on the roof surface in
// the coordinates of the first module's own unit vectors (an orthonormal basis of the face
// plane), lifting the plan outline and obstacles vertically onto the face.
func checkFill(f Face, site *Site, mods []Module, opt FillOptions) string {
	if len(mods) == 0 {
		return ""
	}
	o, e1, e2 := mods[0].Origin, mods[0].U, mods[0].V
	to2 := func(v Vec3) orb.Point { d := v.Sub(o); return orb.Point{d.Dot(e1), d.Dot(e2)} }
	lift := func(r orb.Ring) orb.Ring {
		out := make(orb.Ring, len(r))
		for i, p := range r {
			out[i] = to2(f.Lift(p))
		}
		return out
	}
	outline := lift(f.Plan)
	var obs []orb.Ring
	for _, a := range site.Avoids {
		obs = append(obs, lift(a.Area))
	}
	for _, b := range site.Blocks {
		obs = append(obs, lift(b.Footprint))
	}
	// 2e-3 m: the fill allows itself 1 mm on each side, √2 mm at a corner.
	const slack = 2e-3
	type box struct{ lo, hi orb.Point }
	boxes := make([]box, len(mods))
	rows := map[int]int{}
	for i, m := range mods {
		if m.Normal().Dot(mods[0].Normal()) < 1-1e-12 || math.Abs(m.U.Dot(e1)) < 1-1e-12 {
			return fmt.Sprintf("%s: not aligned with %s", m.ID, mods[0].ID)
		}
		c := m.Corners()
		var r orb.Ring
		for _, v := range c {
			r = append(r, to2(v))
		}
		r = append(r, r[0])
		bd := r.Bound()
		boxes[i] = box{bd.Min, bd.Max}
		for _, p := range r[:4] {
			if !planar.RingContains(outline, p) && ringBoundaryDist(outline, p) > slack {
				return fmt.Sprintf("%s: corner %v outside the face", m.ID, p)
			}
		}
		for j := 0; j+1 < len(outline); j++ {
			for q := range 4 {
				if d := segSegDist(outline[j], outline[j+1], r[q], r[q+1]); d < opt.SetbackM-slack {
					return fmt.Sprintf("%s: %.4f m from the face's edge %d, setback %.3f", m.ID, d, j, opt.SetbackM)
				}
			}
		}
		mid := orb.Point{(bd.Min[0] + bd.Max[0]) / 2, (bd.Min[1] + bd.Max[1]) / 2}
		for k, ob := range obs {
			if planar.RingContains(ob, mid) {
				return fmt.Sprintf("%s: over obstacle %d", m.ID, k)
			}
			for _, p := range ob[:len(ob)-1] {
				if p[0] > bd.Min[0]+slack && p[0] < bd.Max[0]-slack && p[1] > bd.Min[1]+slack && p[1] < bd.Max[1]-slack {
					return fmt.Sprintf("%s: obstacle %d corner inside", m.ID, k)
				}
			}
			for j := 0; j+1 < len(ob); j++ {
				for q := range 4 {
					if d := segSegDist(ob[j], ob[j+1], r[q], r[q+1]); d < opt.ObstacleClearanceM-slack {
						return fmt.Sprintf("%s: %.4f m from obstacle %d, clearance %.3f", m.ID, d, k, opt.ObstacleClearanceM)
					}
				}
			}
		}
		if m.Col != rows[m.Row]+1 {
			return fmt.Sprintf("%s: column after %d", m.ID, rows[m.Row])
		}
		rows[m.Row] = m.Col
	}
	for r := 1; r <= len(rows); r++ {
		if rows[r] == 0 {
			return fmt.Sprintf("row %d missing of %d", r, len(rows))
		}
	}
	// Any two modules lie apart by at least the gap along one axis; 1e-6 m for rounding in
	// the lift and the change of basis.
	for i := range boxes {
		for j := i + 1; j < len(boxes); j++ {
			a, b := boxes[i], boxes[j]
			sep := math.Max(math.Max(b.lo[0]-a.hi[0], a.lo[0]-b.hi[0]), math.Max(b.lo[1]-a.hi[1], a.lo[1]-b.hi[1]))
			if sep < opt.GapM-1e-6 {
				return fmt.Sprintf("%s and %s only %.4f m apart, gap %.3f", mods[i].ID, mods[j].ID, sep, opt.GapM)
			}
		}
	}
	return ""
}

// TestPack checks how one row's free intervals are filled: module 1.13 m, gap 0.02 m, so a
// pitch of 1.15 m.
func TestPack(t *testing.T) {
	tests := []struct {
		name string
		free []span
		want []float64 // left edges, m; to 1e-12 m, sums of a few metre-sized numbers
	}{
		// 9.2 m free for starts 0 … 8.07: floor(8.07/1.15) + 1 = 8 modules, 8.07 − 7·1.15 = 0.02
		// to spare, 0.01 each side.
		{"one interval, centred", []span{{0, 8.07}}, []float64{0.01, 1.16, 2.31, 3.46, 4.61, 5.76, 6.91, 8.06}},
		// Exactly one module's room (a start at one point).
		{"one place", []span{{2, 2}}, []float64{2}},
		{"nothing", nil, nil},
		// Either side of a 5 mm strip with no clearance: starts 0 … 0.002 and 1.135 … 1.137.
		// The second module would start less than 1.15 after the first, the gap not kept: one
		// module, centred on its interval.
		{"strip thinner than the gap", []span{{0, 0.002}, {1.135, 1.137}}, []float64{0.001}},
		// Two long intervals 0.135 m apart: greedy 3 (0, 1.15, 2.3) and 3 from 3.45 (2.3 + 1.15)
		// to 5.75 ≤ 6. Alone each would centre (0.35 and 3.4175), too close; the right run can
		// start at most 6 − 2.3 = 3.7, so the left one at most 3.7 − 3·1.15 = 0.25, and the right
		// one then at 0.25 + 3.45 = 3.7.
		{"coupled runs", []span{{0, 3}, {3.135, 6}}, []float64{0.25, 1.4, 2.55, 3.7, 4.85, 6}},
		// Far apart: each run centred on its own interval: [0, 1] holds 1 at 0.5; [5, 7.3] holds
		// floor(2.3/1.15) + 1 = 3 with no room to spare.
		{"separate runs", []span{{0, 1}, {5, 7.3}}, []float64{0.5, 5, 6.15, 7.3}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := pack(slices.Clone(tc.free), 1.13, 0.02, nil)
			ok := len(got) == len(tc.want)
			for i := 0; ok && i < len(got); i++ {
				ok = scalar.EqualWithinAbs(got[i], tc.want[i], 1e-12)
			}
			if !ok {
				t.Fatalf("pack(%v) = %v, want %v", tc.free, got, tc.want)
			}
		})
	}
}

// TestStadiumSpan checks the s-range of the points within m of a segment inside a band.
func TestStadiumSpan(t *testing.T) {
	tests := []struct {
		name   string
		a, b   orb.Point
		m      float64
		w0, w1 float64
		lo, hi float64
		ok     bool
	}{
		// A vertical segment s = 2, w 0 … 5, grown by 0.3: s 1.7 … 2.3 wherever the band is.
		{"vertical", orb.Point{2, 0}, orb.Point{2, 5}, 0.3, 1, 2, 1.7, 2.3, true},
		// Horizontal segment at w = 0, s 0 … 4, grown by 0.5; band 0.3 … 1 meets the top half
		// of the stadium, widest at w = 0.3: ends ±√(0.25 − 0.09) = ±0.4.
		{"horizontal, cap", orb.Point{0, 0}, orb.Point{4, 0}, 0.5, 0.3, 1, -0.4, 4.4, true},
		{"horizontal, missed", orb.Point{0, 0}, orb.Point{4, 0}, 0.5, 0.6, 1, 0, 0, false},
		// The 45° segment (0, 0)–(4, 4), m = 0, band 1 … 2: exactly s 1 … 2.
		{"diagonal, bare", orb.Point{0, 0}, orb.Point{4, 4}, 0, 1, 2, 1, 2, true},
		// Grown by m: the strip's edges are the segment moved ±m√2 along s.
		{"diagonal, grown", orb.Point{0, 0}, orb.Point{4, 4}, 0.1, 1, 2, 1 - 0.1*math.Sqrt2, 2 + 0.1*math.Sqrt2, true},
		// A band w 4.06 … 5 just above the segment's end (4, 4). Right: the strip's lower-right
		// edge s = w + 0.1·√2 is at 4.2014 for w = 4.06, past the end (t = (s + w)/8 = 1.03 > 1),
		// so the end disc decides: 4 + √(0.01 − 0.0036) = 4.08. Left: the strip's upper-left edge
		// s = w − 0.1·√2 = 3.9186 at w = 4.06 is still beside the segment (t = 0.997), further
		// out than the disc's 3.92.
		{"end disc", orb.Point{0, 0}, orb.Point{4, 4}, 0.1, 4.06, 5, 4.06 - 0.1*math.Sqrt2, 4.08, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			lo, hi, ok := stadiumSpan(tc.a, tc.b, tc.m, tc.w0, tc.w1)
			// 1e-12 m: closed forms of metre-sized numbers.
			if ok != tc.ok || ok && (!scalar.EqualWithinAbs(lo, tc.lo, 1e-12) || !scalar.EqualWithinAbs(hi, tc.hi, 1e-12)) {
				t.Fatalf("stadiumSpan = %.6f, %.6f, %v; want %.6f, %.6f, %v", lo, hi, ok, tc.lo, tc.hi, tc.ok)
			}
		})
	}
}
