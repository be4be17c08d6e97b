package yield

import (
	"context"
	"sync"
	"testing"
	"time"

	"sunstring/shading/sun"
	"sunstring/yield/weather"
)

// TestPrepareProgress: every long stage of Prepare reports its real amount of work (shading
// counts modules, the curves count sun-up steps), never goes backwards, and ends at its total.
func TestPrepareProgress(t *testing.T) {
	site, mods := testSite(t, 2)
	zone, _ := time.LoadLocation("Europe/Vienna")
	ghi := [12]float64{35, 55, 95, 130, 160, 170, 175, 150, 105, 70, 38, 28} // invented, kWh/m²
	temp := [12]float64{-1, 1, 5, 10, 15, 18, 20, 19.5, 15, 10, 4, 0}        // invented, °C
	ws, err := weather.FromMonthly(weather.Site{LatDeg: 47, LonDeg: 15, Zone: zone}, ghi, temp)
	if err != nil {
		t.Fatal(err)
	}
	w := *ws
	w.Records = ws.Records[:24*30]
	type seen struct{ last, total, calls int }
	var mu sync.Mutex
	stages := map[string]*seen{}
	m, err := Prepare(context.Background(), Input{Site: site, Modules: mods, Weather: &w, Observer: sun.Observer{LatDeg: 47, LonDeg: 15},
		Zone: zone, System: System{Module: testModule, Inverter: testInverter, Albedo: 0.2},
		Progress: func(stage string, done, total int) {
			mu.Lock()
			defer mu.Unlock()
			st := stages[stage]
			if st == nil {
				st = &seen{last: -1, total: total}
				stages[stage] = st
			}
			if total != st.total || done < st.last || done > total {
				t.Errorf("%s: %d of %d after %d of %d", stage, done, total, st.last, st.total)
			}
			st.last = max(st.last, done)
			st.calls++
		}})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		stage string
		work  int
	}{{"shading", len(mods)}, {"module curves", len(m.StepRecord)}, {"unshaded reference", len(m.StepRecord)}} {
		st := stages[c.stage]
		if st == nil {
			t.Errorf("%s: no progress reported", c.stage)
			continue
		}
		if st.total != c.work || st.last != c.work {
			t.Errorf("%s: ended at %d of %d, want %d of %d", c.stage, st.last, st.total, c.work, c.work)
		}
	}
}
