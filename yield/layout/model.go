package layout

import (
	"time"

	"sunstring/yield"
	"sunstring/yield/electric"
)

// ShadeFeatures returns, per module of a prepared model, when its beam irradiance is shaded:
// 12 × 24 values (local month and hour of the interval's midpoint), each the shaded share of
// the cells' beam weighted by the step's direct normal irradiance, over the year's total
// direct normal irradiation. A module's values add up to the share of the year's beam it
// loses (before incidence effects), and two modules with close vectors lose their sun at the
// same times, which is what makes them good string mates. Weighting by DNI keeps the shadows
// of dull hours and of the low sun from counting as much as midday ones.
func ShadeFeatures(m *yield.Model) [][]float64 {
	n := len(m.Stats)
	out := make([][]float64, n)
	for i := range out {
		out[i] = make([]float64, 12*24)
	}
	if m.Shade == nil {
		return out
	}
	zone := m.In.Zone
	if zone == nil {
		zone = time.UTC
	}
	iv := time.Hour
	if m.In.Weather != nil && m.In.Weather.Interval > 0 {
		iv = m.In.Weather.Interval
	}
	total := 0.0
	for s := range m.StepRecord {
		total += m.Records[m.StepRecord[s]].DNI
	}
	if total <= 0 {
		return out
	}
	for s, ri := range m.StepRecord {
		r := m.Records[ri]
		if r.DNI <= 0 {
			continue
		}
		mid := r.End.Add(-iv / 2).In(zone)
		bin := (int(mid.Month())-1)*24 + mid.Hour()
		w := r.DNI / total
		for k := range n {
			if f := m.Shade.LitFraction(k, s); f < 1 {
				out[k][bin] += (1 - f) * w
			}
		}
	}
	return out
}

// ModelEvaluator evaluates layouts on a prepared model: the annual AC energy in Wh after
// every loss (yield.Model.Evaluate), so that the search ranks layouts on exactly what the
// report shows. The model's year of module curves is shared by all calls, and each input's
// share of the year is kept (electric.EvalCache, 64 MB at most), so that a layout that
// differs from an earlier one in one or two inputs costs only those inputs.
//
// With several inverters (yield.System.Inverters) the search's inputs are all the plant's,
// taken as interchangeable: each layout's inputs are dealt to the inverters by
// electric.Plant.Deal before it is evaluated, and each inverter clips at its own AC limit.
// A caller reports a found layout dealt the same way.
func ModelEvaluator(m *yield.Model, opt electric.EvalOptions) Evaluator {
	return ModelEvaluatorCached(m, opt, &electric.EvalCache{})
}

// ModelEvaluatorCached is ModelEvaluator through the caller's cache, which may serve other
// evaluators too (its entries are told apart by year, inverter and options): one cache for a
// whole survey bounds the memory the caches take together.
func ModelEvaluatorCached(m *yield.Model, opt electric.EvalOptions, c *electric.EvalCache) Evaluator {
	plant := m.In.System.Plant()
	return func(l electric.Layout) (float64, error) {
		return m.EvaluateACWhCached(plant.Deal(l), opt, c)
	}
}

// ModelScreen is ModelEvaluatorCached on every k-th step of the model's year
// (electric.Year.Thin): an estimate of the same energy at about 1/k of the cost, for
// Options.Screen.
func ModelScreen(m *yield.Model, opt electric.EvalOptions, k int, c *electric.EvalCache) Evaluator {
	mt := *m
	mt.Year = m.Year.Thin(k)
	mt.YearUnshaded = nil
	return ModelEvaluatorCached(&mt, opt, c)
}
