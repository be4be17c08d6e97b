package yield

import (
	"bytes"
	"context"
	"fmt"
	"math/rand/v2"
	"syscall"
	"testing"
	"time"

	"github.com/paulmach/orb"

	"sunstring/geo"
	"sunstring/shading/sun"
	"sunstring/yield/electric"
	"sunstring/yield/internal/roofgen"
	"sunstring/yield/weather"
)

// benchSite is a seeded invented site: one long south face holding about n modules (two
// rows of n/2) and k obstructions around it (chimneys on the roof, walls and sheds nearby).
func benchSite(b *testing.B, n, k int) (*geo.Site, []geo.Module) {
	b.Helper()
	cols := (n + 1) / 2
	width := float64(cols)*1.01 + 0.6
	face := geo.Face{ID: "S", PitchDeg: 30, AspectDeg: 180, EaveHeightM: 4,
		Plan: orb.Ring{{0, 0}, {width, 0}, {width, 3.7}, {0, 3.7}, {0, 0}}}
	face.SetEave()
	site := &geo.Site{Proj: geo.NewENU(15, 47, 0), Faces: []geo.Face{face}}
	r := rand.New(rand.NewPCG(uint64(n), uint64(k)))
	for i := range k {
		x := r.Float64()*(width+20) - 10
		y := -4 - r.Float64()*15
		w, d := 0.5+r.Float64()*3, 0.5+r.Float64()*3
		site.Blocks = append(site.Blocks, geo.Block{ID: fmt.Sprintf("b%d", i), HeightM: 2 + r.Float64()*6,
			Footprint: orb.Ring{{x, y}, {x + w, y}, {x + w, y + d}, {x, y + d}, {x, y}}})
	}
	mods, _, err := geo.Fill(site, geo.FillOptions{LengthM: 1.65, WidthM: 0.99, Grid: geo.CellGrid{Cols: 6, Rows: 10}, SetbackM: 0.3, GapM: 0.02})
	if err != nil {
		b.Fatal(err)
	}
	return site, mods
}

// BenchmarkPrepare measures how a survey's one-off cost grows with the number of modules, of
// obstructions and of time steps (hourly records).
func BenchmarkPrepare(b *testing.B) {
	zone, _ := time.LoadLocation("Europe/Vienna")
	ghi := [12]float64{35, 55, 95, 130, 160, 170, 175, 150, 105, 70, 38, 28}
	temp := [12]float64{-1, 1, 5, 10, 15, 18, 20, 19.5, 15, 10, 4, 0}
	ws, err := weather.FromMonthly(weather.Site{LatDeg: 47, LonDeg: 15, Zone: zone}, ghi, temp)
	if err != nil {
		b.Fatal(err)
	}
	for _, c := range []struct{ modules, objects, hours int }{
		{20, 10, 8760}, {60, 10, 8760}, {120, 10, 8760},
		{60, 40, 8760}, {60, 160, 8760},
		{60, 10, 2190}, {60, 10, 4380},
	} {
		b.Run(fmt.Sprintf("modules=%d/objects=%d/hours=%d", c.modules, c.objects, c.hours), func(b *testing.B) {
			site, mods := benchSite(b, c.modules, c.objects)
			w := *ws
			w.Records = ws.Records[:c.hours]
			in := Input{Site: site, Modules: mods, Weather: &w, Observer: sun.Observer{LatDeg: 47, LonDeg: 15}, Zone: zone,
				System: System{Module: testModule, Inverter: testInverter, Albedo: 0.2}}
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Prepare(context.Background(), in); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// largeRoof decodes and fills the invented hall roof of about n modules (yield/internal/roofgen)
// as the site file it writes would, and returns the survey's input with a synthetic year.
func largeRoof(b *testing.B, n int) Input {
	b.Helper()
	site, err := geo.Decode(bytes.NewReader(roofgen.Map(roofgen.Options{Modules: n})), geo.DecodeOptions{File: "roof.geojson",
		OriginLonDeg: ptrTo(roofgen.LonDeg), OriginLatDeg: ptrTo(roofgen.LatDeg)})
	if err != nil {
		b.Fatal(err)
	}
	mods, _, err := geo.Fill(site, geo.FillOptions{LengthM: 1.72, WidthM: 1.134, Grid: geo.CellGrid{Cols: 6, Rows: 20},
		SetbackM: 0.4, GapM: 0.02, ObstacleClearanceM: 0.3})
	if err != nil {
		b.Fatal(err)
	}
	zone, _ := time.LoadLocation("Europe/Vienna")
	ghi := [12]float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29}
	temp := [12]float64{-1, 1, 5.2, 10.1, 14.8, 18.2, 20.1, 19.6, 15.2, 9.9, 4.3, 0.2}
	ws, err := weather.FromMonthly(weather.Site{LatDeg: roofgen.LatDeg, LonDeg: roofgen.LonDeg, Zone: zone}, ghi, temp)
	if err != nil {
		b.Fatal(err)
	}
	ds := electric.Datasheet{PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1, TempCoeffVocPct: -0.27,
		TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34, CellsSeries: 120, HalfCut: true, BypassDiodes: 3}
	return Input{Site: site, Modules: mods, Weather: ws, Observer: sun.Observer{LatDeg: roofgen.LatDeg, LonDeg: roofgen.LonDeg},
		Zone: zone, System: System{Module: ds, Inverter: testInverter, Albedo: 0.2}}
}

func ptrTo(x float64) *float64 { return &x }

// BenchmarkPrepareLargeRoof is Prepare (sun, shade, irradiance, the shaded and the unshaded
// year of module curves) on the invented hall roof, from 120 to 1,000 modules; curves/step is
// the number of distinct module curves a step, the rest shared.
func BenchmarkPrepareLargeRoof(b *testing.B) {
	for _, n := range []int{120, 250, 430, 700, 1000} {
		b.Run(fmt.Sprintf("modules=%d", n), func(b *testing.B) {
			in := largeRoof(b, n)
			b.ReportAllocs()
			var m *Model
			cpu0 := cpuSeconds()
			for b.Loop() {
				var err error
				if m, err = Prepare(context.Background(), in); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric((cpuSeconds()-cpu0)/float64(b.N), "cpu-s/op")
			b.ReportMetric(float64(len(in.Modules)), "modules")
			b.ReportMetric(float64(m.Year.Curves())/float64(m.Year.Steps()), "curves/step")
		})
	}
}

// BenchmarkLargeRoofCurves is the part of Prepare on the hall roof (437 modules) that builds
// the shaded and the unshaded year of module curves, Prepare's per-step irradiance included;
// sun and shade are computed once, outside the timing. Measure with -cpu 1.
func BenchmarkLargeRoofCurves(b *testing.B) {
	in := largeRoof(b, 430)
	p, err := newPrep(in)
	if err != nil {
		b.Fatal(err)
	}
	if err := p.sunSteps(context.Background()); err != nil {
		b.Fatal(err)
	}
	scene, err := p.shade(context.Background())
	if err != nil {
		b.Fatal(err)
	}
	p.geometry(scene)
	b.ReportAllocs()
	b.ResetTimer()
	cpu0 := cpuSeconds()
	for b.Loop() {
		if err := p.shadedYear(); err != nil {
			b.Fatal(err)
		}
		if err := p.unshadedYear(); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric((cpuSeconds()-cpu0)/float64(b.N), "cpu-s/op")
	b.ReportMetric(float64(p.m.Year.Curves())/float64(p.m.Year.Steps()), "curves/step")
}

// cpuSeconds is the process's user and system time so far: on a shared machine it measures
// the work where wall time measures the queue.
func cpuSeconds() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano()).Seconds()
}
