package yield

import (
	"context"
	"math"
	"testing"
	"time"

	"github.com/paulmach/orb"
	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/geo"
	"sunstring/shading/sun"
	"sunstring/yield/electric"
	"sunstring/yield/irradiance"
	"sunstring/yield/weather"
)

// An invented 60-cell module for the tests (not a real product), with the ratios of a typical
// datasheet (Imp/Isc 0.94, Vmp/Voc 0.82).
var testModule = electric.Datasheet{
	PowerW: 300, VocV: 39.8, IscA: 9.8, VmpV: 32.6, ImpA: 9.2,
	TempCoeffVocPct: -0.29, TempCoeffIscPct: 0.05, TempCoeffPmaxPct: -0.38,
	CellsSeries: 60, BypassDiodes: 3,
}

var testInverter = electric.Inverter{
	ACPowerW: 4000, MaxDCVoltageV: 600, MPPTMinV: 100, MPPTMaxV: 550, Inputs: 1,
	MaxInputCurrentA: 12, Efficiency: []electric.EffPoint{{LoadFrac: 1, Eff: 0.97}}, NightW: 1,
}

// testSite is a 10 m × 6 m face facing south at 35° (plan), with an optional wall of height
// wallM 3 m south of the eave.
func testSite(t *testing.T, wallM float64) (*geo.Site, []geo.Module) {
	t.Helper()
	face := geo.Face{ID: "S", PitchDeg: 35, AspectDeg: 180, EaveHeightM: 3,
		Plan: orb.Ring{{0, 0}, {10, 0}, {10, 6}, {0, 6}, {0, 0}}}
	face.SetEave()
	site := &geo.Site{Proj: geo.NewENU(15, 47, 0), Faces: []geo.Face{face}}
	if wallM > 0 {
		site.Blocks = append(site.Blocks, geo.Block{ID: "wall", Footprint: orb.Ring{{-20, -3.5}, {30, -3.5}, {30, -3}, {-20, -3}, {-20, -3.5}}, HeightM: wallM})
	}
	mods, _, err := geo.Fill(site, geo.FillOptions{LengthM: 1.65, WidthM: 0.99, Grid: geo.CellGrid{Cols: 6, Rows: 10}, SetbackM: 0.3, GapM: 0.02})
	if err != nil {
		t.Fatal(err)
	}
	return site, mods
}

func prepare(t *testing.T, wallM, ghiScale float64) (*Model, electric.Layout) {
	t.Helper()
	site, mods := testSite(t, wallM)
	zone, _ := time.LoadLocation("Europe/Vienna")
	// Invented monthly GHI of a central European site (kWh/m²) and air temperatures (°C).
	ghi := [12]float64{35, 55, 95, 130, 160, 170, 175, 150, 105, 70, 38, 28}
	for i := range ghi {
		ghi[i] *= ghiScale
	}
	temp := [12]float64{-1, 1, 5, 10, 15, 18, 20, 19.5, 15, 10, 4, 0}
	ws, err := weather.FromMonthly(weather.Site{LatDeg: 47, LonDeg: 15, Zone: zone}, ghi, temp)
	if err != nil {
		t.Fatal(err)
	}
	m, err := Prepare(context.Background(), Input{
		Site: site, Modules: mods, Weather: ws, Observer: sun.Observer{LatDeg: 47, LonDeg: 15}, Zone: zone,
		System: System{Module: testModule, Inverter: testInverter, Albedo: 0.2,
			Losses: Losses{SoilingPct: 2, WiringPct: 1, MismatchPct: 1, AvailabilityPct: 0.5}},
	})
	if err != nil {
		t.Fatal(err)
	}
	// One string of as many modules as fit the window (at most 14 here).
	n := min(len(mods), 14)
	s := make([]int, n)
	for i := range s {
		s[i] = i
	}
	return m, electric.Layout{Inputs: [][][]int{{s}}}
}

func TestOpenRoof(t *testing.T) {
	m, l := prepare(t, 0, 1)
	r, err := m.Evaluate(l, electric.EvalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// Analytic: nothing around the face, so no beam is ever blocked (the face's own plane
	// is not an obstruction); the sky-view factor is the isotropic (1 + cos β)/2 reference.
	for i, st := range m.Stats {
		if st.BeamShadeLossPct > 1e-9 {
			t.Errorf("module %d beam shade loss %.4f %% on an open roof", i, st.BeamShadeLossPct)
		}
		if !scalar.EqualWithinAbs(st.SkyView, 1, 0.01) {
			t.Errorf("module %d sky view %.3f, want 1 (fraction of an open plane's)", i, st.SkyView)
		}
	}
	// Ratio of annual POA on a south face tilted 35° to GHI at 47° N: 1.10–1.20 (from
	// memory: handbook values for a near-optimal tilt at mid-latitudes).
	// 1211 kWh/m² is the sum of the monthly GHI that prepare gives.
	ratio := m.Stats[0].POAUnshadedKWhM2 / 1211
	if ratio < 1.10 || ratio > 1.20 {
		t.Errorf("POA/GHI = %.3f, want 1.10–1.20", ratio)
	}
	// The loss breakdown closes: nominal − Σ losses = AC (to rounding).
	sum := 0.0
	for _, s := range r.Losses {
		sum += s.KWh
		if s.Step == StepShadeLight && s.KWh > 1e-6 {
			t.Errorf("shade loss %.3f kWh on an open roof", s.KWh)
		}
	}
	if !scalar.EqualWithinAbs(r.NominalDCkWh-sum, r.ACkWh, 1e-6*r.NominalDCkWh) {
		t.Errorf("nominal %.1f − losses %.1f = %.1f ≠ AC %.1f", r.NominalDCkWh, sum, r.NominalDCkWh-sum, r.ACkWh)
	}
	// Performance ratio of an unshaded modern system: 0.75–0.85 (IEC 61724-1 definition;
	// trade literature range). Here with 2 % soiling and 2.5 % flat losses.
	kwp := float64(len(l.Inputs[0][0])) * testModule.PowerW / 1000
	pr := r.ACkWh / kwp / m.Stats[0].POAUnshadedKWhM2
	if pr < 0.75 || pr > 0.88 {
		t.Errorf("performance ratio %.3f, want 0.75–0.88", pr)
	}
	if r.ShadeLossPct > 0.01 {
		t.Errorf("layout shade loss %.3f %% on an open roof", r.ShadeLossPct)
	}
}

func TestWallShadesAndCosts(t *testing.T) {
	open, l := prepare(t, 0, 1)
	walled, _ := prepare(t, 6, 1)
	ro, _ := open.Evaluate(l, electric.EvalOptions{})
	rw, _ := walled.Evaluate(l, electric.EvalOptions{})
	if !(rw.ACkWh < ro.ACkWh) {
		t.Errorf("a 6 m wall south of the roof gives %.0f kWh, not less than %.0f open", rw.ACkWh, ro.ACkWh)
	}
	// The lowest row sits closest to the wall: its beam loss is the largest (analytic: the
	// profile angle of the wall's top is steepest from the eave).
	var row1, rowTop float64
	for i, st := range walled.Stats {
		switch walled.In.Modules[i].Row {
		case 1:
			row1 = math.Max(row1, st.BeamShadeLossPct)
		default:
			rowTop = math.Max(rowTop, st.BeamShadeLossPct)
		}
	}
	if !(row1 > rowTop) {
		t.Errorf("row 1 beam loss %.2f %% not above the upper rows' %.2f %%", row1, rowTop)
	}
	// The string's electrical shade loss exceeds the irradiance lost: one shaded module
	// drags its string down (common practice).
	lostIrr := 100 * (1 - walled.POAShadedWh/walled.POAUnshadedWh)
	if !(rw.ShadeLossPct > lostIrr) {
		t.Errorf("layout shade loss %.2f %% not above the irradiance shade loss %.2f %%", rw.ShadeLossPct, lostIrr)
	}
	// The shade split is the layout's shade loss, and its parts add up to it (by
	// construction; a change that splits differently must keep the sum).
	sp := rw.Shade
	if !scalar.EqualWithinAbs(sp.LostPct, rw.ShadeLossPct, 1e-9) {
		t.Errorf("shade split %.3f %%, layout shade loss %.3f %%", sp.LostPct, rw.ShadeLossPct)
	}
	var parts float64
	for _, p := range sp.Parts {
		parts += p.Pct
	}
	if !scalar.EqualWithinAbs(parts, sp.LostPct, 1e-9) {
		t.Errorf("shade parts add up to %.3f %%, want %.3f %%", parts, sp.LostPct)
	}
	// A wall's edge crosses the lowest row's cells: the partly shaded modules lose more
	// than their lost light (bypass diodes), and the string follows its weakest module;
	// both parts are positive (common practice).
	if !(sp.Parts[1].KWh > 0 && sp.Parts[2].KWh > 0 && sp.Parts[0].KWh > 0) {
		t.Errorf("shade parts %+v: want each positive under a wall's edge", sp.Parts)
	}
	// The open roof has no shade to split, and the heat step there is the modules' own.
	for _, p := range ro.Shade.Parts {
		if math.Abs(p.Pct) > 0.01 {
			t.Errorf("open roof: shade part %q %.3f %%, want 0", p.Cause, p.Pct)
		}
	}
	// Groups follow the energy's way, each step in one of them and in their order.
	gi := map[string]int{}
	for i, g := range LossGroups {
		gi[g] = i
	}
	last := 0
	for _, st := range rw.Losses {
		i, ok := gi[st.Group]
		if !ok || i < last {
			t.Errorf("step %q in group %q: unknown or out of order", st.Step, st.Group)
		}
		last = i
	}
}

func TestMoreSunMoreEnergy(t *testing.T) {
	// Property: scaling every month's GHI up never lowers the AC energy.
	var prev float64
	for _, k := range []float64{0.6, 0.8, 1.0} {
		m, l := prepare(t, 3, k)
		r, err := m.Evaluate(l, electric.EvalOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if r.ACkWh < prev {
			t.Errorf("GHI × %.1f gives %.1f kWh, less than %.1f before", k, r.ACkWh, prev)
		}
		for _, v := range r.MonthlyACkWh {
			if v < -0.05 {
				t.Errorf("negative monthly energy %.2f kWh", v)
			}
		}
		prev = r.ACkWh
	}
}

func TestStepSunSunrise(t *testing.T) {
	// The sunrise interval is evaluated at the middle of its sunlit part (package weather): the
	// sunlit fraction matches the sunrise time from RiseTransitSet (Reda & Andreas 2004,
	// appendix A.2), and the sun is up at the returned position. RiseTransitSet's sunrise is
	// the upper limb at the horizon (centre at −0.8333°), stepSun's the centre at the
	// refraction-corrected horizon: about 0.35° of true elevation apart, which the sun climbs
	// in about two minutes at 47° N in March (10°/h); hence the tolerance of 3 minutes.
	o := sun.Observer{LatDeg: 47, LonDeg: 15}
	zone, _ := time.LoadLocation("Europe/Vienna")
	day := sun.RiseTransitSet(time.Date(2025, 3, 20, 12, 0, 0, 0, zone), o)
	start := day.Sunrise.Truncate(time.Hour)
	end := start.Add(time.Hour)
	p, lit := stepSun(start, end, o)
	want := end.Sub(day.Sunrise).Hours()
	if !scalar.EqualWithinAbs(lit, want, 3.0/60) || lit > want {
		t.Errorf("sunlit fraction %.4f, want %.4f (sunrise %v)", lit, want, day.Sunrise)
	}
	if !p.Up() {
		t.Error("sun below the horizon at the sunlit part's middle")
	}
}

// TestUnshadedReference: a layout's shade loss is measured against the same layout without
// shade, so an open roof of two orientations in one string loses nothing "to shade" (its
// orientation mismatch has its own row), and no month gives more with shade than without.
func TestUnshadedReference(t *testing.T) {
	east := geo.Face{ID: "E", PitchDeg: 30, AspectDeg: 90, EaveHeightM: 3, Plan: orb.Ring{{0, 0}, {5, 0}, {5, 8}, {0, 8}, {0, 0}}}
	west := geo.Face{ID: "W", PitchDeg: 30, AspectDeg: 270, EaveHeightM: 3, Plan: orb.Ring{{-5, 0}, {0, 0}, {0, 8}, {-5, 8}, {-5, 0}}}
	east.SetEave()
	west.SetEave()
	site := &geo.Site{Proj: geo.NewENU(15, 47, 0), Faces: []geo.Face{east, west}}
	mods, _, err := geo.Fill(site, geo.FillOptions{LengthM: 1.65, WidthM: 0.99, Grid: geo.CellGrid{Cols: 6, Rows: 10}, SetbackM: 0.3, GapM: 0.02})
	if err != nil {
		t.Fatal(err)
	}
	zone, _ := time.LoadLocation("Europe/Vienna")
	ghi := [12]float64{35, 55, 95, 130, 160, 170, 175, 150, 105, 70, 38, 28}
	temp := [12]float64{-1, 1, 5, 10, 15, 18, 20, 19.5, 15, 10, 4, 0}
	ws, err := weather.FromMonthly(weather.Site{LatDeg: 47, LonDeg: 15, Zone: zone}, ghi, temp)
	if err != nil {
		t.Fatal(err)
	}
	m, err := Prepare(context.Background(), Input{Site: site, Modules: mods, Weather: ws, Observer: sun.Observer{LatDeg: 47, LonDeg: 15}, Zone: zone,
		System: System{Module: testModule, Inverter: testInverter, Albedo: 0.2}})
	if err != nil {
		t.Fatal(err)
	}
	// One string of up to 14 modules taken alternately from both faces: east and west in
	// series, the classic mismatch without any shade.
	var e, w []int
	for i, mod := range mods {
		if mod.Face == "E" {
			e = append(e, i)
		} else {
			w = append(w, i)
		}
	}
	var s []int
	for k := 0; len(s) < 14 && (k < len(e) || k < len(w)); k++ {
		if k < len(e) {
			s = append(s, e[k])
		}
		if k < len(w) && len(s) < 14 {
			s = append(s, w[k])
		}
	}
	r, err := m.Evaluate(electric.Layout{Inputs: [][][]int{{s}}}, electric.EvalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// Analytic: nothing casts a shadow (the two faces of a gable roof slope away from their
	// common ridge), so the layout's shade loss is nil to rounding.
	if math.Abs(r.ShadeLossPct) > 0.01 {
		t.Errorf("layout shade loss %.3f %% with no shade", r.ShadeLossPct)
	}
	var plain, underShade float64
	for _, l := range r.Losses {
		switch l.Step {
		case StepUnlike:
			plain = l.Pct
		case StepShadeStrings:
			underShade = l.Pct
		}
	}
	// East and west faces at 30° in one string lose to mismatch: positive, and less than
	// bypassing the weaker face for the whole half-day in which it is weaker would cost
	// (about its share of each half-day's energy, under 30 % — analytic bound); none of it
	// is shade.
	if plain < 0.5 || plain > 30 || math.Abs(underShade) > 0.05 {
		t.Errorf("mismatch without shade %.2f %%, under shade %.3f %%: want a few %% and none", plain, underShade)
	}
	for i := range 12 {
		if d := r.MonthlyACkWh[i] - r.MonthlyUnshadedACkWh[i]; math.Abs(d) > 1e-6*math.Max(1, r.MonthlyUnshadedACkWh[i]) {
			t.Errorf("month %d: %.3f kWh with shade model, %.3f without, on an open roof", i+1, r.MonthlyACkWh[i], r.MonthlyUnshadedACkWh[i])
		}
	}
	// And with a wall: every month gives no more with shade than without.
	walled, l := prepare(t, 6, 1)
	rw, err := walled.Evaluate(l, electric.EvalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for i := range 12 {
		if rw.MonthlyACkWh[i] > rw.MonthlyUnshadedACkWh[i]+1e-9 {
			t.Errorf("month %d: %.2f kWh with the wall's shade, more than %.2f without", i+1, rw.MonthlyACkWh[i], rw.MonthlyUnshadedACkWh[i])
		}
	}
}

// TestLowSunYear runs a year in which every hour carries the record that once stopped a
// survey: GHI 67, DNI 45, DHI 65 W/m² (legal values), so that every sunrise and sunset
// interval meets it with the sun within a fraction of a degree of the horizon, where the
// Perez fit leaves its data (F1 > 1). The year must build, and every module's DC energy be
// positive: no cell is ever given negative light, and no internal limit stops the run.
func TestLowSunYear(t *testing.T) {
	// A wall higher than the eave hides more of the horizon band than of the dome from the
	// lower modules, so the band's part cannot make up for a negative dome part.
	site, mods := testSite(t, 6)
	recs := make([]weather.Record, 8760)
	start := time.Date(weather.TypicalYear, 1, 1, 1, 0, 0, 0, time.UTC)
	for i := range recs {
		recs[i] = weather.Record{End: start.Add(time.Duration(i) * time.Hour), GHI: 67, DNI: 45, DHI: 65, AirTempC: 10, WindMS: 1}
	}
	ws := &weather.Series{Interval: time.Hour, Records: recs, Source: weather.SourceFile}
	m, err := Prepare(context.Background(), Input{
		Site: site, Modules: mods, Weather: ws, Observer: sun.Observer{LatDeg: 47, LonDeg: 15},
		System: System{Module: testModule, Inverter: testInverter, Albedo: 0.2},
	})
	if err != nil {
		t.Fatalf("Prepare: %v", err)
	}
	for i, wh := range m.Year.ModuleDCWh() {
		if !(wh > 0) {
			t.Errorf("module %d: DC %g Wh, want positive", i, wh)
		}
	}
}

// TestExtremeLegalWeather: records at the edges of what the weather readers accept (GHI, DNI
// and DHI 1500 W/m² every hour, air at 70 °C or −70 °C, no wind), on the hottest mounting,
// must give a year, not a failure: no internal limit of the curves is reachable from legal
// input.
func TestExtremeLegalWeather(t *testing.T) {
	site, mods := testSite(t, 6)
	mods = mods[len(mods)-8:]
	for _, air := range []float64{70, -70} {
		recs := make([]weather.Record, 8760)
		start := time.Date(weather.TypicalYear, 1, 1, 1, 0, 0, 0, time.UTC)
		for i := range recs {
			recs[i] = weather.Record{End: start.Add(time.Duration(i) * time.Hour), GHI: 1500, DNI: 1500, DHI: 1500, AirTempC: air}
		}
		ws := &weather.Series{Interval: time.Hour, Records: recs, Source: weather.SourceFile}
		m, err := Prepare(context.Background(), Input{
			Site: site, Modules: mods, Weather: ws, Observer: sun.Observer{LatDeg: 47, LonDeg: 15},
			System: System{Module: testModule, Inverter: testInverter, Albedo: 1, Mounting: irradiance.Flush},
		})
		if err != nil {
			t.Fatalf("air %g °C: Prepare: %v", air, err)
		}
		for i, wh := range m.Year.ModuleDCWh() {
			if !(wh >= 0) || math.IsInf(wh, 0) {
				t.Errorf("air %g °C, module %d: DC %g Wh", air, i, wh)
			}
		}
	}
}
