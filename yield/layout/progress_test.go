package layout

import (
	"context"
	"sync"
	"testing"
)

// TestSearchProgress: the search tells its progress in evaluated layouts against the most it
// may still evaluate. Done never falls and never passes the total, the total never grows,
// and the last call has done equal to the total and to the layouts evaluated, whether the
// search enumerates every layout, stops at a local optimum before its budget, or runs
// several levels (fewer inputs, then leave-out).
func TestSearchProgress(t *testing.T) {
	for _, c := range []struct {
		name     string
		n, cols  int
		inputs   int
		b        Bounds
		leaveOut bool
		maxEvals int
	}{
		{"small roof, every layout enumerated", 8, 4, 2, Bounds{MinSeries: 3, MaxSeries: 6, MaxParallel: 1}, false, 400},
		{"local search on one level", 16, 4, 1, Bounds{MinSeries: 4, MaxSeries: 8, MaxParallel: 2}, false, 60},
		{"three levels, budget to spare", 24, 6, 2, Bounds{MinSeries: 4, MaxSeries: 9, MaxParallel: 2}, true, 400},
		{"three levels, budget spent", 24, 6, 2, Bounds{MinSeries: 4, MaxSeries: 9, MaxParallel: 2}, true, 40},
	} {
		t.Run(c.name, func(t *testing.T) {
			r := randomRoof(c.n, c.cols, 48, 6, 11)
			p := Problem{Features: r.features(), Positions: r.pos, Bounds: c.b, Inputs: c.inputs}
			var mu sync.Mutex
			var calls [][2]int
			res, err := Search(context.Background(), p, r.eval, Options{LeaveOut: c.leaveOut, MaxEvals: c.maxEvals,
				Progress: func(done, total int) {
					mu.Lock()
					calls = append(calls, [2]int{done, total})
					mu.Unlock()
				}})
			if err != nil {
				t.Fatal(err)
			}
			if len(calls) == 0 {
				t.Fatal("no progress reported")
			}
			for i, cl := range calls {
				if cl[0] > cl[1] {
					t.Errorf("call %d: %d done of %d", i, cl[0], cl[1])
				}
				if i > 0 && (cl[0] < calls[i-1][0] || cl[1] > calls[i-1][1]) {
					t.Errorf("call %d: %d of %d after %d of %d: done fell or the total grew", i, cl[0], cl[1], calls[i-1][0], calls[i-1][1])
				}
			}
			last := calls[len(calls)-1]
			if last[0] != last[1] || last[0] != res.Evaluated {
				t.Errorf("ended at %d of %d, %d layouts evaluated", last[0], last[1], res.Evaluated)
			}
			t.Logf("%d calls, first total %d, %d evaluated", len(calls), calls[0][1], res.Evaluated)
		})
	}
}
