package bigmem

import "unsafe"

// Number is what Make makes slices of: elements of 4 or 8 bytes, which tile a large page.
type Number interface {
	~int32 | ~uint32 | ~float32 | ~int64 | ~uint64 | ~float64
}

// Make returns a zeroed slice of n elements (len and cap n). At least one large page long,
// it starts on a large page and the system is asked to back it with large pages; the head
// of the allocation before the first large page is left unused (never written, so never
// faulted in). Shorter slices are made as make does.
func Make[T Number](n int) []T {
	var zero T
	size := int(unsafe.Sizeof(zero))
	if largePage == 0 || n*size < largePage {
		return make([]T, n)
	}
	lp := uintptr(largePage)
	buf := make([]T, n+largePage/size)
	p := uintptr(unsafe.Pointer(&buf[0]))
	off := int(((p+lp-1)&^(lp-1) - p) / uintptr(size))
	v := buf[off : off+n : off+n]
	advise(unsafe.Pointer(&v[0]), uintptr(n*size))
	return v
}
