package electric

import "sunstring/yield/internal/bigmem"

// storeChunkLen is the number of voltages a year's curve store takes from the heap at a
// time (16 MiB): a step's curves (about 50 KiB on a large roof) are cut from it, so that the
// store is a few large allocations the system can back with large pages (bigmem.Make)
// rather than thousands of small ones, each page of which faults on its first write.
const storeChunkLen = 4 << 20

// curveStore hands out slices for a worker's steps' curves, cut from chunks of
// storeChunkLen voltages. The year keeps the slices (Year.adoptCurves), and with them the
// chunks.
type curveStore struct{ free []int32 }

// take returns a zeroed slice of n voltages.
func (s *curveStore) take(n int) []int32 {
	if n > len(s.free) {
		if n > storeChunkLen/8 {
			return make([]int32, n)
		}
		s.free = bigmem.Make[int32](storeChunkLen)
	}
	v := s.free[:n:n]
	s.free = s.free[n:]
	return v
}
