package layout

import (
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/yield/electric"
	"sunstring/yield/irradiance"
)

func TestStringBoundsWorkedExample(t *testing.T) {
	// Worked hand calculation from the IEC 62548-1 rule (a regression value, not a published
	// one): Voc 40.0 V, −0.30 %/K, −10 °C → 40.0·(1 − 0.003·(−35)) = 44.20 V a module;
	// 1000 V / 44.20 V = 22.6 → at most 22 modules. Vmp 33.0 V, −0.37 %/K at a 70 °C cell →
	// 33.0·(1 − 0.0037·45) = 27.51 V; 200 V / 27.51 V = 7.27 → at least 8. (The Vmp coefficient
	// is the Pmax coefficient less the Isc one, here 0.)
	ds := electric.Datasheet{VocV: 40, VmpV: 33, ImpA: 9, TempCoeffVocPct: -0.30, TempCoeffPmaxPct: -0.37}
	inv := electric.Inverter{MaxDCVoltageV: 1000, MPPTMinV: 200, MPPTMaxV: 2000, MaxInputCurrentA: 20}
	// The rise of the cell above the air does not depend on the air temperature in the
	// mounting model, so this air temperature puts the hot cell at 70 °C.
	b, err := StringBounds(ds, inv, Limits{LowTempC: -10, HighTempC: 70 - irradiance.Rails.HotCellC(0)})
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(b.VocColdV, 44.20, 0.005) || !scalar.EqualWithinAbs(b.VmpHotV, 27.51, 0.005) {
		t.Errorf("Voc cold %.3f V (want 44.20), Vmp hot %.3f V (want 27.51)", b.VocColdV, b.VmpHotV)
	}
	if b.MaxSeries != 22 || b.MinSeries != 8 || b.MaxParallel != 2 {
		t.Errorf("bounds %+v, want 8..22 in series, 2 in parallel (20 A / 9 A)", b)
	}
}

func TestSequential(t *testing.T) {
	for _, c := range []struct {
		name    string
		n       int
		inputs  int
		b       Bounds
		lengths [][]int // per input, per string
		left    int
	}{
		{"one string", 10, 2, Bounds{MinSeries: 4, MaxSeries: 14, MaxParallel: 1}, [][]int{{10}}, 0},
		{"split over two inputs", 17, 2, Bounds{MinSeries: 4, MaxSeries: 14, MaxParallel: 1}, [][]int{{8}, {9}}, 0},
		{"too many modules", 30, 2, Bounds{MinSeries: 4, MaxSeries: 14, MaxParallel: 1}, [][]int{{14}, {14}}, 2},
		{"parallel strings equal", 36, 1, Bounds{MinSeries: 4, MaxSeries: 14, MaxParallel: 3}, [][]int{{12, 12, 12}}, 0},
	} {
		t.Run(c.name, func(t *testing.T) {
			order := make([]int, c.n)
			for i := range order {
				order[i] = i
			}
			l, left, err := Sequential(order, c.inputs, c.b)
			if err != nil {
				t.Fatal(err)
			}
			if left != c.left {
				t.Errorf("left out %d, want %d", left, c.left)
			}
			var got [][]int
			used := map[int]bool{}
			for _, in := range l.Inputs {
				var ls []int
				for _, s := range in {
					ls = append(ls, len(s))
					for _, m := range s {
						if used[m] {
							t.Errorf("module %d used twice", m)
						}
						used[m] = true
					}
				}
				got = append(got, ls)
			}
			if len(got) != len(c.lengths) {
				t.Fatalf("inputs %v, want %v", got, c.lengths)
			}
			for i := range got {
				if len(got[i]) != len(c.lengths[i]) {
					t.Fatalf("inputs %v, want %v", got, c.lengths)
				}
				for j := range got[i] {
					if got[i][j] != c.lengths[i][j] {
						t.Errorf("inputs %v, want %v", got, c.lengths)
					}
				}
			}
		})
	}
}

// TestBoundsAgreeWithChecks: every string length the bounds allow passes the voltage checks
// that are reported (electric.CheckStrings), and the lengths just outside fail one — the
// two use the same formulas (a property over seeded datasheets and windows).
func TestBoundsAgreeWithChecks(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	for range 200 {
		ds := electric.Datasheet{PowerW: 400, VocV: 35 + 15*r.Float64(), IscA: 10 + 4*r.Float64(), CellsSeries: 60, BypassDiodes: 3,
			TempCoeffVocPct: -0.2 - 0.2*r.Float64(), TempCoeffIscPct: 0.03 + 0.05*r.Float64(), TempCoeffPmaxPct: -0.28 - 0.15*r.Float64()}
		ds.VmpV = ds.VocV * (0.80 + 0.04*r.Float64())
		ds.ImpA = ds.IscA * (0.92 + 0.04*r.Float64())
		ds.PowerW = ds.VmpV * ds.ImpA
		inv := electric.Inverter{ACPowerW: 6000, MaxDCVoltageV: 600 + 400*r.Float64(), MPPTMinV: 80 + 150*r.Float64(), Inputs: 1,
			MaxInputCurrentA: 30, Efficiency: []electric.EffPoint{{LoadFrac: 1, Eff: 0.97}}}
		inv.MPPTMaxV = inv.MaxDCVoltageV * 0.9
		lim := Limits{LowTempC: -25 + 20*r.Float64(), HighTempC: 25 + 20*r.Float64(), Mounting: irradiance.Mounting(r.IntN(3))}
		b, err := StringBounds(ds, inv, lim)
		if err != nil {
			continue
		}
		hot := lim.Mounting.HotCellC(lim.HighTempC)
		voltage := func(n int) []electric.Finding {
			var out []electric.Finding
			for _, f := range electric.CheckStrings(ds, [][]int{{n}}, lim.LowTempC, hot, inv) {
				if f.Unit == "V" {
					out = append(out, f)
				}
			}
			return out
		}
		for n := b.MinSeries; n <= b.MaxSeries; n++ {
			if fs := voltage(n); len(fs) > 0 {
				t.Fatalf("%d modules within bounds %d..%d but flagged: %s", n, b.MinSeries, b.MaxSeries, fs[0].Message)
			}
		}
		if b.MinSeries > 1 && len(voltage(b.MinSeries-1)) == 0 {
			t.Fatalf("%d modules below the bounds pass every check", b.MinSeries-1)
		}
		if len(voltage(b.MaxSeries+1)) == 0 {
			t.Fatalf("%d modules above the bounds pass every check", b.MaxSeries+1)
		}
	}
}
