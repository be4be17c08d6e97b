package bigmem

import (
	"testing"
	"unsafe"
)

// TestMake: slices are zeroed, exactly n long with no room to grow, and those of a large
// page or more start on one (alignment 1 where the system has none).
func TestMake(t *testing.T) {
	align := uintptr(max(largePage, 1))
	for _, tc := range []struct {
		name    string
		n       int
		make    func(n int) (unsafe.Pointer, int, int, bool)
		aligned bool
	}{
		{"empty", 0, check[int32], false},
		{"small int32", 1000, check[int32], false},
		{"just under a large page", (2<<20)/4 - 1, check[float32], false},
		{"a large page of float32", (2 << 20) / 4, check[float32], true},
		{"8 MiB of float64", 1 << 20, check[float64], true},
		{"odd length int32", 3<<20 + 7, check[int32], true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			p, l, c, zero := tc.make(tc.n)
			if l != tc.n || c != tc.n {
				t.Fatalf("len %d, cap %d, want %d", l, c, tc.n)
			}
			if !zero {
				t.Error("not zeroed")
			}
			if tc.aligned && uintptr(p)%align != 0 {
				t.Errorf("starts at %#x, not on a %d-byte page", uintptr(p), align)
			}
		})
	}
}

// check makes n elements, writes every one and reports where they start, len, cap and
// whether they were zero before.
func check[T Number](n int) (unsafe.Pointer, int, int, bool) {
	v := Make[T](n)
	zero := true
	for k := range v {
		zero = zero && v[k] == 0
		v[k] = T(k % 100)
	}
	var p unsafe.Pointer
	if len(v) > 0 {
		p = unsafe.Pointer(&v[0])
	}
	return p, len(v), cap(v), zero
}
