package electric

import (
	"testing"
	"unsafe"
)

// TestCurveStore: the store's slices are zeroed, exactly as long as asked (no room to grow
// into a neighbour) and never overlap, whether cut from a chunk, from a new chunk when the
// last is full, or made on their own when large.
func TestCurveStore(t *testing.T) {
	for _, tc := range []struct {
		name  string
		sizes []int
	}{
		{"small ones share a chunk", []int{64, 640, 1, 64 * 178}},
		{"a chunk fills up", []int{storeChunkLen / 8, storeChunkLen / 8, storeChunkLen / 8, storeChunkLen / 8,
			storeChunkLen / 8, storeChunkLen / 8, storeChunkLen / 8, storeChunkLen/8 - 1, 2}},
		{"a large one on its own", []int{10, storeChunkLen/8 + 1, 10}},
		{"empty", []int{0, 5, 0}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			var s curveStore
			var got [][]int32
			for _, n := range tc.sizes {
				v := s.take(n)
				if len(v) != n || cap(v) != n {
					t.Fatalf("take(%d): len %d, cap %d", n, len(v), cap(v))
				}
				for k, x := range v {
					if x != 0 {
						t.Fatalf("take(%d)[%d] = %d, want zeroed", n, k, x)
					}
				}
				for k := range v {
					v[k] = int32(len(got) + 1)
				}
				got = append(got, v)
			}
			for i, v := range got {
				for k, x := range v {
					if x != int32(i+1) {
						t.Fatalf("slice %d[%d] = %d: overwritten by slice %d", i, k, x, x-1)
					}
				}
				for j, w := range got[:i] {
					if overlap(v, w) {
						t.Errorf("slices %d and %d overlap", j, i)
					}
				}
			}
		})
	}
}

func overlap(a, b []int32) bool {
	if len(a) == 0 || len(b) == 0 {
		return false
	}
	pa, pb := uintptr(unsafe.Pointer(&a[0])), uintptr(unsafe.Pointer(&b[0]))
	return pa < pb+uintptr(len(b))*4 && pb < pa+uintptr(len(a))*4
}
