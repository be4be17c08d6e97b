package electric

import (
	"fmt"
	"math"
	"slices"
	"sync"
)

// curvePoints is the number of evenly spaced points of a module curve: two of
// reverse current, one at zero and the rest up to just above the brightest
// substring's short-circuit current. 64 points keep the maximum power of an
// evenly lit module within 0.1 % of the exact model (TestModuleCurveAccuracy).
// With a partly shaded cell a bypass diode's knee falls between two of them
// (the maximum read up to 1.7 % low), so appendGrid adds points around each
// knee: within 0.1 % again (TestPartialShadeCurveAccuracy).
const curvePoints = 64

// MaxIrradiance is the highest effective cell irradiance the curves take, W/m²: above
// anything a real sky gives a plane (about 1.4 kW/m² with cloud enhancement).
const MaxIrradiance = 2000.0

// MinCellTempC and MaxCellTempC bound the cell temperature the curves take, °C: the coldest
// air a weather file may give (−70 °C) and the hottest cell the temperature models give at
// MaxIrradiance, 70 °C air and no wind with the back insulated (70 + 2000·e^−2.81 = 190 °C):
// the single-diode translation stays finite there, though no module survives it long.
const MinCellTempC, MaxCellTempC = -70.0, 200.0

// BypassDropV is the forward voltage of a bypass diode when it conducts
// (V): a Schottky diode at several amperes; common practice 0.4–0.6 V.
const BypassDropV = 0.5

// Module is a fitted module with its cell layout: 6 columns across the
// width and rows along the length; cell index = row*cols + col. Substring k
// is columns [k*cols/B, (k+1)*cols/B) along the whole length; in a half-cut
// module rows [0, rows/2) and [rows/2, rows) are the two parallel halves of
// each substring. Build it with NewModule; a Module is read-only and safe
// for concurrent use.
type Module struct {
	ds         Datasheet
	params     Params
	cell       Params  // one cell (or half-cell) at STC
	alphaCell  float64 // A/K for one cell
	cols, rows int
	nSub       int
	half       bool
	bypassV    float64
	sub        []int8 // cell → substring
	subCells   []int  // substring → cells in it (in one half for half-cut)
	halfOf     []int8 // cell → half (0 or 1)
	slot       []int8 // cell → 2·substring + half
	// kneeW is the relative width of a bypass knee: a cell's open-circuit voltage over
	// the voltage its light current makes across its shunt, at STC (the shunt scales as
	// 1/irradiance and the light current as irradiance, so the ratio holds at any light).
	kneeW float64
}

// NewModule validates the datasheet, fits the single-diode parameters and
// derives the per-cell parameters: for Ns cell positions in series, one cell
// has A/Ns, Rs/Ns and Rsh/Ns; a half-cell of a half-cut module carries half
// the current (IL/2, I0/2, αIsc/2) with twice the resistances (2Rs/Ns,
// 2Rsh/Ns), because two halves in parallel make the module.
func NewModule(ds Datasheet) (*Module, error) {
	p, err := Fit(ds)
	if err != nil {
		return nil, err
	}
	ns := float64(ds.seriesCells())
	alpha := ds.TempCoeffIscPct / 100 * ds.IscA
	cell := Params{IL: p.IL, I0: p.I0, Rs: p.Rs / ns, Rsh: p.Rsh / ns, A: p.A / ns}
	if ds.HalfCut {
		cell = Params{IL: p.IL / 2, I0: p.I0 / 2, Rs: 2 * p.Rs / ns, Rsh: 2 * p.Rsh / ns, A: p.A / ns}
		alpha /= 2
	}
	m := newModuleCells(6, ds.CellsSeries/6, ds.BypassDiodes, ds.HalfCut, cell, alpha)
	m.ds, m.params = ds, p
	return m, nil
}

// newModuleCells builds a module straight from cell parameters (tests use it
// for cases stated at cell level).
func newModuleCells(cols, rows, nSub int, half bool, cell Params, alphaCell float64) *Module {
	m := &Module{cell: cell, alphaCell: alphaCell, cols: cols, rows: rows, nSub: nSub, half: half, bypassV: BypassDropV}
	m.kneeW = cell.A * math.Log(cell.IL/cell.I0+1) / (cell.Rsh * cell.IL)
	m.sub = make([]int8, cols*rows)
	m.halfOf = make([]int8, cols*rows)
	m.slot = make([]int8, cols*rows)
	m.subCells = make([]int, nSub)
	for r := range rows {
		for c := range cols {
			k := r*cols + c
			m.sub[k] = int8(c * nSub / cols)
			if half && r >= rows/2 {
				m.halfOf[k] = 1
			} else {
				m.subCells[m.sub[k]]++
			}
			m.slot[k] = 2*m.sub[k] + m.halfOf[k]
		}
	}
	return m
}

// Grid returns the cell layout: 6 columns, and rows along the length (10 for
// 60 cells, 12 for 72, 20 for 120 half-cells, 24 for 144).
func (m *Module) Grid() (cols, rows int) { return m.cols, m.rows }

// Datasheet returns the datasheet the module was built from.
func (m *Module) Datasheet() Datasheet { return m.ds }

// Params returns the fitted module-level parameters at STC.
func (m *Module) Params() Params { return m.params }

// Cells returns the number of cells (or half-cells).
func (m *Module) Cells() int { return m.cols * m.rows }

// parallelHalves is 2 for a half-cut module, else 1.
func (m *Module) parallelHalves() float64 {
	if m.half {
		return 2
	}
	return 1
}

// topCurrent returns the module current at which every substring is surely
// bypassed: a little above the brightest cell's light current.
func (m *Module) topCurrent(cellIrr []float64, tempC float64) float64 {
	smax := 0.0
	for _, s := range cellIrr {
		if s > smax {
			smax = s
		}
	}
	return m.topCurrentAt(lightCurrent(m.cell.IL, m.alphaCell, smax, tempC))
}

// topCurrentAt returns topCurrent for a brightest cell of light current ilCell.
func (m *Module) topCurrentAt(ilCell float64) float64 {
	// Keep a small grid even for a dark module so the curve stays valid.
	return math.Max(1.04*ilCell*m.parallelHalves(), 1e-3*m.cell.IL)
}

// Curve returns the module's I-V curve for per-cell effective irradiance
// cellIrr (W/m², len Cells(), index row*cols+col) and cell temperature tempC
// (°C). A wrong length or non-finite value yields the empty curve, which
// delivers no power; CheckCells says what is wrong.
func (m *Module) Curve(cellIrr []float64, tempC float64) Curve {
	if m.CheckCells(cellIrr, tempC) != nil {
		return Curve{}
	}
	top := m.topCurrent(cellIrr, tempC)
	sc := scratchPool.Get().(*curveScratch)
	defer scratchPool.Put(sc)
	sc.mod = nil // cell curves afresh: a call costs the same whatever came before it
	sc.knees = m.appendKnees(sc.knees[:0], cellIrr, tempC)
	slices.Sort(sc.knees)
	sc.knees = slices.Compact(sc.knees)
	sc.grid = appendGrid(sc.grid[:0], top, sc.knees, m.kneeW)
	n := len(sc.grid)
	sc.out = grow(sc.out, n)
	m.curveOnGrid(cellIrr, tempC, sc.grid, sc.out, sc)
	c := Curve{i: make([]float32, n), v: make([]float32, n)}
	for k, x := range sc.out {
		c.i[k] = float32(sc.grid[k])
		c.v[k] = float32(x)
	}
	return c
}

// scratchPool lends Curve its working space, so that repeated calls do not
// allocate it afresh.
var scratchPool = sync.Pool{New: func() any { return new(curveScratch) }}

// CheckCells reports whether cellIrr and tempC are usable by Curve. Its errors wrap
// ErrOutOfModel: the values are the caller's computation, not the user's input.
func (m *Module) CheckCells(cellIrr []float64, tempC float64) error {
	if len(cellIrr) != m.Cells() {
		return outOfModelf("cell_irradiance", "%d values, want %d (cols×rows)", len(cellIrr), m.Cells())
	}
	return checkValues(cellIrr, tempC)
}

// checkValues is CheckCells without the count of cells: for all the cells, or for the
// first of a module lit evenly (StepInput.Even).
func checkValues(cellIrr []float64, tempC float64) error {
	for k, s := range cellIrr {
		if !(s >= 0 && s <= MaxIrradiance) { // false for NaN too
			return outOfModelf(fmt.Sprintf("cell_irradiance[%d]", k), "%g W/m² must lie in 0..%g", s, MaxIrradiance)
		}
	}
	if math.IsNaN(tempC) || tempC < MinCellTempC || tempC > MaxCellTempC {
		return outOfModelf("cell_temp_c", "%g must lie in %g..%g °C", tempC, MinCellTempC, MaxCellTempC)
	}
	return nil
}

// gridFor returns the current grid (first point, step) of a curve reaching
// top: two points of reverse current, then zero, then up to top.
func gridFor(top float64) (i0, h float64) {
	h = top / (curvePoints - 3)
	return -2 * h, h
}

// kneeBelow and kneeAbove place the extra points of a curve around each knee current Ik, at
// Ik·(1 − r·w) and Ik·(1 + r·w), w the module's kneeWidth. Within a few w below a knee the
// partly lit cell leaves its forward voltage: its shunt takes a growing share of its light
// current and the diode's logarithm falls to zero, and there the maximum power of a module
// with a partly shaded cell lies (0.3 to 1.5 w below the knee, by the tests); above it
// the cell is in reverse bias, a straight line through its shunt, until the bypass diode
// conducts.
var (
	kneeBelow = [...]float64{3.5, 2, 1.3, 0.85, 0.5, 0.2, 0}
	kneeAbove = [...]float64{1}
)

// maxKnees is the most knee currents a step's shared grid takes (see NewYear); each adds
// len(kneeBelow)+len(kneeAbove) points to every curve of the step. On the test example's
// year (up to 16 knees at a step) the modules' DC energy reads 0.033 % low with no knee
// points, 0.0085 % with four, 0.0004 % with eight, at 1.5 and 2 times the points.
const maxKnees = 4

// appendKnees appends the module's knee currents (A): for every substring with a cell
// darker than the module's brightest, the module current at which its darkest cell (for
// half-cells: the darkest cell of each half, the halves in parallel) runs out of light
// current, so that it turns to reverse bias and the substring's bypass diode soon conducts.
func (m *Module) appendKnees(dst, cellIrr []float64, tempC float64) []float64 {
	// One pass over the cells: the brightest, and the darkest of each substring and half
	// (slot 2·substring + half).
	var buf [12]float64
	lo := buf[:]
	if 2*m.nSub > len(buf) {
		lo = make([]float64, 2*m.nSub)
	}
	lo = lo[:2*m.nSub]
	for k := range lo {
		lo[k] = math.Inf(1)
	}
	smax := 0.0
	for c, g := range cellIrr {
		smax = fmax(smax, g)
		k := m.slot[c]
		lo[k] = fmin(lo[k], g)
	}
	for s := range m.nSub {
		l0, l1 := lo[2*s], lo[2*s+1]
		if !m.half {
			l1 = l0
		}
		if l0 >= smax && l1 >= smax {
			continue
		}
		ik := lightCurrent(m.cell.IL, m.alphaCell, l0, tempC)
		if m.half {
			ik += lightCurrent(m.cell.IL, m.alphaCell, l1, tempC)
		}
		if ik > 0 {
			dst = append(dst, ik)
		}
	}
	return dst
}

// appendGrid appends a curve's current grid (A): the evenly spaced points of gridFor up to
// top and the points around each knee current, in increasing order. The first point stays
// gridFor's −2h (curveOnGrid continues the even points from it).
func appendGrid(dst []float64, top float64, knees []float64, w float64) []float64 {
	i0, h := gridFor(top)
	start := len(dst)
	for k := range curvePoints {
		dst = append(dst, i0+float64(k)*h)
	}
	if len(knees) == 0 {
		return dst
	}
	for _, ik := range knees {
		for _, r := range kneeBelow {
			dst = append(dst, ik*(1-r*w))
		}
		for _, r := range kneeAbove {
			dst = append(dst, ik*(1+r*w))
		}
	}
	g := dst[start:]
	slices.Sort(g)
	// Knee points lie below top (a knee is at most the brightest cells' light current,
	// top is 4 % above it). Drop points within a millionth of top of the one before: they
	// add nothing the polyline needs.
	tol := 1e-6 * top
	out := g[:1]
	for _, x := range g[1:] {
		if x-out[len(out)-1] > tol {
			out = append(out, x)
		}
	}
	return dst[:start+len(out)]
}

// curveScratch is reusable working space for curveOnGrid.
type curveScratch struct {
	vals   []float64 // distinct irradiance values
	ucnt   []int     // [u][2·substring + half] cell counts
	cellOf []int32   // distinct value → its cell curve in cells
	cnt    []int     // [sub][half][u] cell counts
	terms  []cellTerm
	toff   []int       // [sub][half] → its terms are terms[toff[i]:toff[i+1]]
	subV   [][]float64 // per substring: its voltage on the module grid
	subOf  []int       // per substring: the first substring lit alike, whose subV it takes
	hs     [2]halfSums // halvesOnGrid's two halves
	m      merger
	out    []float64 // Curve's module voltages
	knees  []float64 // Curve's knee currents (A)
	grid   []float64 // Curve's current grid (A)

	// The cell curves on the grid of the last call, kept while the module and the grid
	// stay the same (curveOnGrid compares them): curves of one step share their grid, and
	// cells with the same irradiance and temperature in different modules the same curve.
	mod     *Module
	gridCur []float64            // the grid (A)
	hc      []float64            // cell current grid of a half-cut module (A)
	cells   []cellGrid           // cell curves computed so far on this grid
	bufs    [][]float64          // backing store of cells[k].v
	cellKey map[[2]float64]int32 // (irradiance, temperature) → index into cells
	// sameGrid is set by a caller that knows the next call's grid to be the last call's
	// (NewYear: a step's curves share it), sparing curveOnGrid the comparison; the call
	// clears it.
	sameGrid bool
}

// cellTerm is c cells alike, with curve g, in series.
type cellTerm struct {
	g *cellGrid
	c float64
}

// sumTerms returns the voltage of the cells of ts in series at point k of their grid.
func sumTerms(ts []cellTerm, k int) float64 {
	if len(ts) == 1 {
		return 0 + ts[0].c*ts[0].g.at(k) // as the loop adds it: −0 becomes 0
	}
	var sum float64
	for _, t := range ts {
		sum += t.c * t.g.at(k)
	}
	return sum
}

// halfSums is one half of a substring: its cells' voltage on the half grid, computed on
// demand in increasing points.
type halfSums struct {
	terms []cellTerm
	v     []float64 // points 0..done−1
	done  int
}

// at returns the half's voltage at point j.
func (h *halfSums) at(j int) float64 {
	if h.done <= j {
		h.fill(j)
	}
	return h.v[j]
}

// fill computes the half's points up to j.
func (h *halfSums) fill(j int) {
	for ; h.done <= j; h.done++ {
		h.v[h.done] = sumTerms(h.terms, h.done)
	}
}

// cellGridFor returns the index in sc.cells of the curve of a cell at irradiance s and
// temperature tempC on the current grid cc, starting it if it is new.
func (m *Module) cellGridFor(sc *curveScratch, s, tempC float64, cc []float64) int32 {
	key := [2]float64{s, tempC}
	if k, ok := sc.cellKey[key]; ok {
		return k
	}
	k := int32(len(sc.cellKey))
	if int(k) == len(sc.cells) {
		sc.cells = append(sc.cells, cellGrid{})
		sc.bufs = append(sc.bufs, nil)
	}
	sc.bufs[k] = grow(sc.bufs[k], len(cc))
	sc.cells[k].reset(translate(m.cell, m.alphaCell, s, tempC), cc, sc.bufs[k])
	sc.cellKey[key] = k
	return k
}

// curveOnGrid writes the module voltage at currents cur[k] (a grid from appendGrid, len(v)
// points) into v. Cells
// with equal irradiance share one cell curve, so a module costs at most one
// Lambert-W evaluation per distinct irradiance and grid point; points are
// computed on demand, and a substring stops asking once its bypass diode
// conducts (every cell's voltage falls with current, so the substring stays
// bypassed at every higher current). The cell curves are kept in sc for the next
// call on the same module and grid, and substrings lit alike are computed once.
func (m *Module) curveOnGrid(cellIrr []float64, tempC float64, cur []float64, v []float64, sc *curveScratch) {
	n := len(v)
	same := sc.sameGrid && sc.mod == m && len(sc.gridCur) == n
	sc.sameGrid = false
	if !same && (sc.mod != m || !slices.Equal(sc.gridCur, cur)) {
		sc.mod = m
		// A copy: the cell curves keep reading their grid, and the caller may reuse cur.
		sc.gridCur = append(sc.gridCur[:0], cur...)
		if sc.cellKey == nil {
			sc.cellKey = map[[2]float64]int32{}
		}
		clear(sc.cellKey)
		// Cell current on the grid: the module current for full cells; for half-cells
		// half the module current at points k < n, and beyond, up to twice the top (one
		// half may carry nearly all of the module current), the even points continued:
		// the grid starts at −2h and ends on an even point.
		if m.half {
			sc.hc = grow(sc.hc, 2*n)
			for k, x := range cur {
				sc.hc[k] = x / 2
			}
			i0 := cur[0]
			h := -i0 / 2
			last := math.Round((cur[n-1]-i0)/h) - float64(n-1) // index of the last even point, less n−1
			for j := n; j < 2*n; j++ {
				sc.hc[j] = (i0 + (float64(j)+last)*h) / 2
			}
		}
	}
	cc := sc.gridCur
	if m.half {
		cc = sc.hc
	}
	// Distinct values in order of first appearance, and the cells of each in each slot
	// (2·substring + half), counted value by value in one pass over the cells.
	ns := 2 * m.nSub
	sc.vals = sc.vals[:0]
	sc.ucnt = sc.ucnt[:0]
	slot := m.slot[:len(cellIrr)]
	for c := 0; c < len(cellIrr); {
		s := cellIrr[c]
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
			for range ns {
				sc.ucnt = append(sc.ucnt, 0)
			}
		}
		// The run of cells equal to s.
		us := sc.vals[u]
		cnt := sc.ucnt[u*ns : (u+1)*ns]
		for ; c < len(cellIrr) && cellIrr[c] == us; c++ {
			cnt[slot[c]]++
		}
	}
	nu := len(sc.vals)
	sc.cellOf = sc.cellOf[:0]
	for _, s := range sc.vals {
		sc.cellOf = append(sc.cellOf, m.cellGridFor(sc, s, tempC, cc))
	}
	nh := 1
	if m.half {
		nh = 2
	}
	sc.cnt = slices.Grow(sc.cnt[:0], m.nSub*nh*nu)[:m.nSub*nh*nu]
	for s := range m.nSub {
		for h := range nh {
			for u := range nu {
				sc.cnt[(s*nh+h)*nu+u] = sc.ucnt[u*ns+2*s+h]
			}
		}
	}
	// Each substring's and half's cells, as counts of alike cells in order of value (the
	// pointers into sc.cells taken once it has stopped growing).
	sc.terms = sc.terms[:0]
	sc.toff = append(sc.toff[:0], 0)
	for i := range m.nSub * nh {
		for u, c := range sc.cnt[i*nu : (i+1)*nu] {
			if c != 0 {
				sc.terms = append(sc.terms, cellTerm{&sc.cells[sc.cellOf[u]], float64(c)})
			}
		}
		sc.toff = append(sc.toff, len(sc.terms))
	}
	for len(sc.subV) < m.nSub {
		sc.subV = append(sc.subV, nil)
	}
	sc.subOf = sc.subOf[:0]
subs:
	for s := range m.nSub {
		sc.subOf = append(sc.subOf, s)
		cs := sc.cnt[s*nh*nu : (s+1)*nh*nu]
		for r := range s {
			if slices.Equal(cs, sc.cnt[r*nh*nu:(r+1)*nh*nu]) {
				sc.subOf[s] = r
				continue subs
			}
		}
		sc.subV[s] = grow(sc.subV[s], n)
		sv := sc.subV[s]
		c0 := sc.cnt[s*nh*nu : (s*nh+1)*nu]
		if !m.half || equalInts(c0, sc.cnt[(s*nh+1)*nu:(s*nh+2)*nu]) {
			// Full cells, or two equal halves sharing the current evenly.
			ts := sc.terms[sc.toff[s*nh]:sc.toff[s*nh+1]]
			k := 0
			switch len(ts) {
			case 1:
				// One kind of cell (a substring lit evenly, the usual case): sumTerms
				// without the call a point.
				t := ts[0]
				for ; k < n; k++ {
					sum := 0 + t.c*t.g.at(k)
					if sum < -m.bypassV {
						break
					}
					sv[k] = sum
				}
			case 2:
				t, u := ts[0], ts[1]
				for ; k < n; k++ {
					sum := 0 + t.c*t.g.at(k) + u.c*u.g.at(k)
					if sum < -m.bypassV {
						break
					}
					sv[k] = sum
				}
			default:
				for ; k < n; k++ {
					sum := sumTerms(ts, k)
					if sum < -m.bypassV {
						break
					}
					sv[k] = sum
				}
			}
			for ; k < n; k++ {
				sv[k] = -m.bypassV
			}
			continue
		}
		m.halvesOnGrid(sc, sc.terms[sc.toff[s*nh]:sc.toff[s*nh+1]], sc.terms[sc.toff[s*nh+1]:sc.toff[s*nh+2]], cur, sv)
	}
	// The substrings in series: v = ((0 + first) + second) + …, point by point, three at a
	// pass for the usual three substrings.
	if so := sc.subOf; len(so) == 3 {
		a, b, c := sc.subV[so[0]][:n], sc.subV[so[1]][:n], sc.subV[so[2]][:n]
		for k := range v {
			v[k] = 0 + a[k] + b[k] + c[k]
		}
		return
	}
	clear(v)
	for _, r := range sc.subOf {
		for k, x := range sc.subV[r][:n] {
			v[k] += x
		}
	}
}

// halvesOnGrid writes into v the voltage of a substring whose two halves are
// lit differently (cells t0 and t1). Each half may
// carry more than half the module current, so its curve may reach up to
// twice the half grid (2n points). The halves are put in parallel by the
// merge of merger.parallel (breakpoints in descending voltage), run lazily:
// each half's points are computed as the merge reaches them, the module
// grid is read off as soon as the merged polyline passes each current, and
// the walk stops once every grid point is read or the substring is bypassed
// (the merged voltage, falling with current, is below −bypassV).
func (m *Module) halvesOnGrid(sc *curveScratch, t0, t1 []cellTerm, mcur []float64, v []float64) {
	n := len(v)
	hs := &sc.hs
	for hh, ts := range [2][]cellTerm{t0, t1} {
		hs[hh].terms = ts
		hs[hh].v = grow(hs[hh].v, 2*n)
		hs[hh].done = 0
	}
	cur := sc.hc[:2*n]
	// The merged polyline has at most one point per point of either half: room for all of
	// them, written by index (no append a point).
	sc.m.oi, sc.m.ov = grow(sc.m.oi, 4*n), grow(sc.m.ov, 4*n)
	oi, ov := sc.m.oi[:4*n], sc.m.ov[:4*n]
	no := 0 // merged points so far
	// Per half: the next unvisited point kk, its voltage nx (computed when the walk goes on
	// with kk below 2n) and the voltage of the point before it, pv.
	var kk [2]int
	var nx, pv [2]float64
	nx[0], nx[1] = hs[0].at(0), hs[1].at(0)
	k, hint := 0, 0
	for k < n {
		best, bv := -1, math.Inf(-1)
		if kk[0] < 2*n && nx[0] > bv {
			best, bv = 0, nx[0]
		}
		if kk[1] < 2*n && nx[1] > bv {
			best, bv = 1, nx[1]
		}
		if best < 0 {
			break
		}
		// The other half's current at bv (currentOn with its next unvisited point j).
		o := 1 - best
		var io float64
		switch j := kk[o]; {
		case j == 0:
			h := &hs[o]
			dv := h.at(1) - nx[o]
			if dv == 0 {
				io = cur[0]
			} else {
				io = cur[0] + (bv-nx[o])*(cur[1]-cur[0])/dv
			}
		case j >= 2*n:
			io = cur[2*n-1]
		default:
			dv := nx[o] - pv[o]
			if dv == 0 {
				io = cur[j-1]
			} else {
				io = cur[j-1] + (bv-pv[o])*(cur[j]-cur[j-1])/dv
			}
		}
		tot := cur[kk[best]] + io
		oi[no], ov[no] = tot, bv
		no++
		pv[best] = bv
		kk[best]++
		if no < 2 {
			if kk[best] < 2*n {
				nx[best] = hs[best].at(kk[best])
			}
			continue
		}
		for ; k < n; k++ {
			x := mcur[k]
			if x > tot {
				break
			}
			// voltageOn(oi[:no], ov[:no], x, hint) written out (no ≥ 2): it is asked once
			// a grid point of every substring whose halves differ.
			var vk float64
			switch {
			case x <= oi[0]:
				vk, hint = ov[0]+(x-oi[0])*slope(oi[0], ov[0], oi[1], ov[1]), 0
			case x >= oi[no-1]:
				vk, hint = ov[no-1], no-2
			default:
				j := max(min(hint, no-2), 0)
				for j > 0 && oi[j] > x {
					j--
				}
				for j < no-2 && oi[j+1] < x {
					j++
				}
				if di := oi[j+1] - oi[j]; di <= 0 {
					vk = ov[j+1]
				} else {
					vk = ov[j] + (x-oi[j])*(ov[j+1]-ov[j])/di
				}
				hint = j
			}
			v[k] = fmax(vk, -m.bypassV)
		}
		if bv < -m.bypassV {
			for ; k < n; k++ {
				v[k] = -m.bypassV
			}
		}
		if k < n && kk[best] < 2*n {
			// hs[best].at(kk[best]) written out: the merge asks for each point once, one
			// call a point (sumTerms) instead of two.
			h, j := &hs[best], kk[best]
			switch len(h.terms) {
			case 1:
				t := h.terms[0] // sumTerms written out
				for ; h.done <= j; h.done++ {
					h.v[h.done] = 0 + t.c*t.g.at(h.done)
				}
			case 2:
				t, u := h.terms[0], h.terms[1]
				for ; h.done <= j; h.done++ {
					h.v[h.done] = 0 + t.c*t.g.at(h.done) + u.c*u.g.at(h.done)
				}
			default:
				for ; h.done <= j; h.done++ {
					h.v[h.done] = sumTerms(h.terms, h.done)
				}
			}
			nx[best] = h.v[j]
		}
	}
	for ; k < n; k++ {
		var vk float64
		vk, hint = voltageOn(oi[:no], ov[:no], mcur[k], hint)
		v[k] = fmax(vk, -m.bypassV)
	}
}

// uniformMaxPower returns the maximum power (W) of the module's polyline
// curve with every cell at irradiance sWPerM2 and temperature tempC, on the
// grid Curve would use: the same value as polyMax on curveOnGrid's points,
// from a handful of points. With equal cells no bypass diode conducts while
// the voltage is positive, so V(I) is N times one cell's voltage, concave
// (V = d·Rsh − I·Rs − A·W(e^L) with W convex in L and L affine in I), and
// P = I·V is concave for I ≥ 0. The grid points' powers then rise to one
// peak and fall, so a climb from the datasheet's Imp/Isc finds the peak
// point; and the polyline, which lies below the concave curve, can beat that
// point only on its two adjacent segments, which polyMax then searches
// exactly.
func (m *Module) uniformMaxPower(sWPerM2, tempC float64, sc *curveScratch) float64 {
	p := translate(m.cell, m.alphaCell, sWPerM2, tempC)
	i0, h := gridFor(m.topCurrentAt(p.IL))
	ci0, ch := i0, h
	if m.half {
		ci0, ch = i0/2, h/2
	}
	sc.out = grow(sc.out, curvePoints)
	vc := sc.out
	for k := range vc {
		vc[k] = math.NaN()
	}
	c0 := math.Log(p.I0 * p.Rsh / p.A)
	var lastL, lastW float64
	have := false
	// vcell returns the cell voltage at point k, warm-starting W from the
	// point computed last (the climb moves one point at a time).
	vcell := func(k int) float64 {
		if v := vc[k]; !math.IsNaN(v) {
			return v
		}
		i := ci0 + float64(k)*ch
		d := p.IL + p.I0 - i
		L := c0 + d*p.Rsh/p.A
		var w float64
		if have {
			w = lambertWExpNear(L, lastL, lastW)
		} else {
			w = lambertWExp(L)
		}
		lastL, lastW, have = L, w, true
		vc[k] = d*p.Rsh - i*p.Rs - p.A*w
		return vc[k]
	}
	vmod := func(k int) float64 {
		v := vcell(k)
		var sum float64
		for _, c := range m.subCells {
			sum += fmax(float64(c)*v, -m.bypassV)
		}
		return sum
	}
	pw := func(k int) float64 { return (i0 + float64(k)*h) * vmod(k) }
	// Point 2 is zero current, the light current lies near point
	// 2 + (curvePoints−3)/1.04; start where the datasheet's Imp/Isc puts
	// the maximum.
	frac := 0.9
	if m.ds.IscA > 0 {
		frac = m.ds.ImpA / m.ds.IscA
	}
	k := min(max(2+int(frac*(curvePoints-3)/1.04), 2), curvePoints-2)
	for k+1 < curvePoints && pw(k+1) > pw(k) {
		k++
	}
	for k > 2 && pw(k-1) > pw(k) {
		k--
	}
	a, b := max(k-1, 0), min(k+1, curvePoints-1)
	var is, vs [3]float64
	for j := a; j <= b; j++ {
		is[j-a], vs[j-a] = i0+float64(j)*h, vmod(j)
	}
	pm, _, _ := polyMax(is[:b-a+1], vs[:b-a+1], 0, math.Inf(1), math.Inf(1))
	return pm
}

func grow(s []float64, n int) []float64 {
	if cap(s) < n {
		return make([]float64, n)
	}
	return s[:n]
}

func equalInts(a, b []int) bool {
	for k := range a {
		if a[k] != b[k] {
			return false
		}
	}
	return true
}
