package electric

import (
	"cmp"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"sunstring/yield/internal/bigmem"
)

// Layout wires modules to an inverter: input → strings → module indices
// (0-based, as the Year numbers them). Strings on one input are in
// parallel; modules in a string are in series.
type Layout struct{ Inputs [][][]int }

// StepInput is what the caller supplies for one time step. NewYear hands
// the same value to every call with CellIrr[m] already sized to the module's
// cell count and everything zeroed, so a caller fills it in place.
type StepInput struct {
	CellIrr [][]float64 // per module: effective irradiance per cell (W/m²)
	// Even, per module, says that all its cells take CellIrr[m][0]: the other cells are
	// then not read, so a step function need not write them. Most modules of a large roof
	// are lit evenly at most steps (no shade on them); the year is the same as with every
	// cell set to that value.
	Even        []bool
	TempC       []float64 // per module: cell temperature (°C)
	UnshadedIrr []float64 // per module: effective irradiance were no cell shaded (W/m²)
	Hours       float64   // length of the step (h); zero means 1 h
}

// Tracker chooses how an input's operating point is found.
type Tracker int

const (
	// GlobalMPP finds the global maximum of the input's P-V curve inside the
	// MPPT window (an ideal scanning tracker). It is the zero value.
	GlobalMPP Tracker = iota
	// LocalClimb climbs from the previous step's voltage to the nearest
	// local maximum and may stay there (a plain hill-climbing tracker). It
	// restarts from 80 % of the input's open-circuit voltage after a step
	// without power.
	LocalClimb
)

// EvalOptions selects the tracker and module-level electronics. The zero
// value is a global tracker on string inverters.
type EvalOptions struct {
	Tracker Tracker
	// ModuleLevel reports whether each module has its own converter that
	// holds it at its own maximum; the inverter's window and current limit
	// are then left to the converters and only its AC stage applies.
	ModuleLevel bool
	// ModuleLevelEff is the converters' efficiency (0..1]; zero means 0.985
	// (common practice for module-level DC converters).
	ModuleLevelEff float64
	// NightHours is the time without sun-up steps (h) over which the
	// inverter's night consumption is counted; zero means 8760 h minus the
	// steps' hours, negative means none.
	NightHours float64
	// DCKeep is the share of the DC power that reaches the inverter after flat
	// DC losses (module tolerance mismatch, cable resistance), in (0, 1];
	// zero means 1. It is applied before the inverter's efficiency and limits,
	// so that clipping acts on what arrives.
	DCKeep float64
	// ConvertersOn lists modules that are not in the layout's strings but
	// have a converter of their own (efficiency ModuleLevelEff) feeding the
	// inverter at their own maximum power, as module-level converters on an
	// input of their own or microinverters do. With ModuleLevel it is
	// ignored: every module of the layout has one.
	ConvertersOn []int
}

// YearResult sums a layout's energy over all steps. DC energies are at the
// strings' operating points, before EvalOptions.DCKeep (the inverter receives
// DCWh·DCKeep); ACWh is gross of the night consumption NightWh.
type YearResult struct {
	DCWh, ACWh, ClippedWh float64
	// GlobalDCWh is the DC energy at each input's unconstrained global
	// maximum; WindowLossWh the part lost because that maximum lies outside
	// the MPPT window, CurrentLimitLossWh the part lost to the input current
	// limit, TrackerLossWh the part lost by a LocalClimb tracker stuck on a
	// local maximum. GlobalDCWh − the three = DCWh for string inverters.
	GlobalDCWh, WindowLossWh, CurrentLimitLossWh, TrackerLossWh float64
	NightWh                                                     float64
	// UnshadedDCWh is the same modules' DC energy with no cell shaded, each
	// at its own maximum; UnshadedACWh that energy through the same
	// inverter (AC stage only). They are the reference for shade loss.
	UnshadedDCWh, UnshadedACWh float64
	StepACWh                   []float64 // per step
	// StepDCWh is the DC energy at the operating points per step, before DCKeep.
	StepDCWh []float64
}

// Year holds, for every time step, the I-V curve of every module, computed
// once and shared between modules with identical irradiance and temperature.
// Evaluating a layout only adds curves, so a layout search can call Evaluate
// many times. A Year is read-only after NewYear and safe for concurrent use.
type Year struct {
	m          *Module
	n, steps   int
	gridOff    []int32   // per step and one more: the step's points are gridI[gridOff[s]:gridOff[s+1]]
	gridI      []float64 // every step's current grid (A), shared by its curves
	curveV     [][]int32 // blocks of at most curveBlockLen voltages (units of voltQuantum); a curve lies in one block
	curveAt    []int64   // per curve: block·curveBlockLen + offset of its first voltage
	curveMPP   []float32 // per curve: module maximum power (W)
	modCurve   []int32   // steps × n: curve index
	unshadedW  []float32 // steps × n: unshaded module maximum power (W)
	hours      []float32 // per step (h)
	moduleDCWh []float64 // per module over the year
	moduleUnWh []float64
	// thin is the last year Thin made from this one: an input's share of it, kept in an
	// EvalCache, is this year's share at every stride-th step (see inputJob.thin). stride is,
	// for a year Thin made, its k.
	thin   atomic.Pointer[Year]
	stride int
}

// NewYear calls step for s = 0..steps−1 and computes each module's curve at
// every step. Irradiance must lie in 0..MaxIrradiance and temperatures in
// MinCellTempC..MaxCellTempC; a bad value is reported with its step and module, wrapping
// ErrOutOfModel (the caller's fault, not the user's).
//
// step is called in step order from the calling goroutine. NewYear copies
// each step's input and builds the curves of a batch of steps on
// GOMAXPROCS goroutines while step fills the next batch; the result does not
// depend on the number of goroutines.
func NewYear(m *Module, nModules, steps int, step func(s int, dst *StepInput)) (*Year, error) {
	return NewYearWith(m, nModules, steps, step, YearOptions{})
}

// NewYearExact is NewYear with every curve built from the exact inputs, shared only between
// modules whose inputs are equal to the bit: the reference the rounded sharing of NewYear is
// held to (see IrradianceBits), at several times the cost on a large roof.
func NewYearExact(m *Module, nModules, steps int, step func(s int, dst *StepInput)) (*Year, error) {
	return NewYearWith(m, nModules, steps, step, YearOptions{Exact: true})
}

// YearOptions chooses how NewYearWith builds a year.
type YearOptions struct {
	// Exact builds every curve from the exact inputs, as NewYearExact.
	Exact bool
	// ConcurrentSteps lets NewYearWith call step from several goroutines at once, for steps
	// in any order, each call with a dst of its own: for a step function without state of its
	// own (one that only reads what it was given), whose steps are then filled on all cores.
	ConcurrentSteps bool
}

// NewYearWith is NewYear with options. The year is the same whatever ConcurrentSteps says.
func NewYearWith(m *Module, nModules, steps int, step func(s int, dst *StepInput), opt YearOptions) (*Year, error) {
	return newYear(m, nModules, steps, step, opt)
}

func newYear(m *Module, nModules, steps int, step func(s int, dst *StepInput), opt YearOptions) (*Year, error) {
	exact := opt.Exact
	if m == nil || nModules < 0 || steps < 0 || step == nil {
		return nil, fmt.Errorf("electric: NewYear needs a module, a step function and non-negative counts")
	}
	nc := m.Cells()
	y := &Year{
		m: m, n: nModules, steps: steps,
		gridOff:  make([]int32, 1, steps+1),
		modCurve: bigmem.Make[int32](steps * nModules), unshadedW: bigmem.Make[float32](steps * nModules),
		hours:      make([]float32, steps),
		moduleDCWh: make([]float64, nModules), moduleUnWh: make([]float64, nModules),
	}
	in := newStepInput(nModules, nc)
	workers := runtime.GOMAXPROCS(0)
	ws := make([]yearWorker, workers)
	for w := range ws {
		ws[w].exact = exact
	}
	var batches [2]yearBatch
	var pending *yearBatch
	cur := 0
	for first := 0; first < steps; {
		b := &batches[cur]
		b.reset(first, min(yearBatchSteps, steps-first), nModules, nc)
		b.fill = nil
		if opt.ConcurrentSteps {
			// The workers take the steps themselves (see yearWorker.take).
			b.fill, b.round = step, !exact
			if pending != nil {
				pending.wg.Wait()
				if err := y.mergeTaken(pending); err != nil {
					return nil, err
				}
			}
			b.start(m, ws)
			pending = b
			cur ^= 1
			first += b.count
			continue
		}
		for j := range b.count {
			s := first + j
			in.zero()
			step(s, in)
			h, err := b.takeStep(m, in, s, j, !exact)
			if err != nil {
				if pending != nil {
					pending.wg.Wait()
				}
				return nil, err
			}
			y.hours[s] = float32(h)
			b.hours[j] = h
			copy(b.temp[j*nModules:], in.TempC)
			copy(b.un[j*nModules:], in.UnshadedIrr)
		}
		if pending != nil {
			pending.wg.Wait()
			y.merge(pending)
		}
		b.start(m, ws)
		pending = b
		cur ^= 1
		first += b.count
	}
	if pending != nil {
		pending.wg.Wait()
		if err := y.mergeTaken(pending); err != nil {
			return nil, err
		}
	}
	return y, nil
}

// mergeTaken is merge for a batch whose steps the workers took (YearOptions.ConcurrentSteps):
// the first bad step, in step order, is the error; the steps' hours go to the year.
func (y *Year) mergeTaken(b *yearBatch) error {
	if b.fill != nil {
		for j := range b.count {
			if err := b.errs[j]; err != nil {
				return err
			}
			y.hours[b.first+j] = float32(b.hours[j])
		}
	}
	y.merge(b)
	return nil
}

// newStepInput returns a zeroed step input for n modules of nc cells.
func newStepInput(n, nc int) *StepInput {
	in := &StepInput{CellIrr: make([][]float64, n), Even: make([]bool, n), TempC: make([]float64, n), UnshadedIrr: make([]float64, n)}
	for k := range in.CellIrr {
		in.CellIrr[k] = make([]float64, nc)
	}
	return in
}

// zero zeroes the input for the next call of the step function.
func (in *StepInput) zero() {
	for k := range in.CellIrr {
		clear(in.CellIrr[k])
	}
	clear(in.Even)
	clear(in.TempC)
	clear(in.UnshadedIrr)
	in.Hours = 0
}

// yearBatchSteps is the number of steps NewYear copies before building their
// curves: enough to share out among goroutines, small enough to keep the
// copies (steps × modules × cells × 8 bytes) a few megabytes.
const yearBatchSteps = 16

// takeStep validates step s's input and keeps it as the batch's step j: each module's cell
// irradiances rounded (roundCellsHash; as they are if round is false), with their hash,
// brightest value and number of runs. It returns the step's length in hours. Checking and
// rounding go together, a value at a time only where it changes: one pass over the cells
// while the step function's output is still in the cache.
func (b *yearBatch) takeStep(m *Module, in *StepInput, s, j int, round bool) (float64, error) {
	n, nc := b.n, b.nc
	if len(in.CellIrr) != n || len(in.Even) != n || len(in.TempC) != n || len(in.UnshadedIrr) != n {
		return 0, outOfModelf(fmt.Sprintf("step %d", s), "per-module slices must keep length %d", n)
	}
	h := in.Hours
	if h == 0 {
		h = 1
	}
	if !(h > 0) || h > 24*31 {
		return 0, outOfModelf(fmt.Sprintf("step %d: hours", s), "%g must lie in (0, 744]", in.Hours)
	}
	for k := range n {
		ci, t := in.CellIrr[k], in.TempC[k]
		i := j*n + k
		even := in.Even[k]
		b.even[i] = even
		ok := len(ci) == nc && t >= MinCellTempC && t <= MaxCellTempC
		if ok {
			if even {
				// The first cell only: build fills in the others where it reads them.
				b.hash[i], b.smax[i], b.runs[i], ok = roundCellsHash(b.irr[i*nc:i*nc+1], ci[:1], round)
			} else {
				b.hash[i], b.smax[i], b.runs[i], ok = roundCellsHash(b.irr[i*nc:(i+1)*nc], ci, round)
			}
		}
		if !ok {
			var err error
			if even && len(ci) == nc {
				err = checkValues(ci[:1], t)
			} else {
				err = m.CheckCells(ci, t)
			}
			if err != nil {
				return 0, fmt.Errorf("step %d, module %d: %w", s, k, err)
			}
		}
		if u := in.UnshadedIrr[k]; math.IsNaN(u) || u < 0 || u > MaxIrradiance {
			return 0, outOfModelf(fmt.Sprintf("step %d, module %d: unshaded_irradiance", s, k), "%g W/m² must lie in 0..%g", u, MaxIrradiance)
		}
	}
	return h, nil
}

// yearBatch is a run of steps' copied inputs and, once built, their curves.
type yearBatch struct {
	first, count int
	n, nc        int
	irr          []float64 // count × n × nc: rounded cell irradiances (see takeStep)
	even         []bool    // count × n: the module is lit evenly, only its first irr is set
	hash         []uint64  // count × n: hash of the module's irr
	smax         []float64 // count × n: the module's brightest irr
	runs         []int     // count × n: the module's runs of equal irr
	temp, un     []float64 // count × n
	hours        []float64
	out          []stepCurves
	// fill, when set, is the step function the workers call themselves (with round: rounded
	// sharing), each step's error in errs.
	fill  func(s int, dst *StepInput)
	round bool
	errs  []error
	next  atomic.Int64
	wg    sync.WaitGroup
}

// stepCurves is one step's result with curve indices local to the step.
type stepCurves struct {
	grid []float64 // current grid (A)
	v    []int32   // local curves × len(grid), units of voltQuantum
	mpp  []float32 // per local curve
	mod  []int32   // per module: local curve
	unW  []float32 // per module: unshaded maximum power
}

func (b *yearBatch) reset(first, count, n, nc int) {
	b.first, b.count, b.n, b.nc = first, count, n, nc
	b.errs = append(b.errs[:0], make([]error, count)...)
	if cap(b.irr) < count*n*nc {
		b.irr = bigmem.Make[float64](count * n * nc) // 8 MiB for 16 steps of 437 modules
	}
	b.irr = b.irr[:count*n*nc]
	b.even = slices.Grow(b.even[:0], count*n)[:count*n]
	b.hash = slices.Grow(b.hash[:0], count*n)[:count*n]
	b.smax = slices.Grow(b.smax[:0], count*n)[:count*n]
	b.runs = slices.Grow(b.runs[:0], count*n)[:count*n]
	b.temp = slices.Grow(b.temp[:0], count*n)[:count*n]
	b.un = slices.Grow(b.un[:0], count*n)[:count*n]
	b.hours = slices.Grow(b.hours[:0], count)[:count]
	for len(b.out) < count {
		b.out = append(b.out, stepCurves{})
	}
}

// start builds the batch's curves on the workers; b.wg.Wait waits for them.
func (b *yearBatch) start(m *Module, ws []yearWorker) {
	b.next.Store(0)
	b.wg.Add(len(ws))
	for w := range ws {
		go func(w *yearWorker) {
			defer b.wg.Done()
			for {
				j := int(b.next.Add(1) - 1)
				if j >= b.count {
					return
				}
				if b.fill != nil {
					if b.errs[j] = w.take(m, b, j); b.errs[j] != nil {
						continue
					}
				}
				w.build(m, b, j)
			}
		}(&ws[w])
	}
}

// merge appends a built batch's curves to the year, in step order.
func (y *Year) merge(b *yearBatch) {
	// Room for the whole year at the rate of the steps so far (and of this batch), so that
	// the stores are not copied again and again as they grow.
	nc, np := 0, 0
	for j := range b.count {
		nc += len(b.out[j].mpp)
		np += len(b.out[j].grid)
	}
	done, left := b.first+b.count, y.steps-b.first
	y.curveMPP = reserve(y.curveMPP, nc, (len(y.curveMPP)+nc)*left/done)
	y.curveAt = reserve(y.curveAt, nc, (len(y.curveAt)+nc)*left/done)
	y.gridI = reserve(y.gridI, np, (len(y.gridI)+np)*left/done)
	for j := range b.count {
		s := b.first + j
		o := &b.out[j]
		h := b.hours[j]
		y.gridI = append(y.gridI, o.grid...)
		y.gridOff = append(y.gridOff, int32(len(y.gridI)))
		base := int32(len(y.curveMPP))
		y.adoptCurves(o.v, len(o.grid))
		o.v = nil // the year keeps it
		y.curveMPP = append(y.curveMPP, o.mpp...)
		for k := range y.n {
			c := o.mod[k]
			y.modCurve[s*y.n+k] = base + c
			y.moduleDCWh[k] += float64(o.mpp[c]) * h
			y.unshadedW[s*y.n+k] = o.unW[k]
			y.moduleUnWh[k] += float64(o.unW[k]) * h
		}
	}
}

// reserve returns s with room for n more elements; when it must grow, it makes room for
// more as well.
func reserve[T any](s []T, n, more int) []T {
	if len(s)+n <= cap(s) {
		return s
	}
	return slices.Grow(s, max(n, more))
}

// curveBlockLen is the most voltages in one block of Year.curveV (1024 curves of
// curvePoints): a block is one step's curves as its worker wrote them (see adoptCurves), and
// the store is never copied.
const curveBlockLen = 1024 * curvePoints

// voltQuantum is the unit the stored curves' voltages are counted in: 2⁻²⁰ V ≈ 0.95 µV, finer
// than a float32 voltage near 50 V (3.8 µV) and far below anything the energy notices
// (0.95 µV × 15 A ≈ 14 µW). Whole units add exactly and in any order, so a string's voltages
// can be built from a kept string by adding one module's curve and taking another's away
// (see stringYear) and give the same bits as adding the string up afresh.
const voltQuantum = 0x1p-20

// quantV returns v (V) in units of voltQuantum, held inside int32 (±2048 V, above any one
// module's voltage).
func quantV(v float64) int32 {
	var q [1]int32
	quantCurve(q[:], []float64{v})
	return q[0]
}

// quantCurve writes quantV of each voltage of v into q.
func quantCurve(q []int32, v []float64) {
	q = q[:len(v)]
	for k, y := range v {
		x := y / voltQuantum
		if !(x > math.MinInt32-0.5 && x < math.MaxInt32+0.5) {
			// Out of line, so that this loop keeps its state in registers.
			quantCurveHeld(q[k:], v[k:])
			return
		}
		q[k] = roundHalfAway(x)
	}
}

// quantCurveHeld is quantCurve from a voltage outside int32 on.
//
//go:noinline
func quantCurveHeld(q []int32, v []float64) {
	for k, y := range v {
		x := y / voltQuantum
		if !(x > math.MinInt32-0.5 && x < math.MaxInt32+0.5) {
			q[k] = quantVHeld(x)
			continue
		}
		q[k] = roundHalfAway(x)
	}
}

// roundHalfAway is math.Round (half away from zero) of x inside int32, by truncation (x − i
// is exact), without a branch the processor would guess wrong half the time.
func roundHalfAway(x float64) int32 {
	i := int64(x)
	f := x - float64(i)
	var up, down int64
	if f >= 0.5 {
		up = 1
	}
	if f <= -0.5 {
		down = 1
	}
	return int32(i + up - down)
}

// quantVHeld is quantV outside int32 (and for NaN).
func quantVHeld(x float64) int32 {
	return int32(math.Max(math.Min(math.Round(x), math.MaxInt32), math.MinInt32))
}

// adoptCurves takes a step's curves of np voltages each, v, into the store without copying
// them: v becomes one block, or several if it is longer than curveBlockLen, each a whole
// number of curves.
func (y *Year) adoptCurves(v []int32, np int) {
	per := curveBlockLen / np * np
	for len(v) > 0 {
		b := v[:min(per, len(v)):min(per, len(v))]
		v = v[len(b):]
		at := int64(len(y.curveV)) * curveBlockLen
		for k := 0; k < len(b); k += np {
			y.curveAt = append(y.curveAt, at+int64(k))
		}
		y.curveV = append(y.curveV, b)
	}
}

// curve returns curve c's n voltages on its step's grid, in units of voltQuantum.
func (y *Year) curve(c int32, n int) []int32 {
	at := y.curveAt[c]
	b, k := at/curveBlockLen, int(at%curveBlockLen)
	return y.curveV[b][k : k+n]
}

// grid returns step s's current grid (A).
func (y *Year) grid(s int) []float64 { return y.gridI[y.gridOff[s]:y.gridOff[s+1]] }

// take calls the batch's step function for step j with the worker's own input and takes the
// step into the batch, as newYear's loop does when it calls the step function itself.
func (w *yearWorker) take(m *Module, b *yearBatch, j int) error {
	n := b.n
	if w.in == nil || len(w.in.CellIrr) != n {
		w.in = newStepInput(n, b.nc)
	}
	in := w.in
	in.zero()
	s := b.first + j
	b.fill(s, in)
	h, err := b.takeStep(m, in, s, j, b.round)
	if err != nil {
		w.in = nil // perhaps resliced by the step function: the worker's next step gets a new one
		return err
	}
	b.hours[j] = h
	copy(b.temp[j*n:(j+1)*n], in.TempC)
	copy(b.un[j*n:(j+1)*n], in.UnshadedIrr)
	return nil
}

// yearWorker is one goroutine's working space.
type yearWorker struct {
	in    *StepInput // the worker's own step input (YearOptions.ConcurrentSteps)
	sc    curveScratch
	store curveStore // where the worker's curves are kept
	v     []float64
	knees []float64       // knee currents (A)
	kneeN map[float64]int // knee current → modules that have it
	qt    []float64       // n: quantised temperatures
	seen  map[uint64]int32
	repr  []int // local curve → module that defined it
	// curveKnees[kneeOff[c]:kneeOff[c+1]] are local curve c's knee currents (A).
	curveKnees []float64
	kneeOff    []int
	unSeen     map[[2]float64]float32
	exact      bool // no rounding (NewYearExact)
}

// Curves are shared between modules that see the same light: NewYear rounds each cell's
// irradiance to IrradianceBits significant bits (a relative step of 2⁻⁹ ≈ 0.2 %, so a value
// moves by at most 0.098 %) and each cell temperature to TempStepC (at most 0.05 K), and
// modules whose rounded inputs agree at a step get one curve, built from the rounded inputs.
// A module's maximum power moves by at most 1.1 × 0.098 % for the irradiance (power grows a
// little faster than irradiance, through the voltage's logarithm, at most 1.1 times as fast
// over 50–1200 W/m²) plus |γ| × 0.05 K ≤ 0.025 % for the temperature (|γ| ≤ 0.5 %/K), about
// 0.13 % at any step. The rounding goes either way from step to step and from module to
// module, so a year's energy moves far less: tested against unrounded inputs within 0.1 % a
// module (measured: 0.02 % at worst on the hall roof, 0.003 % on the example house) and
// 0.01 % a layout. Nine bits rather than ten let the modules of a large roof, whose views of
// the sky differ by a few tenths of a percent, share a fifth more of their curves; eight
// would share a third more, but move the example's hill-climbing tracker, whose path follows
// the curves' details, by 0.11 % a year.
const (
	IrradianceBits = 9
	TempStepC      = 0.1
)

// roundIrr rounds g ≥ 0 to IrradianceBits significant bits (round half up on the mantissa).
func roundIrr(g float64) float64 {
	const drop = 52 - IrradianceBits
	b := math.Float64bits(g)
	b = (b + 1<<(drop-1)) &^ (1<<drop - 1)
	return math.Float64frombits(b)
}

// roundTemp rounds a temperature to TempStepC.
func roundTemp(t float64) float64 { return math.Round(t/TempStepC) * TempStepC }

// roundCellsHash writes the cell irradiances irr into q, rounded (roundIrr) if round is set,
// and returns a hash of q, its largest value (at least 0), its number of runs of equal values
// and whether every value lies in 0..MaxIrradiance. The cells of one module usually take
// only two or three distinct values (lit, or shaded by one object), so a value is checked and
// rounded only where it changes, and the hash mixes only where q changes (position and
// value): equal q give equal hashes, and NewYear compares the values on a hash match, so
// collisions cost only time.
func roundCellsHash(q, irr []float64, round bool) (h uint64, qmax float64, runs int, ok bool) {
	h = 14695981039346656037
	var lastQ float64
	var lastBits uint64
	ok = true
	q = q[:len(irr)]
	for i := 0; i < len(irr); {
		g := irr[i]
		if !(g >= 0 && g <= MaxIrradiance) { // NaN too
			ok = false
		}
		x := g
		if round {
			x = roundIrr(g)
		}
		if b := math.Float64bits(x); runs == 0 || b != lastBits {
			h = hashMix(hashMix(h, uint64(i)), b)
			lastBits, lastQ = b, x
			runs++
			if x > qmax {
				qmax = x
			}
		}
		// The run of cells equal to g (to the bit without rounding).
		q[i] = lastQ
		i++
		if round {
			for i < len(irr) && irr[i] == g {
				q[i] = lastQ
				i++
			}
		} else {
			for i < len(irr) && math.Float64bits(irr[i]) == math.Float64bits(g) {
				q[i] = lastQ
				i++
			}
		}
	}
	return h, qmax, runs, ok
}

// hashMix mixes the 64-bit word x into the hash h (multiply and xor-shift).
func hashMix(h, x uint64) uint64 {
	h = (h ^ x) * 0x9E3779B97F4A7C15
	return h ^ h>>29
}

// build computes step j of batch b: one curve per distinct rounded module input on the step's
// common current grid, and each module's unshaded maximum. The grid is the even points up to
// the step's top current plus the points around the knee currents of its modules (see
// appendKnees): the maxKnees knees that the most modules share, so that every curve of the
// step keeps the same currents and strings still add voltages point by point.
func (w *yearWorker) build(m *Module, b *yearBatch, j int) {
	n, nc := b.n, b.nc
	if w.seen == nil {
		w.seen = map[uint64]int32{}
		w.unSeen = map[[2]float64]float32{}
		w.kneeN = map[float64]int{}
	}
	w.qt = slices.Grow(w.qt[:0], n)[:n]
	qirr := func(k int) []float64 { return b.irr[(j*n+k)*nc : (j*n+k+1)*nc] }
	// cells returns module k's cells, first setting all of them from the first if the
	// module is lit evenly (takeStep set only that one).
	cells := func(k int) []float64 {
		q := qirr(k)
		if b.even[j*n+k] {
			for c := range q {
				q[c] = q[0]
			}
		}
		return q
	}
	temp := b.temp[j*n : (j+1)*n]
	un := b.un[j*n : (j+1)*n]
	o := &b.out[j]
	o.mpp = o.mpp[:0]
	o.mod = slices.Grow(o.mod[:0], n)[:n]
	o.unW = slices.Grow(o.unW[:0], n)[:n]
	clear(w.seen)
	w.repr = w.repr[:0]
	w.kneeOff = append(w.kneeOff[:0], 0)
	w.curveKnees = w.curveKnees[:0]
	clear(w.kneeN)
	top := 0.0
	for k := range n {
		key, smax, runs := b.hash[j*n+k], b.smax[j*n+k], b.runs[j*n+k]
		if w.exact {
			w.qt[k] = temp[k]
		} else {
			w.qt[k] = roundTemp(temp[k])
		}
		key = hashMix(key, math.Float64bits(w.qt[k]))
		c, ok := w.seen[key]
		if ok {
			// Modules lit evenly (one run each) are equal if their first cells are.
			r := w.repr[c]
			if w.qt[r] != w.qt[k] || !(runs == 1 && b.runs[j*n+r] == 1 && qirr(r)[0] == qirr(k)[0] || slices.Equal(qirr(r), cells(k))) {
				ok = false // hash collision: give this module its own curve
			}
		}
		if !ok {
			// Modules sharing a curve share its top current too.
			top = math.Max(top, m.topCurrentAt(lightCurrent(m.cell.IL, m.alphaCell, smax, w.qt[k])))
			c = int32(len(w.repr))
			w.seen[key] = c
			w.repr = append(w.repr, k)
			full := cells(k) // every cell set: the knees and the curve read them
			// A module lit evenly has no knee (appendKnees finds none).
			if runs > 1 {
				w.curveKnees = m.appendKnees(w.curveKnees, full, w.qt[k])
			}
			w.kneeOff = append(w.kneeOff, len(w.curveKnees))
		}
		o.mod[k] = c
		for _, ik := range w.curveKnees[w.kneeOff[c]:w.kneeOff[c+1]] {
			w.kneeN[ik]++
		}
	}
	w.knees = w.knees[:0]
	for ik := range w.kneeN {
		w.knees = append(w.knees, ik)
	}
	// The most shared knees first, then by current: the choice depends only on the step.
	slices.SortFunc(w.knees, func(a, b float64) int {
		if c := cmp.Compare(w.kneeN[b], w.kneeN[a]); c != 0 {
			return c
		}
		return cmp.Compare(a, b)
	})
	w.knees = w.knees[:min(len(w.knees), maxKnees)]
	o.grid = appendGrid(o.grid[:0], top, w.knees, m.kneeW)
	np := len(o.grid)
	w.v = grow(w.v, np)
	// A slice of its own each step, cut from the worker's store: the Year keeps it as it is
	// (Year.adoptCurves).
	o.v = w.store.take(len(w.repr) * np)
	for c, r := range w.repr {
		w.sc.sameGrid = c > 0 // the step's curves share o.grid
		m.curveOnGrid(qirr(r), w.qt[r], o.grid, w.v, &w.sc)
		quantCurve(o.v[c*np:(c+1)*np], w.v)
		p, _, _ := polyMaxFree(o.grid, w.v)
		o.mpp = append(o.mpp, float32(p))
	}
	// Unshaded maxima, shared between modules with the same rounded irradiance and
	// temperature.
	clear(w.unSeen)
	var lastKey [2]float64
	var lastP float32
	for k := range n {
		key := [2]float64{un[k], w.qt[k]}
		if !w.exact {
			key[0] = roundIrr(key[0])
		}
		// Neighbouring modules mostly see the same sky: the last key first.
		if k > 0 && key == lastKey {
			o.unW[k] = lastP
			continue
		}
		p, ok := w.unSeen[key]
		if !ok {
			p = float32(m.uniformMaxPower(key[0], key[1], &w.sc))
			w.unSeen[key] = p
		}
		o.unW[k] = p
		lastKey, lastP = key, p
	}
}

// Modules returns the number of modules.
func (y *Year) Modules() int { return y.n }

// Steps returns the number of time steps.
func (y *Year) Steps() int { return y.steps }

// Curves returns the number of distinct module curves stored.
func (y *Year) Curves() int { return len(y.curveMPP) }

// ModuleDCWh returns each module's DC energy at its own maximum (Wh), as
// module-level electronics would harvest it before conversion losses.
func (y *Year) ModuleDCWh() []float64 { return slices.Clone(y.moduleDCWh) }

// ModuleUnshadedDCWh returns each module's DC energy had no cell been
// shaded (Wh).
func (y *Year) ModuleUnshadedDCWh() []float64 { return slices.Clone(y.moduleUnWh) }

// CheckLayout reports whether the layout fits the year and the inverter:
// module indices in range and used once, no empty string, at most
// inv.Inputs inputs.
func (y *Year) CheckLayout(l Layout, inv Inverter) error {
	if len(l.Inputs) > inv.Inputs {
		return badf("layout.inputs", "%d inputs, the inverter has %d", len(l.Inputs), inv.Inputs)
	}
	used := make([]bool, y.n)
	for a, in := range l.Inputs {
		for b, str := range in {
			if len(str) == 0 {
				return badf(fmt.Sprintf("layout.inputs[%d][%d]", a, b), "empty string")
			}
			for _, k := range str {
				if k < 0 || k >= y.n {
					return badf(fmt.Sprintf("layout.inputs[%d][%d]", a, b), "module %d out of range 0..%d", k, y.n-1)
				}
				if used[k] {
					return badf(fmt.Sprintf("layout.inputs[%d][%d]", a, b), "module %d used twice", k)
				}
				used[k] = true
			}
		}
	}
	return nil
}

// evalScratch is per-call working space.
type evalScratch struct {
	pairs [][]curveCount // per string of an input
	delta []curveCount   // addNear's curves in and out
	isums [][]int64      // per string: voltage sums on the step grid (voltQuantum)
	src   [][]int64      // per string: its sums (isums)
	sums  [][]float64    // per string: the same in volts
	is    [][]float64
	gi    []float64
	gs    []float64 // grid scaled for identical parallel strings
	m     merger
}

type curveCount struct{ c, n int32 }

// Evaluate returns the year's energy for a layout on an inverter. The
// inverter and the layout are checked first (CheckLayout). The result does
// not depend on the order of inputs, of strings on an input or of modules in
// a string.
func (y *Year) Evaluate(l Layout, inv Inverter, opt EvalOptions) (YearResult, error) {
	return y.EvaluateCached(l, inv, opt, nil)
}

// EvaluateCached is Evaluate with a cache of each input's share of the year
// (see EvalCache): an input already seen in an earlier layout, with the same
// strings, inverter and options, is not computed again. The result is the
// same as Evaluate's to the bit. A nil cache computes everything.
func (y *Year) EvaluateCached(l Layout, inv Inverter, opt EvalOptions, c *EvalCache) (YearResult, error) {
	if err := inv.Validate(); err != nil {
		return YearResult{}, err
	}
	if err := y.CheckLayout(l, inv); err != nil {
		return YearResult{}, err
	}
	eff := opt.ModuleLevelEff
	if eff == 0 {
		eff = 0.985
	}
	if (opt.ModuleLevel || len(opt.ConvertersOn) > 0) && !(eff > 0 && eff <= 1) {
		return YearResult{}, outOfModelf("module_level_eff", "%g must lie in (0, 1]", opt.ModuleLevelEff)
	}
	if err := y.checkConverters(l, opt.ConvertersOn); err != nil {
		return YearResult{}, err
	}
	keep := opt.DCKeep
	if keep == 0 {
		keep = 1
	}
	if !(keep > 0 && keep <= 1) {
		return YearResult{}, outOfModelf("dc_keep", "%g must lie in (0, 1]", opt.DCKeep)
	}
	opt.ModuleLevelEff = eff
	parts := y.parts(l, inv, opt, c)
	res := YearResult{StepACWh: make([]float64, y.steps), StepDCWh: make([]float64, y.steps)}
	for _, pt := range parts {
		res.GlobalDCWh += pt.globalWh
		res.WindowLossWh += pt.windowWh
		res.CurrentLimitLossWh += pt.currentWh
		res.TrackerLossWh += pt.trackerWh
	}
	night := inv.nightW()
	sumHours := 0.0
	for s := range y.steps {
		h := float64(y.hours[s])
		sumHours += h
		var dc, dcV, dcWithV, unDC float64
		for _, pt := range parts {
			dc += pt.p[s]
			unDC += pt.un[s]
			if pt.volts {
				dcV += pt.pv[s]
				dcWithV += pt.p[s]
			}
		}
		// The inverter's efficiency follows the power-weighted voltage of the
		// inputs that have one (module-level converters set their own).
		if dcWithV > 0 && dcV > 0 {
			dcV /= dcWithV
		} else {
			dcV = 0
		}
		res.DCWh += dc * h
		res.StepDCWh[s] = dc * h
		dc *= keep
		unDC *= keep
		ac, clip := inv.ACPowerAt(dc, dcV)
		unAC, _ := inv.ACPower(unDC)
		res.ACWh += ac * h
		res.ClippedWh += clip * h
		res.StepACWh[s] = ac * h
		res.UnshadedDCWh += unDC * h
		res.UnshadedACWh += unAC * h
		if ac <= 0 {
			res.NightWh += night * h
		}
	}
	nh := opt.NightHours
	if nh == 0 {
		nh = math.Max(8760-sumHours, 0)
	}
	if nh > 0 {
		res.NightWh += night * nh
	}
	return res, nil
}

// stringSums puts the voltages of the strings of one input at step s, on the step's grid
// sc.gi, into sc.sums[:ns], and reports whether they are all the same; then only sc.sums[0]
// is set. A string with a recipe (strs[b], see stringYear) is read from a kept year of
// voltages, plus and less a module; any other is added up here, modules sharing a curve as
// count × curve.
func (y *Year) stringSums(sc *evalScratch, s int, in [][]int, strs []stringRecipe) (ns int, same bool) {
	ns = len(in)
	for len(sc.pairs) < ns {
		sc.pairs = append(sc.pairs, nil)
		sc.isums = append(sc.isums, nil)
		sc.src = append(sc.src, nil)
		sc.sums = append(sc.sums, nil)
		sc.is = append(sc.is, nil)
	}
	np := len(sc.gi)
	row := s * y.n
	off := int(y.gridOff[s])
	for b, str := range in {
		if strs != nil && strs[b].v != nil {
			r := strs[b]
			pv := r.v[off : off+np]
			sc.isums[b] = growInt64(sc.isums[b], np)
			if r.add < 0 && r.sub < 0 {
				widen(sc.isums[b], pv) // a kept string as it is
				sc.src[b] = sc.isums[b]
				continue
			}
			var add, sub []int32
			if r.add >= 0 {
				add = y.curve(y.modCurve[row+r.add], np)
			}
			if r.sub >= 0 {
				sub = y.curve(y.modCurve[row+r.sub], np)
			}
			plusMinus(sc.isums[b], pv, add, sub)
			sc.src[b] = sc.isums[b]
			continue
		}
		sc.isums[b] = growInt64(sc.isums[b], np)
		if strs != nil && strs[b].near != nil {
			sc.pairs[b], sc.delta = y.addNear(sc.isums[b], off, row, str, strs[b].near, sc.pairs[b], sc.delta)
		} else {
			clear(sc.isums[b])
			sc.pairs[b] = y.addString(sc.isums[b], row, str, sc.pairs[b])
		}
		sc.src[b] = sc.isums[b]
	}
	same = true
	for b := 1; b < ns && same; b++ {
		same = slices.Equal(sc.src[b], sc.src[0])
	}
	last := ns
	if same {
		last = 1
	}
	for b := range last {
		sc.sums[b] = grow(sc.sums[b], np)
		sum := sc.sums[b][:np]
		for k, x := range sc.src[b][:np] {
			sum[k] = float64(x) * voltQuantum
		}
		sc.is[b] = sc.gi
	}
	return ns, same
}

// inputPolyline returns the polyline (current, voltage) of the strings stringSums put in sc in
// parallel. Identical strings in parallel scale the current.
func (sc *evalScratch) inputPolyline(ns int, same bool) ([]float64, []float64) {
	if same {
		if ns == 1 {
			return sc.gi, sc.sums[0]
		}
		sc.gs = grow(sc.gs, len(sc.gi))
		for k, x := range sc.gi {
			sc.gs[k] = x * float64(ns)
		}
		return sc.gs, sc.sums[0]
	}
	return sc.m.parallel(sc.is[:ns], sc.sums[:ns])
}

// widen writes the kept voltages v into sum.
func widen(sum []int64, v []int32) {
	v = v[:len(sum)]
	for k, x := range v {
		sum[k] = int64(x)
	}
}

// plusMinus writes pv plus the curve add less the curve sub (either may be nil) into dst, in
// units of voltQuantum: one pass where a copy and two additions would take three.
func plusMinus(dst []int64, pv, add, sub []int32) {
	n := len(pv)
	dst = dst[:n]
	switch {
	case add != nil && sub != nil:
		add, sub = add[:n], sub[:n]
		for k, x := range pv {
			dst[k] = int64(x) + int64(add[k]) - int64(sub[k])
		}
	case add != nil:
		add = add[:n]
		for k, x := range pv {
			dst[k] = int64(x) + int64(add[k])
		}
	case sub != nil:
		sub = sub[:n]
		for k, x := range pv {
			dst[k] = int64(x) - int64(sub[k])
		}
	default:
		widen(dst, pv)
	}
}

// appendPairs appends the distinct curves of the string's modules at the step starting at
// row, each with the number of modules that have it, in the string's order (whole units add
// exactly in any order).
func (y *Year) appendPairs(pr []curveCount, row int, str []int) []curveCount {
modules:
	for _, k := range str {
		c := y.modCurve[row+k]
		for j := range pr {
			if pr[j].c == c {
				pr[j].n++
				continue modules
			}
		}
		pr = append(pr, curveCount{c, 1})
	}
	return pr
}

// addString adds the string's modules' curves at the step starting at row to sum (the step's
// grid), each distinct curve once times the modules that have it; pr is scratch space, returned
// for reuse.
func (y *Year) addString(sum []int64, row int, str []int, pr []curveCount) []curveCount {
	pr = y.appendPairs(pr[:0], row, str)
	y.addPairs(sum, pr)
	return pr
}

// addPairs adds each curve of pr times its count (which may be negative) to sum, four curves a
// pass.
func (y *Year) addPairs(sum []int64, pr []curveCount) {
	np := len(sum)
	j := 0
	for ; j+4 <= len(pr); j += 4 {
		p := pr[j : j+4]
		if p[0].n == 1 && p[1].n == 1 && p[2].n == 1 && p[3].n == 1 {
			// Modules with curves of their own, as on a large roof: no multiplications.
			addCurves4Once(sum, y.curve(p[0].c, np), y.curve(p[1].c, np), y.curve(p[2].c, np), y.curve(p[3].c, np))
			continue
		}
		addCurves4(sum, y.curve(p[0].c, np), y.curve(p[1].c, np), y.curve(p[2].c, np), y.curve(p[3].c, np),
			int64(p[0].n), int64(p[1].n), int64(p[2].n), int64(p[3].n))
	}
	switch p := pr[j:]; len(p) {
	case 3: // as four, the fourth taken zero times
		addCurves4(sum, y.curve(p[0].c, np), y.curve(p[1].c, np), y.curve(p[2].c, np), y.curve(p[2].c, np),
			int64(p[0].n), int64(p[1].n), int64(p[2].n), 0)
	case 2:
		addCurves2(sum, y.curve(p[0].c, np), y.curve(p[1].c, np), int64(p[0].n), int64(p[1].n))
	case 1:
		addCurve(sum, y.curve(p[0].c, np), int64(p[0].n))
	}
}

// appendDelta appends to dp the curves, with their counts, that take a string to another at
// the step starting at row: +1 for each module of adds, −1 for each of subs. A module in and a
// module out with one curve cancel, and curves whose count comes to zero are left out.
func (y *Year) appendDelta(dp []curveCount, row int, adds, subs []int) []curveCount {
	dp = y.appendPairs(dp, row, adds)
modules:
	for _, k := range subs {
		c := y.modCurve[row+k]
		for j := range dp {
			if dp[j].c == c {
				dp[j].n--
				continue modules
			}
		}
		dp = append(dp, curveCount{c, -1})
	}
	return slices.DeleteFunc(dp, func(p curveCount) bool { return p.n == 0 })
}

// addNear writes into sum the voltages of the string str at the step starting at row, whose
// grid starts at off in the years' layout: near's built string plus the modules moved in less
// those moved out, where that reads fewer curves than adding up the string's distinct curves,
// else added up. Both are whole units of voltQuantum, so either way gives the same bits. pr and
// dp are scratch space, returned for reuse.
func (y *Year) addNear(sum []int64, off, row int, str []int, near *nearYear, pr, dp []curveCount) ([]curveCount, []curveCount) {
	dp = y.appendDelta(dp[:0], row, near.adds, near.subs)
	if len(dp) > 1 {
		// The built string costs about two curves (its values are twice as wide).
		if pr = y.appendPairs(pr[:0], row, str); len(pr) <= len(dp)+2 {
			clear(sum)
			y.addPairs(sum, pr)
			return pr, dp
		}
	}
	widen(sum, near.from.v[off:off+len(sum)])
	y.addPairs(sum, dp)
	return pr, dp
}

// addCurves2 adds fa × a + fb × b to sum, point by point.
func addCurves2(sum []int64, a, b []int32, fa, fb int64) {
	n := len(sum)
	a, b = a[:n], b[:n]
	for k := range sum {
		sum[k] += int64(a[k])*fa + int64(b[k])*fb
	}
}

// addCurves4Once is addCurves4 with every curve taken once.
func addCurves4Once(sum []int64, a, b, c, d []int32) {
	n := len(sum)
	a, b, c, d = a[:n], b[:n], c[:n], d[:n]
	for k := range sum {
		sum[k] += int64(a[k]) + int64(b[k]) + int64(c[k]) + int64(d[k])
	}
}

// addCurves4 adds fa × a + fb × b + fc × c + fd × d to sum, point by point: four curves a
// pass, so that sum is read and written once for four.
func addCurves4(sum []int64, a, b, c, d []int32, fa, fb, fc, fd int64) {
	n := len(sum)
	a, b, c, d = a[:n], b[:n], c[:n], d[:n]
	for k := range sum {
		sum[k] += int64(a[k])*fa + int64(b[k])*fb + int64(c[k])*fc + int64(d[k])*fd
	}
}

// addCurve adds f × cv to sum, point by point.
func addCurve(sum []int64, cv []int32, f int64) {
	sum = sum[:len(cv)]
	if f == 1 {
		for k, x := range cv {
			sum[k] += int64(x)
		}
		return
	}
	for k, x := range cv {
		sum[k] += f * int64(x)
	}
}

func growInt64(s []int64, n int) []int64 {
	if cap(s) < n {
		return make([]int64, n)
	}
	return s[:n]
}

// climb models a hill-climbing tracker: from the previous voltage (or 80 %
// of open circuit) it steps along the curve's points towards higher power
// while power rises, within the window and current limit, and then takes
// the best point of the two segments around where it stopped.
func climb(is, vs []float64, prev, vmin, vmax, imax float64) (pW, vV float64) {
	n := len(is)
	if n < 2 {
		return 0, prev
	}
	if math.IsNaN(prev) {
		voc, _ := voltageOn(is, vs, 0, 0)
		prev = 0.8 * voc
	}
	prev = math.Min(math.Max(prev, vmin), vmax)
	ok := func(j int) bool { return vs[j] >= vmin && vs[j] <= vmax && is[j] <= imax && is[j] >= 0 }
	// Start at the feasible point nearest prev.
	j, best := -1, math.Inf(1)
	for k := range n {
		if ok(k) && math.Abs(vs[k]-prev) < best {
			j, best = k, math.Abs(vs[k]-prev)
		}
	}
	if j < 0 {
		return 0, prev
	}
	pw := func(k int) float64 { return is[k] * vs[k] }
	for {
		switch {
		case j+1 < n && ok(j+1) && pw(j+1) > pw(j):
			j++
			continue
		case j > 0 && ok(j-1) && pw(j-1) > pw(j):
			j--
			continue
		}
		break
	}
	lo, hi := max(j-1, 0), min(j+2, n)
	p, v, _ := polyMax(is[lo:hi], vs[lo:hi], vmin, vmax, imax)
	if p < pw(j) {
		return pw(j), vs[j]
	}
	return p, v
}

// Thin returns a year of every k-th step of y, each standing for the hours of the k steps
// from it, sharing y's curves: evaluating a layout on it costs about 1/k of evaluating it on
// y and estimates the same energy, for screening many layouts before evaluating the best on
// the whole year. Seasons and hours of the day are all sampled: a day has a number of sun-up
// steps that is rarely a multiple of k, so successive days sample different hours. k ≤ 1
// returns y.
func (y *Year) Thin(k int) *Year {
	if k <= 1 {
		return y
	}
	ns := (y.steps + k - 1) / k
	t := &Year{
		stride: k,
		m:      y.m, n: y.n, steps: ns,
		curveV: y.curveV, curveAt: y.curveAt, curveMPP: y.curveMPP,
		gridOff:    make([]int32, 1, ns+1),
		modCurve:   make([]int32, 0, ns*y.n),
		unshadedW:  make([]float32, 0, ns*y.n),
		hours:      make([]float32, ns),
		moduleDCWh: make([]float64, y.n), moduleUnWh: make([]float64, y.n),
	}
	for j := range ns {
		s := j * k
		t.gridI = append(t.gridI, y.grid(s)...)
		t.gridOff = append(t.gridOff, int32(len(t.gridI)))
		t.modCurve = append(t.modCurve, y.modCurve[s*y.n:(s+1)*y.n]...)
		t.unshadedW = append(t.unshadedW, y.unshadedW[s*y.n:(s+1)*y.n]...)
		h := 0.0
		for r := s; r < min(s+k, y.steps); r++ {
			h += float64(y.hours[r])
		}
		t.hours[j] = float32(h)
		for m := range y.n {
			t.moduleDCWh[m] += float64(y.curveMPP[y.modCurve[s*y.n+m]]) * h
			t.moduleUnWh[m] += float64(y.unshadedW[s*y.n+m]) * h
		}
	}
	y.thin.Store(t)
	return t
}
