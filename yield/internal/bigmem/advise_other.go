//go:build !linux

package bigmem

import "unsafe"

// largePage is zero: no large pages to align to or ask for.
const largePage = 0

// advise does nothing where the kernel takes no advice on large pages.
func advise(unsafe.Pointer, uintptr) {}
