package electric

import (
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// refScratch is curveOnGridRef's working space.
type refScratch struct {
	vals  []float64
	idx   []int
	vcell [][]float64
	ext   []bool
	cnt   []int
	vh    [2][]float64
	jgrid []float64
	m     merger
	his   [2][]float64
}

// curveOnGridRef is the straightforward curveOnGrid before the on-demand
// cells and bypass skip (every cell point from VoltageAt): it writes the module voltage at currents i0 + k·h into v. Cells
// with equal irradiance share one computed cell curve, so a module costs one
// Lambert-W evaluation per distinct irradiance and grid point.
func (m *Module) curveOnGridRef(cellIrr []float64, tempC, i0, h float64, v []float64, sc *refScratch) {
	n := len(v)
	sc.vals = sc.vals[:0]
	sc.idx = sc.idx[:0]
	for _, s := range cellIrr {
		u := -1
		for j, x := range sc.vals {
			if x == s {
				u = j
				break
			}
		}
		if u < 0 {
			u = len(sc.vals)
			sc.vals = append(sc.vals, s)
		}
		sc.idx = append(sc.idx, u)
	}
	nu := len(sc.vals)
	for len(sc.vcell) < nu {
		sc.vcell = append(sc.vcell, nil)
	}
	sc.ext = append(sc.ext[:0], make([]bool, nu)...)
	nh := 1
	if m.half {
		nh = 2
	}
	sc.cnt = append(sc.cnt[:0], make([]int, m.nSub*nh*nu)...)
	for c, u := range sc.idx {
		sc.cnt[(int(m.sub[c])*nh+int(m.halfOf[c]))*nu+u]++
	}
	// Cell current on the grid: the module current for full cells; for
	// half-cells the grid is i0/2 + j·h/2, so j = k is half the module current.
	ci0, ch := i0, h
	if m.half {
		ci0, ch = i0/2, h/2
	}
	params := make([]Params, 0, 8)
	for u := range nu {
		p := translate(m.cell, m.alphaCell, sc.vals[u], tempC)
		params = append(params, p)
		sc.vcell[u] = grow(sc.vcell[u], 2*n)
		for k := range n {
			sc.vcell[u][k] = p.VoltageAt(ci0 + float64(k)*ch)
		}
	}
	clear(v)
	for s := range m.nSub {
		c0 := sc.cnt[s*nh*nu : (s*nh+1)*nu]
		if !m.half || equalInts(c0, sc.cnt[(s*nh+1)*nu:(s*nh+2)*nu]) {
			// Full cells, or two equal halves sharing the current evenly.
			for k := range n {
				var sum float64
				for u, c := range c0 {
					if c != 0 {
						sum += float64(c) * sc.vcell[u][k]
					}
				}
				v[k] += math.Max(sum, -m.bypassV)
			}
			continue
		}
		// Unequal halves: each half may carry up to the whole module
		// current, so extend the cell curves to 2n half-grid points, then
		// put the two halves in parallel and read the voltage back at the
		// module grid currents.
		sc.jgrid = grow(sc.jgrid, 2*n)
		for j := range 2 * n {
			sc.jgrid[j] = ci0 + float64(j)*ch
		}
		for u := range nu {
			if !sc.ext[u] {
				for j := n; j < 2*n; j++ {
					sc.vcell[u][j] = params[u].VoltageAt(sc.jgrid[j])
				}
				sc.ext[u] = true
			}
		}
		for hh := range 2 {
			cc := sc.cnt[(s*nh+hh)*nu : (s*nh+hh+1)*nu]
			sc.vh[hh] = grow(sc.vh[hh], 2*n)
			for j := range 2 * n {
				var sum float64
				for u, c := range cc {
					if c != 0 {
						sum += float64(c) * sc.vcell[u][j]
					}
				}
				sc.vh[hh][j] = sum
			}
			sc.his[hh] = sc.jgrid
		}
		oi, ov := sc.m.parallel(sc.his[:], sc.vh[:])
		hint := 0
		for k := range n {
			var vk float64
			vk, hint = voltageOn(oi, ov, i0+float64(k)*h, hint)
			v[k] += math.Max(vk, -m.bypassV)
		}
	}
}

// TestLambertWNear: the warm-started W agrees with the cold one to a few
// ulps over the range a cell curve meets, from previous points up to steps
// three times (1+W) in L, where it mostly falls back [calc: both solve w + ln w = L].
func TestLambertWNear(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for range 20000 {
		L := -45 + 1e4*math.Pow(rng.Float64(), 3)
		wp := lambertWExp(L)
		Lp := L - 3*(1+wp)*(2*rng.Float64()-1)
		wp = lambertWExp(Lp)
		got, want := lambertWExpNear(L, Lp, wp), lambertWExp(L)
		// ln wp taken as Lp − wp carries Lp's rounding, |Lp|·2⁻⁵³, which
		// becomes a relative error in w of up to that over (1+w).
		tol := 4e-16 + 4e-16*math.Max(1, math.Max(math.Abs(L), math.Abs(Lp)))/(1+want)
		if !scalar.EqualWithinAbsOrRel(got, want, 1e-300, tol) {
			t.Fatalf("L=%g from %g: %.17g, want %.17g", L, Lp, got, want)
		}
	}
}

// TestFritschOrder: one step of the iteration from a guess off by δ leaves
// an error below 2ε⁴, ε the step taken: fourth order, so lambertWExp's two
// steps from its 1 % guesses reach double precision [calc against
// lambertWExp]; and log1pSmall matches math.Log1p on its range.
func TestFritschOrder(t *testing.T) {
	for _, L := range []float64{-5, 0, 3, 20, 100, 1000, 1e5} {
		w0 := lambertWExp(L)
		for _, d := range []float64{-0.1, -1e-2, -1e-3, 1e-4, 1e-3, 1e-2, 0.1} {
			w := w0 * (1 + d)
			z := L - math.Log(w) - w
			q := 2 * (1 + w) * (1 + w + 2*z/3)
			eps := z / (1 + w) * (q - z) / (q - 2*z)
			w *= 1 + eps
			if err := math.Abs(w-w0) / w0; err > 2*math.Pow(eps, 4)+4e-16 {
				t.Errorf("L=%g, δ=%g: step %g left error %g", L, d, eps, err)
			}
		}
	}
	for x := -0.11; x <= 0.11; x += 0.001 {
		if got, want := log1pSmall(x), math.Log1p(x); !scalar.EqualWithinAbsOrRel(got, want, 1e-18, 1e-15) {
			t.Errorf("log1pSmall(%g) = %.17g, want %.17g", x, got, want)
		}
	}
}

// TestCurveOnGridMatchesReference: the on-demand, bypass-skipping curve
// equals the straightforward one (every cell point from VoltageAt) within
// 1e-9 V at every grid point, for seeded shade patterns on a half-cut and a
// full-cell module: same model, only the arithmetic's order differs.
func TestCurveOnGridMatchesReference(t *testing.T) {
	for _, m := range halfAndFullCells(t) {
		rng := rand.New(rand.NewPCG(5, 6))
		var sc curveScratch
		var rs refScratch
		got, want := make([]float64, curvePoints), make([]float64, curvePoints)
		for trial := range 300 {
			g := 2000 * rng.Float64()
			tc := -20 + 90*rng.Float64()
			irr := uniformIrr(m.Cells(), g)
			switch trial % 3 {
			case 1: // a few random cells
				for k := range irr {
					if rng.Float64() < 0.1 {
						irr[k] = g * rng.Float64()
					}
				}
			case 2: // a shadow edge across rows
				cols, rows := m.Grid()
				d := rng.IntN(rows)
				for r := range d {
					for c := range cols {
						irr[r*cols+c] = 0.15 * g
					}
				}
			}
			i0, h := gridFor(m.topCurrent(irr, tc) * (1 + rng.Float64()))
			m.curveOnGrid(irr, tc, evenGrid(i0, h, len(got)), got, &sc)
			m.curveOnGridRef(irr, tc, i0, h, want, &rs)
			for k := range got {
				if !scalar.EqualWithinAbs(got[k], want[k], 1e-9) {
					t.Fatalf("%d cells, trial %d, point %d: %.12g V, want %.12g V", m.Cells(), trial, k, got[k], want[k])
				}
			}
		}
	}
}

// TestUniformMaxPower: the bisected maximum of a uniformly lit module equals
// polyMax over all points of its curve on the same grid (1e-12 relative:
// the same segment, only the cell points' last bits may differ), across
// irradiance and temperature, dark included.
func TestUniformMaxPower(t *testing.T) {
	for _, ds := range []Datasheet{testDatasheet, fitCases[1].ds} {
		m, err := NewModule(ds)
		if err != nil {
			t.Fatal(err)
		}
		rng := rand.New(rand.NewPCG(7, 8))
		var sc curveScratch
		v := make([]float64, curvePoints)
		gi := make([]float64, curvePoints)
		for trial := range 300 {
			s := 1200 * rng.Float64()
			if trial == 0 {
				s = 0
			}
			tc := -30 + 100*rng.Float64()
			irr := uniformIrr(m.Cells(), s)
			i0, h := gridFor(m.topCurrent(irr, tc))
			m.curveOnGrid(irr, tc, evenGrid(i0, h, len(v)), v, &sc)
			for k := range gi {
				gi[k] = i0 + float64(k)*h
			}
			want, _, _ := polyMax(gi, v, 0, math.Inf(1), math.Inf(1))
			got := m.uniformMaxPower(s, tc, &sc)
			if !scalar.EqualWithinAbsOrRel(got, want, 1e-12, 1e-12) {
				t.Fatalf("%g W/m², %g °C: %.15g W, want %.15g W", s, tc, got, want)
			}
		}
	}
}

// TestNewYearWorkers: the callback runs in step order on the caller's
// goroutine, and the year does not depend on how many goroutines build the
// curves (bit-identical results with GOMAXPROCS 1 and 4).
func TestNewYearWorkers(t *testing.T) {
	m, err := NewModule(testDatasheet)
	if err != nil {
		t.Fatal(err)
	}
	build := func(procs int) *Year {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		next := 0
		y, err := NewYear(m, 40, 101, func(s int, d *StepInput) {
			if s != next {
				t.Errorf("step %d called, want %d", s, next)
			}
			next++
			rng := rand.New(rand.NewPCG(9, uint64(s)))
			for k := range d.CellIrr {
				g := 1000 * rng.Float64()
				for c := range d.CellIrr[k] {
					d.CellIrr[k][c] = g
					if rng.Float64() < 0.05 {
						d.CellIrr[k][c] = g * rng.Float64()
					}
				}
				d.TempC[k] = 20 + float64(k%3)
				d.UnshadedIrr[k] = g
			}
		})
		if err != nil {
			t.Fatal(err)
		}
		if next != 101 {
			t.Errorf("%d steps called, want 101", next)
		}
		return y
	}
	a, b := build(1), build(4)
	var l Layout
	for in := range 2 {
		var strs [][]int
		for s := range 2 {
			var str []int
			for k := range 10 {
				str = append(str, (in*2+s)*10+k)
			}
			strs = append(strs, str)
		}
		l.Inputs = append(l.Inputs, strs)
	}
	sameYears(t, a, b, l)
}

// sameYears fails unless two years built from the same steps in different ways are the
// same to the bit: their curves, every module's energies, and the year of layout l.
func sameYears(t *testing.T, got, want *Year, l Layout) {
	t.Helper()
	if got.Curves() != want.Curves() || !slices.Equal(got.ModuleDCWh(), want.ModuleDCWh()) ||
		!slices.Equal(got.ModuleUnshadedDCWh(), want.ModuleUnshadedDCWh()) {
		t.Fatalf("%d curves, want %d; module energies differ", got.Curves(), want.Curves())
	}
	rg, err := got.Evaluate(l, bigInverter, EvalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rw, err := want.Evaluate(l, bigInverter, EvalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if rg.ACWh != rw.ACWh || rg.DCWh != rw.DCWh || rg.UnshadedDCWh != rw.UnshadedDCWh || !slices.Equal(rg.StepDCWh, rw.StepDCWh) {
		t.Errorf("layout: %+v, want %+v", rg, rw)
	}
}

// TestWarmStep: where warmStep accepts its step, W and ln W agree with
// lambertWExp to a few ulps [calc: both solve w + ln w = L]; and it accepts
// steps of up to |ΔL|/(1+W) = 0.05 in forward bias, the common case along a
// curve's grid.
func TestWarmStep(t *testing.T) {
	rng := rand.New(rand.NewPCG(21, 22))
	accepted := 0
	for trial := range 20000 {
		Lp := 2 + 5e3*math.Pow(rng.Float64(), 2)
		wp := lambertWExp(Lp)
		tt := 0.3 * (2*rng.Float64() - 1)
		if trial%2 == 0 {
			tt *= 0.05 / 0.3
		}
		L := Lp + tt*(1+wp)
		w, u, _, ok := warmStep(L, Lp, wp, math.Log(wp), 1/(1+wp))
		if !ok {
			if math.Abs(tt) <= 0.05 && wp > 20 {
				t.Fatalf("L=%g from %g (t=%g, W=%g) refused", L, Lp, tt, wp)
			}
			continue
		}
		accepted++
		want := lambertWExp(L)
		// Rounding of L − Lp and of ln wp (|ln wp|·2⁻⁵³) carry into u and,
		// relative, into w; a few ulps of slack on top.
		if !scalar.EqualWithinRel(w, want, 2e-15) || !scalar.EqualWithinAbs(u, math.Log(want), 1e-14) {
			t.Fatalf("L=%g from %g (t=%g): W %.17g, ln W %.17g; want %.17g, %.17g", L, Lp, tt, w, u, want, math.Log(want))
		}
	}
	if accepted < 10000 {
		t.Errorf("only %d of 20000 steps accepted", accepted)
	}
}

// evenGrid returns n currents i0 + k·h.
func evenGrid(i0, h float64, n int) []float64 {
	g := make([]float64, n)
	for k := range g {
		g[k] = i0 + float64(k)*h
	}
	return g
}

// TestCurveOnGridSharedCells: the cell curves curveOnGrid keeps for the next call on the same
// module and grid, and the substrings lit alike it computes once, give every module the same
// voltages to the bit as a fresh scratch does, in whatever order the modules come: the curves
// of one step share cells (a shadow over several modules at the same temperature), and the
// year's energy must not depend on which module came first.
func TestCurveOnGridSharedCells(t *testing.T) {
	for _, m := range halfAndFullCells(t) {
		cols, rows := m.Grid()
		rng := rand.New(rand.NewPCG(9, 10))
		for trial := range 40 {
			tc := -10 + 60*rng.Float64()
			lit, dim, part := 200+900*rng.Float64(), 50+100*rng.Float64(), 300*rng.Float64()
			// Several modules from three values: shadows of different shapes, one whole row
			// (every substring and half alike), one unshaded.
			var mods [][]float64
			for range 6 {
				irr := uniformIrr(m.Cells(), lit)
				r0, c0 := rng.IntN(rows), rng.IntN(cols)
				r1, c1 := r0+rng.IntN(rows-r0), c0+rng.IntN(cols-c0)
				for r := r0; r <= r1; r++ {
					for c := c0; c <= c1; c++ {
						irr[r*cols+c] = dim
					}
				}
				irr[rng.IntN(m.Cells())] = part
				mods = append(mods, irr)
			}
			row := uniformIrr(m.Cells(), lit)
			for c := range cols {
				row[c] = dim
			}
			mods = append(mods, row, uniformIrr(m.Cells(), lit))
			top := 0.0
			for _, irr := range mods {
				top = math.Max(top, m.topCurrent(irr, tc))
			}
			i0, h := gridFor(top)
			grid := evenGrid(i0, h, curvePoints)
			var shared curveScratch
			got, want := make([]float64, curvePoints), make([]float64, curvePoints)
			for _, k := range rng.Perm(len(mods)) {
				// The caller may reuse its grid's memory once a call returns.
				g := slices.Clone(grid)
				m.curveOnGrid(mods[k], tc, g, got, &shared)
				for j := range g {
					g[j] = math.NaN()
				}
				var fresh curveScratch
				m.curveOnGrid(mods[k], tc, grid, want, &fresh)
				if !slices.Equal(got, want) {
					t.Fatalf("%d cells, trial %d, module %d: shared cells give\n%v\nwant\n%v", m.Cells(), trial, k, got, want)
				}
			}
		}
	}
}

// halfAndFullCells returns the test module with half-cut cells and the same with 60 full
// cells: the two ways cells make a substring.
func halfAndFullCells(t *testing.T) []*Module {
	t.Helper()
	full := testDatasheet
	full.HalfCut, full.CellsSeries = false, 60
	var out []*Module
	for _, ds := range []Datasheet{testDatasheet, full} {
		m, err := NewModule(ds)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, m)
	}
	return out
}
