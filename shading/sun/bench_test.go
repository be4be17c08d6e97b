package sun

import (
	"testing"
	"time"
)

func BenchmarkAt(b *testing.B) {
	o := Observer{LatDeg: 47.1, LonDeg: 15.4, ElevationM: 420}
	t0 := time.Date(2024, 6, 1, 10, 30, 0, 0, time.UTC)
	b.ReportAllocs()
	for b.Loop() {
		_ = At(t0, o)
	}
}

func BenchmarkAtEachYear(b *testing.B) {
	o := Observer{LatDeg: 47.1, LonDeg: 15.4, ElevationM: 420}
	ts := hourlyYear(2023) // 8760 instants
	b.ReportAllocs()
	for b.Loop() {
		_ = AtEach(ts, o)
	}
}

func BenchmarkRiseTransitSet(b *testing.B) {
	o := Observer{LatDeg: 47.1, LonDeg: 15.4, ElevationM: 420}
	day := time.Date(2024, 6, 1, 0, 0, 0, 0, time.UTC)
	b.ReportAllocs()
	for b.Loop() {
		_ = RiseTransitSet(day, o)
	}
}
