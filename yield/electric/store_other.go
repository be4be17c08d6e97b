//go:build !linux

package electric

// adviseLarge does nothing where the kernel takes no advice on large pages.
func adviseLarge([]int32) {}
