package survey_test

import (
	"context"
	"fmt"
	"os"
	"runtime"
	"sync"
	"syscall"
	"testing"
	"time"

	"sunstring/yield/internal/roofgen"
	"sunstring/yield/survey"
)

// exampleConfig is examples/sample-house/site.yaml in Go.
func exampleConfig() *survey.Config {
	cfg := survey.Defaults()
	lat, lon := 47.05, 15.43
	cfg.Name, cfg.Map, cfg.Timezone, cfg.Latitude, cfg.Longitude = "Sample house (invented)", "roof.geojson", "Europe/Vienna", &lat, &lon
	cfg.Climate = survey.Climate{MonthlyGHI: []float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29},
		MonthlyT: []float64{-1.0, 1.0, 5.2, 10.1, 14.8, 18.2, 20.1, 19.6, 15.2, 9.9, 4.3, 0.2}, LowTempC: -16, HighTempC: 34, Albedo: 0.2}
	cfg.Module = survey.Module{PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1,
		TempCoeffVocPct: -0.27, TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34, CellsSeries: 120, HalfCut: true, BypassDiodes: 3,
		LengthM: 1.72, WidthM: 1.134, MaxSystemVoltage: 1000, Mounting: "rails"}
	cfg.Inverter = survey.Inverter{Count: 1, ACPowerW: 6000, MaxDCVoltageV: 600, MPPTMinV: 90, MPPTMaxV: 560, Inputs: 2, MaxInputCurrentA: 16,
		EfficiencyPct: []any{[]any{0.05, 92.0}, []any{0.1, 94.8}, []any{0.2, 96.4}, []any{0.3, 96.9}, []any{0.5, 97.2}, []any{1.0, 96.8}},
		NightW:        1, Transformerless: true}
	cfg.Fill.Orientation, cfg.Fill.SetbackM = "best", 0.4
	return cfg
}

// hallConfig is the site file yield/internal/roofgen writes for the hall roof, in Go.
func hallConfig(inputs int) *survey.Config {
	cfg := exampleConfig()
	lat, lon := roofgen.LatDeg, roofgen.LonDeg
	cfg.Name, cfg.Latitude, cfg.Longitude = "Large hall roof (invented)", &lat, &lon
	cfg.Inverter = survey.Inverter{Count: 1, ACPowerW: 150000, MaxDCVoltageV: 1000, MPPTMinV: 200, MPPTMaxV: 850, Inputs: float64(inputs),
		MaxInputCurrentA: 30, EfficiencyPct: []any{[]any{0.05, 93.0}, []any{0.1, 95.5}, []any{0.2, 97.0}, []any{0.3, 97.6}, []any{0.5, 98.0}, []any{1.0, 97.7}},
		NightW: 5, Transformerless: true}
	cfg.Fill.Orientation = "portrait"
	return cfg
}

// benchSurvey runs the whole survey (load, fill, weather, sun, shade, curves, layouts,
// summary, every report file rendered in memory) of cfg with the map in memory, and reports
// the heap's peak as seen by the runtime (sys-MB: memory obtained from the system).
func benchSurvey(b *testing.B, cfg *survey.Config, mapData []byte) {
	if errs := cfg.Validate(); len(errs) > 0 {
		b.Fatal(errs)
	}
	read := func(path, what string) ([]byte, error) {
		if path == cfg.Path(cfg.Map) {
			return mapData, nil
		}
		return nil, fmt.Errorf("%s: no such %s", path, what)
	}
	b.ReportAllocs()
	var modules int
	cpu0 := cpuSeconds()
	stageS := make([]float64, len(surveyStages))
	stageC := make([]float64, len(surveyStages))
	for b.Loop() {
		// Each stage lasts from its first progress report to the next stage's; its CPU time
		// (the …-s-cpu metrics) against its wall time shows a stage that leaves a core idle.
		var mu sync.Mutex
		first := map[string]time.Time{"": time.Now()}
		firstCPU := map[string]float64{"": cpuSeconds()}
		mark := func(stage string, _, _ int) {
			mu.Lock()
			defer mu.Unlock()
			if _, ok := first[stage]; !ok {
				first[stage] = time.Now()
				firstCPU[stage] = cpuSeconds()
			}
		}
		p, err := survey.Load(cfg, read)
		if err != nil {
			b.Fatal(err)
		}
		res, err := p.Run(context.Background(), survey.Options{Progress: mark})
		if err != nil {
			b.Fatal(err)
		}
		mark("run done", 0, 0)
		if _, err := res.Render(survey.RenderOptions{Progress: mark}); err != nil {
			b.Fatal(err)
		}
		mark("render done", 0, 0)
		for i := range surveyStages[:len(surveyStages)-1] {
			t0, ok0 := first[surveyStages[i].stage]
			t1, ok1 := first[surveyStages[i+1].stage]
			if ok0 && ok1 {
				stageS[i] += t1.Sub(t0).Seconds()
				stageC[i] += firstCPU[surveyStages[i+1].stage] - firstCPU[surveyStages[i].stage]
			}
		}
		modules = res.Summary.Modules
	}
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	b.ReportMetric((cpuSeconds()-cpu0)/float64(b.N), "cpu-s/op")
	b.ReportMetric(float64(modules), "modules")
	b.ReportMetric(float64(ms.Sys)/(1<<20), "sys-MB")
	for i, st := range surveyStages[:len(surveyStages)-1] {
		b.ReportMetric(stageS[i]/float64(b.N), st.metric)
		b.ReportMetric(stageC[i]/float64(b.N), st.metric+"-cpu")
	}
}

// surveyStages are the survey's stages in order, by the name their progress reports carry
// ("" the start, before the first report), and the metric of each one's wall time.
var surveyStages = []struct{ stage, metric string }{
	{"", "setup-s"},
	{"shading", "shading-s"},
	{"module curves", "curves-s"},
	{"unshaded reference", "unshaded-s"},
	{"layout search", "search-s"},
	{survey.AlternativesStage, "alternatives-s"},
	{"run done", "summary-s"},
	{survey.RenderStage, "report-s"},
	{"render done", ""},
}

// BenchmarkSurvey is the whole survey of the example house and of the large hall roof (437
// modules, 20 rooftop units, trees, a 10-input inverter with two strings an input), to be
// compared in the same run: go test -run '^$' -bench 'Survey$' -benchtime 1x ./yield/survey
func BenchmarkSurvey(b *testing.B) {
	example, err := os.ReadFile("../../examples/sample-house/roof.geojson")
	if err != nil {
		b.Fatal(err)
	}
	b.Run("site=example", func(b *testing.B) { benchSurvey(b, exampleConfig(), example) })
	b.Run("site=hall", func(b *testing.B) { benchSurvey(b, hallConfig(10), roofgen.Map(roofgen.Options{})) })
}

// BenchmarkSurveyGrowth is the whole survey of hall roofs of about 120 to 1,000 modules (the
// same density of rooftop units), with as many inputs as two strings of up to 23 modules an
// input need: one inverter of up to 12 inputs, else several alike (inverter.count) that share
// the inputs and the AC power.
func BenchmarkSurveyGrowth(b *testing.B) {
	for _, n := range []int{120, 250, 430, 700, 1000} {
		b.Run(fmt.Sprintf("modules=%d", n), func(b *testing.B) {
			need := (n + 45) / 46
			count := (need + 11) / 12
			cfg := hallConfig((need + count - 1) / count)
			cfg.Inverter.Count = float64(count)
			cfg.Inverter.ACPowerW = 410 * float64(n) * 0.85 / float64(count)
			benchSurvey(b, cfg, roofgen.Map(roofgen.Options{Modules: n}))
		})
	}
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
