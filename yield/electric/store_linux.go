package electric

import (
	"syscall"
	"unsafe"
)

// largePage is the size of a transparent huge page on linux/amd64 and arm64 (2 MiB).
const largePage = 2 << 20

// adviseLarge asks the kernel to back the whole large pages inside v with large pages
// (madvise MADV_HUGEPAGE; where transparent huge pages are enabled only on request, the
// default of many distributions): one page fault per 2 MiB on first write instead of 512.
// Failure is harmless (small pages), so it is ignored.
func adviseLarge(v []int32) {
	if len(v) == 0 {
		return
	}
	p := uintptr(unsafe.Pointer(&v[0]))
	end := p + uintptr(len(v))*4
	a, e := (p+largePage-1)&^(largePage-1), end&^(largePage-1)
	if e <= a {
		return
	}
	b := unsafe.Slice((*byte)(unsafe.Pointer(&v[(a-p)/4])), e-a)
	_ = syscall.Madvise(b, syscall.MADV_HUGEPAGE)
}
