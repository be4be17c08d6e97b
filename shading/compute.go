package shading

import (
	"context"
	"math"
	"sync"
	"sync/atomic"
	"time"

	"sunstring/geo"
)

// Step is one time step with the sun up.
type Step struct {
	Sun   [3]float64 // unit vector toward the sun: east, north, up
	Month time.Month // selects a deciduous tree's transmittance
}

// Per module and step, idx holds an offset into data or one of these markers. Most
// module-steps are fully lit or fully dark, and they cost four bytes instead of a cell row.
const (
	stepLit  int32 = -1
	stepDark int32 = -2
)

// Result holds the beam transmittance of every cell of every module at every step: 255 fully
// lit, 0 fully shaded. It is read-only and safe for concurrent use.
type Result struct {
	cells int
	steps int
	mods  []modResult
	zeros []uint8
}

type modResult struct {
	idx  []int32
	data []uint8
}

// Steps returns the number of time steps.
func (r *Result) Steps() int { return r.steps }

// Cells returns the number of cells per module.
func (r *Result) Cells() int { return r.cells }

// Lit returns the per-cell beam transmittance (0..255, cell-index order of geo.CellGrid) of a
// module at a step, or nil when every cell is fully lit. The slice is shared: do not modify it.
func (r *Result) Lit(module, step int) []uint8 {
	switch o := r.mods[module].idx[step]; o {
	case stepLit:
		return nil
	case stepDark:
		return r.zeros
	default:
		return r.mods[module].data[o : int(o)+r.cells : int(o)+r.cells]
	}
}

// LitFraction returns the mean beam transmittance over the module's cells, 0..1.
func (r *Result) LitFraction(module, step int) float64 {
	switch o := r.mods[module].idx[step]; o {
	case stepLit:
		return 1
	case stepDark:
		return 0
	default:
		s := 0
		for _, v := range r.mods[module].data[o : int(o)+r.cells] {
			s += int(v)
		}
		return float64(s) / float64(255*r.cells)
	}
}

// stepInfo is what every module shares about a step.
type stepInfo struct {
	d     geo.Vec3
	month time.Month
	dark  bool // sun at or below the horizontal or below the far horizon
}

// Compute shades every cell of every module at every step. Modules are spread over the
// workers; the result does not depend on their number. progress, if not nil, is called (from
// one goroutine at a time) after each module with the number done. Compute stops early with
// ctx's error when ctx is cancelled.
func (sc *Scene) Compute(ctx context.Context, steps []Step, progress func(done, total int)) (*Result, error) {
	info := make([]stepInfo, len(steps))
	for s, st := range steps {
		d := geo.Vec3{E: st.Sun[0], N: st.Sun[1], U: st.Sun[2]}.Unit()
		info[s] = stepInfo{d: d, month: st.Month}
		if !(d.U > 0) {
			info[s].dark = true
			continue
		}
		if sc.horizon != nil {
			el := math.Asin(math.Min(1, d.U)) * 180 / math.Pi
			az := math.Atan2(d.E, d.N) * 180 / math.Pi
			if el < sc.horizon.ElevationDeg(az) {
				info[s].dark = true
			}
		}
	}
	res := &Result{cells: sc.grid.Len(), steps: len(steps), mods: make([]modResult, len(sc.mods)),
		zeros: make([]uint8, sc.grid.Len())}

	var next, done atomic.Int64
	var mu sync.Mutex
	var wg sync.WaitGroup
	workers := min(sc.workers, max(1, len(sc.mods)))
	for range workers {
		wg.Go(func() {
			w := newWork(res.cells)
			for {
				if ctx.Err() != nil {
					return
				}
				i := int(next.Add(1) - 1)
				if i >= len(sc.mods) {
					return
				}
				if sc.brute {
					res.mods[i] = sc.bruteModule(i, info, w)
				} else {
					res.mods[i] = sc.fastModule(i, info, w)
				}
				// Count under the lock, so that the calls see 1, 2, … in order.
				mu.Lock()
				n := int(done.Add(1))
				if progress != nil {
					progress(n, len(sc.mods))
				}
				mu.Unlock()
			}
		})
	}
	wg.Wait()
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	return res, nil
}

// work is a worker's scratch space, and the block its modules' shaded rows are cut from.
type work struct {
	cand  []int32
	row   []uint8
	trans []float64 // a step's transmittance per cell
	// free is the unused end of the worker's current block: a module's rows are appended
	// there in place, so that a large roof's hundreds of megabytes of rows are written once,
	// not copied again each time a module's slice would have doubled.
	free []uint8
	// block is the size of the next block: it doubles from a small first block, so that a
	// roof with little shade takes little memory, up to maxBlock.
	block int
}

// Blocks of rows: the first, and the largest (a module's rows may need a larger one).
const (
	firstBlock = 64 << 10
	maxBlock   = 8 << 20
)

func newWork(cells int) *work {
	return &work{row: make([]uint8, cells), trans: make([]float64, cells), block: firstBlock}
}

// begin starts a module's rows in the free part of the current block.
func (w *work) begin() []uint8 { return w.free[:0] }

// end closes a module's rows: the block's rest stays free for the next module, and the
// module's slice is capped so that it never reaches into that rest.
func (w *work) end(data []uint8) []uint8 {
	w.free = data[len(data):cap(data)]
	return data[:len(data):len(data)]
}

// room moves a module's rows so far to a new block with room for more bytes.
func (w *work) room(data []uint8, more int) []uint8 {
	n := max(w.block, 2*(len(data)+more))
	w.block = min(2*w.block, maxBlock)
	b := make([]uint8, len(data), n)
	copy(b, data)
	return b
}

// quantize maps a transmittance to 0..255.
func quantize(t float64) uint8 {
	switch {
	case t <= 0:
		return 0
	case t >= 1:
		return 255
	}
	return uint8(t*255 + 0.5)
}

// store appends a cell row to mr unless it is uniform; w gives the room (see work.room).
func store(w *work, mr *modResult, s int, row []uint8) {
	all, none := true, true
	for _, v := range row {
		all = all && v == 255
		none = none && v == 0
	}
	switch {
	case all:
		mr.idx[s] = stepLit
	case none:
		mr.idx[s] = stepDark
	default:
		if len(mr.data)+len(row) > cap(mr.data) {
			mr.data = w.room(mr.data, len(row))
		}
		mr.idx[s] = int32(len(mr.data))
		mr.data = append(mr.data, row...)
	}
}

func (sc *Scene) fastModule(i int, info []stepInfo, w *work) modResult {
	p := &sc.preps[i]
	mr := modResult{idx: make([]int32, len(info)), data: w.begin()}
	for s := range info {
		st := &info[s]
		d := st.d
		if st.dark || d.Dot(p.normal) <= 0 {
			mr.idx[s] = stepDark
			continue
		}
		w.cand = w.cand[:0]
		for j, c := range p.cones {
			if !c.contains(d) {
				continue
			}
			o := &sc.objs[p.objs[j]]
			if p.front[j] && d.Dot(o.n) >= 0 {
				// The module lies in front of this face and the ray moves away from it.
				continue
			}
			if !o.mayHit(p.centre, d, p.rad) {
				continue
			}
			w.cand = append(w.cand, int32(j))
		}
		if len(w.cand) == 0 {
			mr.idx[s] = stepLit
			continue
		}
		// Candidate by candidate, each over the cells: a cell's transmittance is multiplied in
		// the candidates' order, as a cell-by-cell loop would, and a cell in full shade is
		// not tested again.
		t := w.trans[:len(p.cells)]
		for k := range t {
			t[k] = 1
		}
		for _, j := range w.cand {
			o := &sc.objs[p.objs[j]]
			tr := o.transmittance(st.month)
			con := p.cellCon[j][:len(p.cells)]
			for k, q := range p.cells {
				if t[k] == 0 || !con[k].contains(d) || !o.hit(q, d) {
					continue
				}
				t[k] *= tr
			}
		}
		for k, x := range t {
			w.row[k] = quantize(x)
		}
		store(w, &mr, s, w.row)
	}
	mr.data = w.end(mr.data)
	return mr
}

// bruteModule is the reference: one exact ray per cell per step against every object.
func (sc *Scene) bruteModule(i int, info []stepInfo, w *work) modResult {
	p := &sc.preps[i]
	mr := modResult{idx: make([]int32, len(info)), data: w.begin()}
	for s := range info {
		st := &info[s]
		d := st.d
		if st.dark || d.Dot(p.normal) <= 0 {
			mr.idx[s] = stepDark
			continue
		}
		for k, q := range p.cells {
			t := 1.0
			for j := range sc.objs {
				o := &sc.objs[j]
				if o.hit(q, d) {
					t *= o.transmittance(st.month)
				}
			}
			w.row[k] = quantize(t)
		}
		store(w, &mr, s, w.row)
	}
	mr.data = w.end(mr.data)
	return mr
}
