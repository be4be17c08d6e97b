package shading

import (
	"testing"
	"unsafe"
)

// A worker's modules take their rows from shared blocks: every module reads back exactly the
// rows stored for it, however its rows fell across blocks, and no module's slice reaches into
// another's (each is capped at its length).
func TestWorkBlocks(t *testing.T) {
	const cells = 6
	for _, tc := range []struct {
		name string
		rows []int // shaded rows of each module in turn
	}{
		{"no shade", []int{0, 0, 0}},
		{"small modules share a block", []int{3, 1, 4, 1, 5}},
		{"a module larger than the first block", []int{2, firstBlock/cells + 7, 3}},
		{"modules that fill several blocks", []int{firstBlock / cells, firstBlock / cells, 2 * firstBlock / cells, 9, 0, firstBlock/cells + 1}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			w := newWork(cells)
			mods := make([]modResult, len(tc.rows))
			for m, n := range tc.rows {
				mr := modResult{idx: make([]int32, 2*n+1), data: w.begin()}
				for s := range mr.idx {
					// Odd steps shaded with a pattern naming the module and step, even ones lit.
					if s%2 == 0 {
						store(w, &mr, s, []uint8{255, 255, 255, 255, 255, 255})
						continue
					}
					store(w, &mr, s, []uint8{uint8(m), uint8(s), uint8(s >> 8), uint8(s >> 16), 7, 255})
				}
				mods[m] = mr
				mods[m].data = w.end(mr.data)
			}
			for m, mr := range mods {
				if len(mr.data) != cells*tc.rows[m] || cap(mr.data) != len(mr.data) {
					t.Fatalf("module %d: %d bytes of capacity %d, want %d of capacity %d", m, len(mr.data), cap(mr.data), cells*tc.rows[m], cells*tc.rows[m])
				}
				for s, o := range mr.idx {
					if s%2 == 0 {
						if o != stepLit {
							t.Fatalf("module %d step %d: index %d, want lit", m, s, o)
						}
						continue
					}
					row := mr.data[o : int(o)+cells]
					if row[0] != uint8(m) || row[1] != uint8(s) || row[2] != uint8(s>>8) || row[3] != uint8(s>>16) || row[4] != 7 {
						t.Fatalf("module %d step %d: row %v", m, s, row)
					}
				}
				// Disjoint from every other module's bytes.
				for k := m + 1; k < len(mods); k++ {
					a, b := mods[m].data, mods[k].data
					if len(a) == 0 || len(b) == 0 {
						continue
					}
					a0, b0 := uintptr(unsafe.Pointer(&a[0])), uintptr(unsafe.Pointer(&b[0]))
					if a0 < b0+uintptr(len(b)) && b0 < a0+uintptr(len(a)) {
						t.Fatalf("modules %d and %d share bytes", m, k)
					}
				}
			}
		})
	}
}
