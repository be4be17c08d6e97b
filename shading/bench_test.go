package shading

import (
	"context"
	"math/rand/v2"
	"runtime"
	"syscall"
	"testing"
	"time"

	"github.com/paulmach/orb"
	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/geo"
)

// benchGrid is 6×20 half-cells, a 120-cell half-cut module, the size the benchmark targets assume.
var benchGrid = geo.CellGrid{Cols: 6, Rows: 20}

// benchScene is the benchmark site, generated from a fixed seed rather than stored, so it
// needs no file format: two houses whose four roof faces carry 30 portrait modules each (120),
// 40 blocks (two chimneys and a dormer on the houses, the rest neighbouring buildings, sheds
// and garden walls, a third of them gable-roofed) and 15 trees (ellipsoids and cones, half
// deciduous) around them. All sizes are invented.
func benchScene() (*geo.Site, []geo.Module) {
	rng := rand.New(rand.NewPCG(2024, 120))
	u := func(a, b float64) float64 { return a + (b-a)*rng.Float64() }
	site := &geo.Site{}
	// House A: east–west ridge, faces south and north.
	site.Faces = gableFaces("A", 0, 0, 12, 10, 35, 5)
	// House B: north–south ridge, faces east and west.
	be := geo.Face{ID: "BE", Plan: rect(25, -2, 30, 10), PitchDeg: 30, AspectDeg: 90, EaveHeightM: 4}
	bw := geo.Face{ID: "BW", Plan: rect(20, -2, 25, 10), PitchDeg: 30, AspectDeg: 270, EaveHeightM: 4}
	be.SetEave()
	bw.SetEave()
	site.Faces = append(site.Faces, be, bw)
	var mods []geo.Module
	mods = append(mods, fillFace(&site.Faces[0], orb.Point{0.25, 0.3}, 10, 3, 1.13, 1.72, 0.02)...)
	mods = append(mods, fillFace(&site.Faces[1], orb.Point{11.75, 9.7}, 10, 3, 1.13, 1.72, 0.02)...)
	mods = append(mods, fillFace(&site.Faces[2], orb.Point{29.7, -1.75}, 10, 3, 1.13, 1.72, 0.02)...)
	mods = append(mods, fillFace(&site.Faces[3], orb.Point{20.3, 9.75}, 10, 3, 1.13, 1.72, 0.02)...)

	site.Blocks = []geo.Block{
		{ID: "chimneyA", Footprint: rect(3, 6, 3.6, 6.6), HeightM: 9.5},
		{ID: "chimneyB", Footprint: rect(24.6, 6, 25.4, 6.8), HeightM: 8.6},
		{ID: "dormer", Footprint: rect(8, 7.5, 10, 9.5), HeightM: 7, RidgeM: 8, RidgeAzimuthDeg: 0},
	}
	for i := len(site.Blocks); i < 40; i++ {
		var cx, cy float64
		for { // outside both houses
			cx, cy = u(-30, 60), u(-35, 40)
			if !(cx > -3 && cx < 33 && cy > -5 && cy < 13) {
				break
			}
		}
		b := geo.Block{ID: "N" + itoa(i), BaseM: 0}
		switch i % 3 {
		case 0: // a neighbouring house
			hw, hd := u(3, 7), u(3, 6)
			b.Footprint, b.HeightM = rect(cx-hw, cy-hd, cx+hw, cy+hd), u(3, 7)
			b.RidgeM, b.RidgeAzimuthDeg = b.HeightM+u(1.5, 4), u(0, 180)
		case 1: // a shed
			hw, hd := u(1, 2.5), u(1, 2.5)
			b.Footprint, b.HeightM = rect(cx-hw, cy-hd, cx+hw, cy+hd), u(2, 3.5)
		default: // a garden wall or hedge-high fence
			if rng.IntN(2) == 0 {
				b.Footprint = rect(cx-u(3, 10), cy-0.15, cx+u(3, 10), cy+0.15)
			} else {
				b.Footprint = rect(cx-0.15, cy-u(3, 10), cx+0.15, cy+u(3, 10))
			}
			b.HeightM = u(1.5, 2.5)
		}
		site.Blocks = append(site.Blocks, b)
	}
	off := []time.Month{time.November, time.December, time.January, time.February, time.March}
	for i := range 15 {
		var x, y float64
		for {
			x, y = u(-25, 55), u(-30, 35)
			if !(x > -5 && x < 35 && y > -7 && y < 15) {
				break
			}
		}
		h := u(6, 18)
		t := geo.Tree{ID: "T" + itoa(i), Trunk: orb.Point{x, y}, HeightM: h, CrownRadiusM: u(1.5, 4.5),
			CrownBaseM: u(1.5, h/2), Shape: geo.CrownShape(i % 2)}
		if i%2 == 0 {
			t.Deciduous, t.LeafOffTransmittance, t.LeafOffMonths = true, u(0.4, 0.7), off
		}
		site.Trees = append(site.Trees, t)
	}
	return site, mods
}

// The benchmark scene is what it says: 120 modules, 40 blocks, 15 trees, some shade but not
// total shade, and the fast path agrees with brute force on a sample of days.
func TestBenchScene(t *testing.T) {
	site, mods := benchScene()
	if len(mods) != 120 || len(site.Faces) != 4 || len(site.Blocks) != 40 || len(site.Trees) != 15 {
		t.Fatalf("%d modules, %d faces, %d blocks, %d trees", len(mods), len(site.Faces), len(site.Blocks), len(site.Trees))
	}
	steps := sunYear(47, 61, 1) // six days across the year keep the brute-force run short
	fast := compute(t, site, mods, Options{Grid: benchGrid}, steps)
	brute := compute(t, site, mods, Options{Grid: benchGrid, BruteForce: true}, steps)
	fb, bb := annualBeam(fast, mods, steps), annualBeam(brute, mods, steps)
	for i := range mods {
		if !scalar.EqualWithinRel(fb[i], bb[i], 0.005) { // the project's stated bound
			t.Errorf("module %s: fast %.6g, brute %.6g", mods[i].ID, fb[i], bb[i])
		}
	}
}

func benchCompute(b *testing.B, brute bool, dayStep int) {
	site, mods := benchScene()
	steps := sunYear(47, dayStep, 1)
	sc, err := NewScene(site, mods, Options{Grid: benchGrid, BruteForce: brute})
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	var r *Result
	cpu0 := cpuSeconds()
	for b.Loop() {
		r, err = sc.Compute(context.Background(), steps, nil)
		if err != nil {
			b.Fatal(err)
		}
	}
	// CPU seconds per run, besides wall time: the machine is shared, and wall time under
	// someone else's load overstates the work.
	b.ReportMetric((cpuSeconds()-cpu0)/float64(b.N), "cpu-s/op")
	stored := 0
	for _, m := range r.mods {
		stored += len(m.data) + 4*len(m.idx)
	}
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	b.ReportMetric(float64(len(steps)), "steps")
	b.ReportMetric(float64(stored)/1e6, "result-MB")
	b.ReportMetric(float64(ms.Sys)/1e6, "sys-MB")
}

func cpuSeconds() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano()).Seconds()
}

// BenchmarkComputeBenchScene: all shade fractions of the benchmark scene over an hourly year
// (every day, sun up only) on the fast path. Target ≤ 3 s and ≤ 500 MB on two cores.
func BenchmarkComputeBenchScene(b *testing.B) { benchCompute(b, false, 1) }

// BenchmarkComputeBenchSceneBruteForce is the same year on the reference path.
func BenchmarkComputeBenchSceneBruteForce(b *testing.B) { benchCompute(b, true, 1) }

// BenchmarkNewSceneBenchScene is the preparation (culling cones per module and cell).
func BenchmarkNewSceneBenchScene(b *testing.B) {
	site, mods := benchScene()
	b.ReportAllocs()
	for b.Loop() {
		if _, err := NewScene(site, mods, Options{Grid: benchGrid}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkDiffuseBenchScene computes the diffuse view fractions of all 120 modules.
func BenchmarkDiffuseBenchScene(b *testing.B) {
	site, mods := benchScene()
	b.ReportAllocs()
	for b.Loop() {
		sc, err := NewScene(site, mods, Options{Grid: benchGrid})
		if err != nil {
			b.Fatal(err)
		}
		for i := range mods {
			sc.Diffuse(i)
		}
	}
}
