package yield

import (
	"errors"
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
	// Inverters is how many inverters of the Inverter's model share the modules; zero means
	// one. A layout's inputs are then the plant's, inverter by inverter (electric.Plant.Split),
	// and each inverter clips at its own AC limit.
	Inverters int
	Losses    Losses
	Albedo    float64
	Sky       irradiance.SkyModel
	IAM       IAMModel
	// Mounting sets the cell temperature model; the zero value is modules on rails over a
	// pitched roof.
	Mounting irradiance.Mounting
}

// Plant returns the system's inverters.
func (s System) Plant() electric.Plant { return electric.Identical(s.Inverter, max(s.Inverters, 1)) }

// Input is everything a simulation needs.
type Input struct {
	Site     *geo.Site
	Modules  []geo.Module
	Weather  *weather.Series
	Observer sun.Observer
	Zone     *time.Location // local clock, for months
	System   System
	Horizon  *shading.Horizon
	// Progress, when set, is told how far each long stage has come; it may be called from
	// several goroutines at once.
	Progress func(stage string, done, total int)

	// exactCurves builds every module curve from unrounded inputs (electric.NewYearExact):
	// the reference for the accuracy of curve sharing, in tests.
	exactCurves bool
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
	In     Input
	Module *electric.Module
	Year   *electric.Year
	Shade  *shading.Result
	// Scene is the scene Shade was computed in; a sun-path chart reads a module's
	// silhouettes and blockers from it instead of building another.
	Scene   *shading.Scene
	Stats   []ModuleStat
	Records []weather.Record
	// Steps are the sun-up steps as the shading took them (Shade's steps).
	Steps []shading.Step
	// StepRecord maps each sun-up step to its weather record.
	StepRecord []int
	// StepMonth is each sun-up step's local month (0-based).
	StepMonth []int
	// StepPOA is each sun-up step's plane-of-array irradiance, W/m², the mean over the
	// modules with shade and before incidence-angle and soiling losses.
	StepPOA []float64
	// StepSunElevDeg and StepSunAzDeg are the sun's elevation and azimuth (clockwise from
	// north), degrees, at each sun-up step as the model took it: the interval's midpoint, or
	// for sunrise and sunset intervals the midpoint of their sunlit part.
	StepSunElevDeg, StepSunAzDeg []float64
	// ModulePOAUnshaded, ModulePOA and ModuleTempC are, for step s and module k at index
	// s·len(Modules)+k, the plane-of-array irradiance without and with shade (W/m², before
	// incidence-angle and soiling losses) and the cell temperature (°C), for an hour-by-hour
	// audit.
	ModulePOAUnshaded, ModulePOA, ModuleTempC []float32
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
