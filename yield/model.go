package yield

import (
	"context"
	"errors"
	"fmt"
	"math"
	"time"

	"sunstring/geo"
	"sunstring/shading"
	"sunstring/shading/sun"
	"sunstring/yield/electric"
	"sunstring/yield/irradiance"
	"sunstring/yield/weather"
)

// IAMModel selects the incidence-angle modifier.
type IAMModel int

// Incidence-angle modifiers. The zero value is Martin & Ruiz (2001).
const (
	IAMMartinRuiz IAMModel = iota
	IAMASHRAE
)

// Published default parameters: Martin & Ruiz (2001) ar = 0.16 for a common glass front;
// ASHRAE (Souka & Safwat 1966) b0 = 0.05.
const (
	martinRuizAr = 0.16
	ashraeB0     = 0.05
)

// Losses are flat loss factors, in percent.
type Losses struct {
	SoilingPct, WiringPct, MismatchPct, AvailabilityPct float64
}

// System is what is installed and how it is modelled.
type System struct {
	Module   electric.Datasheet
	Inverter electric.Inverter
	Losses   Losses
	Albedo   float64
	Sky      irradiance.SkyModel
	IAM      IAMModel
	// Mounting sets the cell temperature model; the zero value is modules on rails over a
	// pitched roof.
	Mounting irradiance.Mounting
}

// Input is everything a simulation needs.
type Input struct {
	Site     *geo.Site
	Modules  []geo.Module
	Weather  *weather.Series
	Observer sun.Observer
	Zone     *time.Location // local clock, for months
	System   System
	Horizon  *shading.Horizon
	// Progress, when set, is told how far each long stage has come.
	Progress func(stage string, done, total int)
}

// ModuleStat is one module's annual irradiation and shade.
type ModuleStat struct {
	POAUnshadedKWhM2 float64 // plane-of-array irradiation without shade (beam, sky, ground)
	POAKWhM2         float64 // the same with shade
	BeamShadeLossPct float64 // lost beam over unshaded beam: DNI·cos θ·(1−f) over DNI·cos θ
	ShadeLossPct     float64 // share of POA irradiation lost to shade
	SkyView          float64
	DCOwnMPPkWh      float64 // the module alone at its own maximum power point
}

// Model is a survey's year, prepared once; layouts are evaluated on it.
type Model struct {
	In      Input
	Module  *electric.Module
	Year    *electric.Year
	Shade   *shading.Result
	Stats   []ModuleStat
	Records []weather.Record
	// StepRecord maps each sun-up step to its weather record.
	StepRecord []int
	// StepMonth is each sun-up step's local month (0-based).
	StepMonth []int
	// StepPOA is each sun-up step's plane-of-array irradiance, W/m², the mean over the
	// modules with shade and before incidence-angle and soiling losses.
	StepPOA []float64
	// NightHours is the number of records with the sun down; MonthNightHours splits them by
	// local month (0-based), for spreading the inverter's night consumption.
	NightHours      int
	MonthNightHours [12]int
	// YearUnshaded is the same year with no cell shaded (each module lit as if nothing stood
	// around it, at its own unshaded temperature): the reference for a layout's shade loss, so
	// that the same strings, MPPT window and limits apply to both.
	YearUnshaded *electric.Year

	// Annual sums over all modules, Wh, for the loss breakdown.
	POAUnshadedWh, POAShadedWh, POAIAMWh, POASoiledWh float64
	// NominalDCWh is POASoiledWh at the module's STC efficiency.
	NominalDCWh float64
	// EtaSTC is the module's efficiency at standard test conditions.
	EtaSTC float64
	// Per module, Wh over the year on the module's area: unshaded, shaded, after incidence
	// losses, after soiling.
	modPOAUn, modPOASh, modPOAIAM, modPOASoil []float64
	// modPOASoilUn is the unshaded reference's irradiation after incidence losses and
	// soiling, Wh per module: what the reference year's modules convert.
	modPOASoilUn []float64
	// MonthlyUnshadedPOAWh is the unshaded plane-of-array irradiation of all modules by month.
	MonthlyUnshadedPOAWh [12]float64
	// RefPOAKWhM2 is the module-power-weighted mean unshaded POA irradiation (kWh/m²), the
	// reference yield of the performance ratio (IEC 61724-1).
	RefPOAKWhM2 float64
}

// ErrNoModules means there is nothing to simulate.
var ErrNoModules = errors.New("yield: no modules placed")

// Prepare computes sun positions, shade, irradiance and the year of module curves.
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
	mod, err := electric.NewModule(in.System.Module)
	if err != nil {
		return nil, fmt.Errorf("yield: module: %w", err)
	}
	cols, rows := mod.Grid()
	grid := geo.CellGrid{Cols: cols, Rows: rows}
	nm := len(in.Modules)
	m := &Model{In: in, Module: mod, Records: in.Weather.Records, Stats: make([]ModuleStat, nm),
		modPOAUn: make([]float64, nm), modPOASh: make([]float64, nm), modPOAIAM: make([]float64, nm), modPOASoil: make([]float64, nm),
		modPOASoilUn: make([]float64, nm)}

	// Sun for every record; sun-up records become shading steps.
	type sunStep struct {
		pos sun.Position
		rec int
	}
	var ups []sunStep
	var steps []shading.Step
	iv := in.Weather.Interval
	if iv <= 0 {
		iv = time.Hour
	}
	for i, r := range in.Weather.Records {
		p, lit := stepSun(r.End.Add(-iv), r.End, in.Observer)
		if lit == 0 || !p.Up() {
			m.NightHours++
			m.MonthNightHours[r.End.Add(-iv/2).In(in.Zone).Month()-1]++
			continue
		}
		ups = append(ups, sunStep{p, i})
		mid := r.End.Add(-iv / 2).In(in.Zone)
		steps = append(steps, shading.Step{Sun: p.Vector(), Month: mid.Month()})
		m.StepRecord = append(m.StepRecord, i)
		m.StepMonth = append(m.StepMonth, int(mid.Month())-1)
		if i%512 == 0 && ctx.Err() != nil {
			return nil, ctx.Err()
		}
	}

	scene, err := shading.NewScene(in.Site, in.Modules, shading.Options{Grid: grid, Horizon: in.Horizon})
	if err != nil {
		return nil, fmt.Errorf("yield: shading scene: %w", err)
	}
	var prog func(done, total int)
	if in.Progress != nil {
		prog = func(d, t int) { in.Progress("shading", d, t) }
	}
	shade, err := scene.Compute(ctx, steps, prog)
	if err != nil {
		return nil, fmt.Errorf("yield: shading: %w", err)
	}
	m.Shade = shade

	// Per-module geometry: tilt and aspect of each module's own plane (modules on one face
	// share it, hand-drawn panels may not).
	n := len(in.Modules)
	tilt := make([]float64, n)
	aspect := make([]float64, n)
	diff := make([]shading.Diffuse, n)
	for i := range in.Modules {
		nv := in.Modules[i].Normal()
		tilt[i] = math.Acos(math.Max(-1, math.Min(1, nv.U))) * 180 / math.Pi
		aspect[i] = math.Mod(math.Atan2(nv.E, nv.N)*180/math.Pi+360, 360)
		diff[i] = scene.Diffuse(i)
		m.Stats[i].SkyView = diff[i].SkyView
	}

	soil := 1 - in.System.Losses.SoilingPct/100
	ds := in.System.Module
	area := in.Modules[0].AreaM2()
	etaSTC := ds.PowerW / (1000 * area)
	beamIAM := func(thetaDeg float64) float64 {
		if in.System.IAM == IAMASHRAE {
			return irradiance.IAMASHRAE(thetaDeg, ashraeB0)
		}
		return irradiance.IAMMartinRuiz(thetaDeg, martinRuizAr)
	}
	skyIAM := make([]float64, n)
	gndIAM := make([]float64, n)
	for i := range in.Modules {
		if in.System.IAM == IAMASHRAE {
			// The ASHRAE form has no closed diffuse integral; the effective incidence angles
			// of Brandemuehl & Beckman (1980) give its diffuse modifiers: sky
			// 59.7 − 0.1388β + 0.001497β², ground 90 − 0.5788β + 0.002693β² (Duffie &
			// Beckman, Solar Engineering of Thermal Processes, §5.4; from memory).
			b := tilt[i]
			skyIAM[i] = irradiance.IAMASHRAE(59.7-0.1388*b+0.001497*b*b, ashraeB0)
			gndIAM[i] = irradiance.IAMASHRAE(90-0.5788*b+0.002693*b*b, ashraeB0)
		} else {
			skyIAM[i], gndIAM[i] = irradiance.DiffuseIAMMartinRuiz(tilt[i], martinRuizAr)
		}
	}

	// Per step, per module: components on the plane. Computed once here and consumed by the
	// year engine's callback; the beam-shade statistic needs DNI·cos θ too.
	type comp struct {
		tc   irradiance.Components // W/m² on the plane, unshaded, before IAM
		iamB float64
	}
	var beamSum, beamLit = make([]float64, n), make([]float64, n)
	m.StepPOA = make([]float64, len(ups))
	// The unshaded reference's inputs, per step and module: effective irradiance and the cell
	// temperature the module would have without shade.
	unIrr := make([]float32, len(ups)*n)
	unTemp := make([]float32, len(ups)*n)
	var refW float64
	year, err := electric.NewYear(mod, n, len(ups), func(s int, dst *electric.StepInput) {
		if in.Progress != nil && s%128 == 0 {
			in.Progress("module curves", s, len(ups))
		}
		st := ups[s]
		r := in.Weather.Records[st.rec]
		zen := st.pos.Zenith.Degrees()
		doy := r.End.Add(-iv / 2).In(in.Zone).YearDay()
		sky := irradiance.Sky{DNI: r.DNI, DHI: r.DHI, GHI: r.GHI, ZenithDeg: zen,
			DNIExtra: irradiance.ExtraterrestrialNormal(doy), Albedo: in.System.Albedo}
		month := m.StepMonth[s]
		cache := map[[2]float64]comp{}
		for i := range in.Modules {
			key := [2]float64{tilt[i], aspect[i]}
			c, ok := cache[key]
			if !ok {
				theta := sun.Incidence(st.pos, tilt[i], aspect[i]).Degrees()
				tc := irradiance.Transpose(in.System.Sky, sky, theta, tilt[i])
				c = comp{tc: tc, iamB: beamIAM(theta)}
				cache[key] = c
			}
			d := diff[i]
			lit := shade.Lit(i, s)
			litFrac := shade.LitFraction(i, s)
			// OnPlane keeps both parts non-negative, so no cell is ever given negative
			// light, whatever the sky model's horizon term and the cell's views.
			direct, diffuse := c.tc.OnPlane(irradiance.View{Sky: d.SkyView, Horizon: d.HorizonView, Ground: d.GroundView,
				IAMBeam: c.iamB, IAMSky: skyIAM[i], IAMGround: gndIAM[i]})
			dirRaw, difRaw := c.tc.OnPlane(irradiance.View{Sky: d.SkyView, Horizon: d.HorizonView, Ground: d.GroundView,
				IAMBeam: 1, IAMSky: 1, IAMGround: 1})
			dirUn, difUn := c.tc.OnPlane(irradiance.View{Sky: 1, Horizon: 1, Ground: 1,
				IAMBeam: c.iamB, IAMSky: skyIAM[i], IAMGround: gndIAM[i]})
			ci := dst.CellIrr[i]
			for k := range ci {
				f := 1.0
				if lit != nil {
					f = float64(lit[k]) / 255
				}
				ci[k] = soil * (direct*f + diffuse)
			}
			unsh := c.tc.Total()
			shaded := dirRaw*litFrac + difRaw
			withIAM := direct*litFrac + diffuse
			dst.UnshadedIrr[i] = soil * (dirUn + difUn)
			// Each module's cells are heated by the light the module itself receives, shade
			// included.
			dst.TempC[i] = in.System.Mounting.CellTemp(shaded, r.AirTempC, r.WindMS)
			unIrr[s*n+i] = float32(dst.UnshadedIrr[i])
			unTemp[s*n+i] = float32(in.System.Mounting.CellTemp(unsh, r.AirTempC, r.WindMS))

			m.StepPOA[s] += shaded / float64(n)
			hours := iv.Hours()
			dst.Hours = hours
			ms := &m.Stats[i]
			ms.POAUnshadedKWhM2 += unsh * hours / 1000
			ms.POAKWhM2 += shaded * hours / 1000
			m.modPOAUn[i] += unsh * area * hours
			m.modPOASh[i] += shaded * area * hours
			m.modPOAIAM[i] += withIAM * area * hours
			m.modPOASoil[i] += soil * withIAM * area * hours
			m.modPOASoilUn[i] += float64(unIrr[s*n+i]) * area * hours
			beamSum[i] += c.tc.Beam * hours
			beamLit[i] += c.tc.Beam * litFrac * hours
			m.POAUnshadedWh += unsh * area * hours
			m.POAShadedWh += shaded * area * hours
			m.POAIAMWh += withIAM * area * hours
			m.POASoiledWh += soil * withIAM * area * hours
			m.MonthlyUnshadedPOAWh[month] += unsh * area * hours
			refW += unsh * hours
		}
	})
	if err != nil {
		return nil, fmt.Errorf("yield: module curves: %w", err)
	}
	m.Year = year
	hours := iv.Hours()
	m.YearUnshaded, err = electric.NewYear(mod, n, len(ups), func(s int, dst *electric.StepInput) {
		if in.Progress != nil && s%128 == 0 {
			in.Progress("unshaded reference", s, len(ups))
		}
		for i := range n {
			g := float64(unIrr[s*n+i])
			for k := range dst.CellIrr[i] {
				dst.CellIrr[i][k] = g
			}
			dst.UnshadedIrr[i] = g
			dst.TempC[i] = float64(unTemp[s*n+i])
		}
		dst.Hours = hours
	})
	if err != nil {
		return nil, fmt.Errorf("yield: unshaded module curves: %w", err)
	}
	own := year.ModuleDCWh()
	for i := range m.Stats {
		st := &m.Stats[i]
		if beamSum[i] > 0 {
			st.BeamShadeLossPct = 100 * (1 - beamLit[i]/beamSum[i])
		}
		if st.POAUnshadedKWhM2 > 0 {
			st.ShadeLossPct = 100 * (1 - st.POAKWhM2/st.POAUnshadedKWhM2)
		}
		st.DCOwnMPPkWh = own[i] / 1000
	}
	m.EtaSTC = etaSTC
	m.NominalDCWh = m.POASoiledWh * etaSTC
	m.RefPOAKWhM2 = refW / 1000 / float64(n)
	return m, nil
}
