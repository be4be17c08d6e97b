package yield

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"sync"
	"sync/atomic"
	"time"

	"sunstring/geo"
	"sunstring/shading"
	"sunstring/shading/sun"
	"sunstring/yield/electric"
	"sunstring/yield/internal/bigmem"
	"sunstring/yield/irradiance"
)

// Prepare computes sun positions, shade, irradiance and the year of module curves, one stage
// after the other: the sun-up steps, the shade on every cell, each module's geometry and
// views, the year of module curves with the irradiance sums, the unshaded reference year and
// the per-module statistics.
func Prepare(ctx context.Context, in Input) (*Model, error) {
	if len(in.Modules) == 0 {
		return nil, ErrNoModules
	}
	if in.Weather == nil || len(in.Weather.Records) == 0 {
		return nil, errors.New("yield: empty weather series")
	}
	if in.Zone == nil {
		in.Zone = time.UTC
	}
	p, err := newPrep(in)
	if err != nil {
		return nil, err
	}
	m := p.m
	if err := p.sunSteps(ctx); err != nil {
		return nil, err
	}
	scene, err := p.shade(ctx)
	if err != nil {
		return nil, err
	}
	p.geometry(scene)
	if err := p.shadedYear(); err != nil {
		return nil, err
	}
	if err := p.unshadedYear(); err != nil {
		return nil, err
	}
	p.finish()
	return m, nil
}

// newPrep starts Prepare's state: the module and an empty model.
func newPrep(in Input) (*prep, error) {
	mod, err := electric.NewModule(in.System.Module)
	if err != nil {
		return nil, fmt.Errorf("yield: module: %w", err)
	}
	nm := len(in.Modules)
	m := &Model{In: in, Module: mod, Records: in.Weather.Records, Stats: make([]ModuleStat, nm),
		modPOAUn: make([]float64, nm), modPOASh: make([]float64, nm), modPOAIAM: make([]float64, nm), modPOASoil: make([]float64, nm),
		modPOASoilUn: make([]float64, nm)}
	p := &prep{m: m, in: &m.In, iv: in.Weather.Interval}
	if p.iv <= 0 {
		p.iv = time.Hour
	}
	return p, nil
}

// prep is Prepare's state between its stages.
type prep struct {
	m     *Model
	in    *Input
	iv    time.Duration // weather interval
	ups   []sunStep     // sun-up steps
	steps []shading.Step

	// Per module: plane, views and diffuse incidence modifiers.
	tilt, aspect   []float64
	diff           []shading.Diffuse
	skyIAM, gndIAM []float64

	// Sums over the year: per module beam on the plane without and with shade (for the
	// beam-shade statistic), and the reference irradiation.
	beamSum, beamLit []float64
	refW             float64
	// The unshaded reference's inputs, per step and module: effective irradiance and the
	// cell temperature the module would have without shade.
	unIrr, unTemp []float32
}

// sunStep is one sun-up record: the sun's position and the record's index.
type sunStep struct {
	pos sun.Position
	rec int
}

// sunSteps finds the sun for every record; sun-up records become shading steps, the others
// count as night hours.
func (p *prep) sunSteps(ctx context.Context) error {
	m, in, iv := p.m, p.in, p.iv
	for i, r := range in.Weather.Records {
		pos, lit := stepSun(r.End.Add(-iv), r.End, in.Observer)
		if lit == 0 || !pos.Up() {
			m.NightHours++
			m.MonthNightHours[r.End.Add(-iv/2).In(in.Zone).Month()-1]++
			continue
		}
		p.ups = append(p.ups, sunStep{pos, i})
		mid := r.End.Add(-iv / 2).In(in.Zone)
		p.steps = append(p.steps, shading.Step{Sun: pos.Vector(), Month: mid.Month()})
		m.StepRecord = append(m.StepRecord, i)
		m.StepMonth = append(m.StepMonth, int(mid.Month())-1)
		if i%512 == 0 && ctx.Err() != nil {
			return ctx.Err()
		}
	}
	return nil
}

// shade computes every cell's beam transmittance at every sun-up step.
func (p *prep) shade(ctx context.Context) (*shading.Scene, error) {
	in := p.in
	cols, rows := p.m.Module.Grid()
	scene, err := shading.NewScene(in.Site, in.Modules, shading.Options{Grid: geo.CellGrid{Cols: cols, Rows: rows}, Horizon: in.Horizon})
	if err != nil {
		return nil, fmt.Errorf("yield: shading scene: %w", err)
	}
	var prog func(done, total int)
	if in.Progress != nil {
		prog = func(d, t int) { in.Progress("shading", d, t) }
	}
	shade, err := scene.Compute(ctx, p.steps, prog)
	if err != nil {
		return nil, fmt.Errorf("yield: shading: %w", err)
	}
	p.m.Shade, p.m.Steps, p.m.Scene = shade, p.steps, scene
	return scene, nil
}

// geometry sets each module's tilt and aspect (of its own plane: modules on one face share
// it, hand-drawn panels may not), its sky, horizon and ground views and the diffuse
// incidence modifiers.
func (p *prep) geometry(scene *shading.Scene) {
	in := p.in
	n := len(in.Modules)
	p.tilt, p.aspect = make([]float64, n), make([]float64, n)
	p.diff = make([]shading.Diffuse, n)
	p.skyIAM, p.gndIAM = make([]float64, n), make([]float64, n)
	// The modules' views of sky and ground (a few hundred rays each) on all cores.
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(runtime.GOMAXPROCS(0), n) {
		wg.Go(func() {
			for i := int(next.Add(1) - 1); i < n; i = int(next.Add(1) - 1) {
				p.diff[i] = scene.Diffuse(i)
			}
		})
	}
	wg.Wait()
	for i := range in.Modules {
		nv := in.Modules[i].Normal()
		p.tilt[i] = math.Acos(math.Max(-1, math.Min(1, nv.U))) * 180 / math.Pi
		p.aspect[i] = math.Mod(math.Atan2(nv.E, nv.N)*180/math.Pi+360, 360)
		p.m.Stats[i].SkyView = p.diff[i].SkyView
		if in.System.IAM == IAMASHRAE {
			// The ASHRAE form has no closed diffuse integral; the effective incidence angles
			// of Brandemuehl & Beckman (1980) give its diffuse modifiers: sky
			// 59.7 − 0.1388β + 0.001497β², ground 90 − 0.5788β + 0.002693β² (Duffie &
			// Beckman, Solar Engineering of Thermal Processes, §5.4; from memory).
			b := p.tilt[i]
			p.skyIAM[i] = irradiance.IAMASHRAE(59.7-0.1388*b+0.001497*b*b, ashraeB0)
			p.gndIAM[i] = irradiance.IAMASHRAE(90-0.5788*b+0.002693*b*b, ashraeB0)
		} else {
			p.skyIAM[i], p.gndIAM[i] = irradiance.DiffuseIAMMartinRuiz(p.tilt[i], martinRuizAr)
		}
	}
}

// beamIAM is the beam incidence modifier of the chosen model.
func (p *prep) beamIAM(thetaDeg float64) float64 {
	if p.in.System.IAM == IAMASHRAE {
		return irradiance.IAMASHRAE(thetaDeg, ashraeB0)
	}
	return irradiance.IAMMartinRuiz(thetaDeg, martinRuizAr)
}

// newYear is the year engine Prepare uses: rounded sharing, or exact curves when the input
// asks for them (the accuracy tests' reference).
func (p *prep) newYear(step func(s int, dst *electric.StepInput), concurrent bool) (*electric.Year, error) {
	opt := electric.YearOptions{Exact: p.in.exactCurves, ConcurrentSteps: concurrent}
	return electric.NewYearWith(p.m.Module, len(p.in.Modules), len(p.ups), step, opt)
}

// planeComp is one step's sky on one module plane: the components, unshaded and before
// incidence losses, and the beam's incidence modifier; and what follows from them alone for
// every module of the plane: the total, the effective irradiance with the module's views
// replaced by the whole sky and ground (its unshaded reference) and the cell temperature
// the total gives.
type planeComp struct {
	tc      irradiance.Components // W/m²
	iamB    float64
	unsh    float64 // W/m²
	unIrr   float64 // W/m²
	unTempC float64
}

// planes numbers the modules' planes (tilt and aspect) in order of first appearance and
// returns each module's plane and the first module of each plane.
func (p *prep) planes() (of []int, first []int) {
	seen := map[[2]float64]int{}
	of = make([]int, len(p.tilt))
	for i := range p.tilt {
		key := [2]float64{p.tilt[i], p.aspect[i]}
		k, ok := seen[key]
		if !ok {
			k = len(first)
			seen[key] = k
			first = append(first, i)
		}
		of[i] = k
	}
	return of, first
}

// shadedYear builds the year of module curves: per step and module the cells' effective
// irradiance (beam and circumsolar × transmittance × IAM, diffuse through the module's
// views, soiling) and the cell temperature of the mounting, summing the irradiation statistics and
// keeping the unshaded reference's inputs on the way.
func (p *prep) shadedYear() error {
	m, in, iv := p.m, p.in, p.iv
	n, steps := len(in.Modules), len(p.ups)
	soil := 1 - in.System.Losses.SoilingPct/100
	area := in.Modules[0].AreaM2()
	hours := iv.Hours()
	p.beamSum, p.beamLit = make([]float64, n), make([]float64, n)
	m.StepPOA = make([]float64, steps)
	p.unIrr, p.unTemp = bigmem.Make[float32](steps*n), bigmem.Make[float32](steps*n)
	m.StepSunElevDeg = make([]float64, steps)
	m.StepSunAzDeg = make([]float64, steps)
	for s, st := range p.ups {
		m.StepSunElevDeg[s] = 90 - st.pos.Zenith.Degrees()
		m.StepSunAzDeg[s] = st.pos.Azimuth.Degrees()
	}
	m.ModulePOAUnshaded = bigmem.Make[float32](steps * n)
	m.ModulePOA = bigmem.Make[float32](steps * n)
	m.ModuleTempC = bigmem.Make[float32](steps * n)
	// The sky on each plane once a step: modules on one face share it. The diffuse modifiers
	// depend on the tilt alone, so those of a plane's first module are every module's.
	planeOf, firsts := p.planes()
	comps := make([]planeComp, len(firsts))
	year, err := p.newYear(func(s int, dst *electric.StepInput) {
		if in.Progress != nil && s%128 == 0 {
			in.Progress("module curves", s, steps)
		}
		st := p.ups[s]
		r := in.Weather.Records[st.rec]
		doy := r.End.Add(-iv / 2).In(in.Zone).YearDay()
		sky := irradiance.Sky{DNI: r.DNI, DHI: r.DHI, GHI: r.GHI, ZenithDeg: st.pos.Zenith.Degrees(),
			DNIExtra: irradiance.ExtraterrestrialNormal(doy), Albedo: in.System.Albedo}
		month := m.StepMonth[s]
		for k, i := range firsts {
			theta := sun.Incidence(st.pos, p.tilt[i], p.aspect[i]).Degrees()
			c := planeComp{tc: irradiance.Transpose(in.System.Sky, sky, theta, p.tilt[i]), iamB: p.beamIAM(theta)}
			dirUn, difUn := c.tc.OnPlane(irradiance.View{Sky: 1, Horizon: 1, Ground: 1,
				IAMBeam: c.iamB, IAMSky: p.skyIAM[i], IAMGround: p.gndIAM[i]})
			c.unsh = c.tc.Total()
			c.unIrr = math.Min(soil*(dirUn+difUn), electric.MaxIrradiance)
			c.unTempC = in.System.Mounting.CellTemp(math.Min(c.unsh, electric.MaxIrradiance), r.AirTempC, r.WindMS)
			comps[k] = c
		}
		for i := range in.Modules {
			c := &comps[planeOf[i]]
			d := p.diff[i]
			lit := m.Shade.Lit(i, s)
			litFrac := m.Shade.LitFraction(i, s)
			// OnPlane keeps both parts non-negative, so no cell is ever given negative
			// light, whatever the sky model's horizon term and the cell's views.
			direct, diffuse := c.tc.OnPlane(irradiance.View{Sky: d.SkyView, Horizon: d.HorizonView, Ground: d.GroundView,
				IAMBeam: c.iamB, IAMSky: p.skyIAM[i], IAMGround: p.gndIAM[i]})
			dirRaw, difRaw := c.tc.OnPlane(irradiance.View{Sky: d.SkyView, Horizon: d.HorizonView, Ground: d.GroundView,
				IAMBeam: 1, IAMSky: 1, IAMGround: 1})
			ci := dst.CellIrr[i]
			if lit == nil {
				// No shade on the module: one value for all its cells.
				ci[0] = math.Min(soil*(direct*1.0+diffuse), electric.MaxIrradiance)
				dst.Even[i] = true
			} else {
				// Neighbouring cells mostly share their lit share: the value is reused while
				// it repeats.
				last, g, runs := -1, 0.0, 0
				for k := range ci {
					if l := int(lit[k]); l != last {
						last, g = l, math.Min(soil*(direct*(float64(l)/255)+diffuse), electric.MaxIrradiance)
						runs++
					}
					ci[k] = g
				}
				dst.Even[i] = runs == 1
			}
			unsh := c.unsh
			shaded := dirRaw*litFrac + difRaw
			withIAM := direct*litFrac + diffuse
			dst.UnshadedIrr[i] = c.unIrr
			// Each module's cells are heated by the light the module itself receives, shade
			// included.
			// No real sky puts more than about 1.4 kW/m² on a plane; inconsistent weather
			// records (a file stamped an hour late: a bright hour's diffuse with the sun on the
			// horizon) can make the Perez circumsolar part many times that. The light the cells
			// and their temperature take is capped at electric.MaxIrradiance, so such a record
			// gives a bright hour, not a failed survey.
			dst.TempC[i] = in.System.Mounting.CellTemp(math.Min(shaded, electric.MaxIrradiance), r.AirTempC, r.WindMS)
			p.unIrr[s*n+i] = float32(dst.UnshadedIrr[i])
			p.unTemp[s*n+i] = float32(c.unTempC)

			m.StepPOA[s] += shaded / float64(n)
			m.ModulePOAUnshaded[s*n+i] = float32(unsh)
			m.ModulePOA[s*n+i] = float32(shaded)
			m.ModuleTempC[s*n+i] = float32(dst.TempC[i])
			dst.Hours = hours
			ms := &m.Stats[i]
			ms.POAUnshadedKWhM2 += unsh * hours / 1000
			ms.POAKWhM2 += shaded * hours / 1000
			m.modPOAUn[i] += unsh * area * hours
			m.modPOASh[i] += shaded * area * hours
			m.modPOAIAM[i] += withIAM * area * hours
			m.modPOASoil[i] += soil * withIAM * area * hours
			m.modPOASoilUn[i] += float64(p.unIrr[s*n+i]) * area * hours
			p.beamSum[i] += c.tc.Beam * hours
			p.beamLit[i] += c.tc.Beam * litFrac * hours
			m.POAUnshadedWh += unsh * area * hours
			m.POAShadedWh += shaded * area * hours
			m.POAIAMWh += withIAM * area * hours
			m.POASoiledWh += soil * withIAM * area * hours
			m.MonthlyUnshadedPOAWh[month] += unsh * area * hours
			p.refW += unsh * hours
		}
	}, false)
	if err != nil {
		return fmt.Errorf("yield: module curves: %w", err)
	}
	if in.Progress != nil {
		in.Progress("module curves", steps, steps)
	}
	m.Year = year
	return nil
}

// unshadedYear builds the reference year: every module lit as if nothing stood around it,
// at its own unshaded temperature. Its step function only reads what the shaded year kept, so
// its steps are filled on all cores.
func (p *prep) unshadedYear() error {
	in, n, hours := p.in, len(p.in.Modules), p.iv.Hours()
	var err error
	p.m.YearUnshaded, err = p.newYear(func(s int, dst *electric.StepInput) {
		if in.Progress != nil && s%128 == 0 {
			in.Progress("unshaded reference", s, len(p.ups))
		}
		for i := range n {
			g := float64(p.unIrr[s*n+i])
			dst.CellIrr[i][0], dst.Even[i] = g, true
			dst.UnshadedIrr[i] = g
			dst.TempC[i] = float64(p.unTemp[s*n+i])
		}
		dst.Hours = hours
	}, true)
	if err != nil {
		return fmt.Errorf("yield: unshaded module curves: %w", err)
	}
	if in.Progress != nil {
		in.Progress("unshaded reference", len(p.ups), len(p.ups))
	}
	return nil
}

// finish sets the per-module statistics and the model's efficiency and reference sums.
func (p *prep) finish() {
	m := p.m
	own := m.Year.ModuleDCWh()
	for i := range m.Stats {
		st := &m.Stats[i]
		if p.beamSum[i] > 0 {
			st.BeamShadeLossPct = 100 * (1 - p.beamLit[i]/p.beamSum[i])
		}
		if st.POAUnshadedKWhM2 > 0 {
			st.ShadeLossPct = 100 * (1 - st.POAKWhM2/st.POAUnshadedKWhM2)
		}
		st.DCOwnMPPkWh = own[i] / 1000
	}
	area := p.in.Modules[0].AreaM2()
	m.EtaSTC = p.in.System.Module.PowerW / (1000 * area)
	m.NominalDCWh = m.POASoiledWh * m.EtaSTC
	m.RefPOAKWhM2 = p.refW / 1000 / float64(len(p.in.Modules))
}
