package bigmem

import (
	"syscall"
	"unsafe"
)

// largePage is the size of a transparent huge page on linux/amd64 and arm64 (2 MiB).
const largePage = 2 << 20

// advise asks the kernel to back the whole large pages in the n bytes at p with large pages
// (madvise MADV_HUGEPAGE). Failure is harmless (small pages), so it is ignored.
func advise(p unsafe.Pointer, n uintptr) {
	a := (uintptr(p) + largePage - 1) &^ (largePage - 1)
	e := (uintptr(p) + n) &^ (largePage - 1)
	if e <= a {
		return
	}
	b := unsafe.Slice((*byte)(unsafe.Add(p, a-uintptr(p))), e-a)
	_ = syscall.Madvise(b, syscall.MADV_HUGEPAGE)
}
