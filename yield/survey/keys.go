package survey

import (
	"math"
	"strings"
)

// Required are the site file's keys with no default: a guess would change the voltages or the hours.
var Required = []string{
	"map", "timezone",
	"module.power_w", "module.voc_v", "module.isc_a", "module.vmp_v", "module.imp_a",
	"module.temp_coeff_voc_pct", "module.temp_coeff_isc_pct", "module.temp_coeff_pmax_pct",
	"module.cells_series", "module.bypass_diodes", "module.length_m", "module.width_m",
	"inverter.ac_power_w", "inverter.max_dc_voltage_v", "inverter.mppt_min_v", "inverter.mppt_max_v",
	"inverter.inputs", "inverter.max_input_current_a",
}

// RequiredWhy says, for each required key, what to give.
var RequiredWhy = map[string]string{
	"map":                          "the path of the GeoJSON map, relative to the site file",
	"timezone":                     "the site's IANA time zone, such as Europe/Vienna; the hours of every weather record depend on it",
	"module.power_w":               "the module's power at STC from its datasheet, W",
	"module.voc_v":                 "the module's open-circuit voltage at STC, V",
	"module.isc_a":                 "the module's short-circuit current at STC, A",
	"module.vmp_v":                 "the module's MPP voltage at STC, V",
	"module.imp_a":                 "the module's MPP current at STC, A",
	"module.temp_coeff_voc_pct":    "the datasheet's Voc temperature coefficient, %/K (it sets the cold string voltage)",
	"module.temp_coeff_isc_pct":    "the datasheet's Isc temperature coefficient, %/K",
	"module.temp_coeff_pmax_pct":   "the datasheet's Pmax temperature coefficient, %/K",
	"module.cells_series":          "the number of cells as the datasheet counts them (60, 72, 120, 144 …)",
	"module.bypass_diodes":         "the number of bypass diodes (usually 3)",
	"module.length_m":              "the module's long side, m",
	"module.width_m":               "the module's short side, m",
	"inverter.ac_power_w":          "the inverter's rated AC power, W",
	"inverter.max_dc_voltage_v":    "the inverter's maximum DC input voltage, V",
	"inverter.mppt_min_v":          "the lower end of the MPPT voltage window, V",
	"inverter.mppt_max_v":          "the upper end of the MPPT voltage window, V",
	"inverter.inputs":              "the number of MPPT inputs",
	"inverter.max_input_current_a": "the maximum current of one MPPT input, A",
}

// Keys lists every key of the site file: the required ones, those with a default and the
// optional ones without.
func Keys() []string {
	keys := append([]string{"latitude", "longitude", "elevation_m", "climate.monthly_ghi_kwh_m2", "climate.monthly_temp_c", "layouts.fixed", "surroundings"}, Required...)
	for k := range KeyDefaults {
		keys = append(keys, k)
	}
	return keys
}

// KeyDefaults gives every other key its default, by dotted key path (the README's site-file
// reference); a front end sets them before reading a file, so that environment variables
// reach every key. Defaults is the same as a Config.
var KeyDefaults = map[string]any{
	"name": "", "map": "", "horizon": "", "surroundings_radius_m": 100.0,
	"climate.file": "", "climate.low_temp_c": -10.0, "climate.high_temp_c": 35.0, "climate.albedo": 0.2,
	"module.power_w": 0.0, "module.voc_v": 0.0, "module.isc_a": 0.0, "module.vmp_v": 0.0, "module.imp_a": 0.0,
	"module.half_cut": false,
	"module.length_m": 0.0, "module.width_m": 0.0, "module.max_system_voltage_v": 1000.0,
	"module.mounting": "rails",
	"inverter.count":  1.0, "inverter.ac_power_w": 0.0, "inverter.max_dc_voltage_v": 0.0, "inverter.mppt_min_v": 0.0,
	"inverter.mppt_max_v": 0.0, "inverter.max_input_current_a": 0.0,
	"inverter.efficiency_pct": 96.0, "inverter.night_w": 0.0, "inverter.transformerless": true,
	"fill.orientation": "portrait", "fill.setback_m": 0.3, "fill.gap_m": 0.02, "fill.clearance_m": 0.3,
	"fill.min_modules": 1.0,
	"layouts.search":   true, "layouts.keep": 5.0, "layouts.cable_weight_kwh_per_m": 0.0,
	"losses.soiling_pct": 2.0, "losses.wiring_pct": 1.0, "losses.mismatch_pct": 1.0, "losses.availability_pct": 0.5,
	"model.sky": "perez", "model.iam": "martin-ruiz",
	"proposal.customer": "", "proposal.address": "", "proposal.prepared_by": "", "proposal.date": "",
	"proposal.valid_until": "",
}

// Nearest returns the candidate closest to s by edit distance, when it is close enough to be
// a likely misspelling (at most a third of s's length, and at most 4 edits); else "".
func Nearest(s string, candidates []string) string {
	best, bestD := "", math.MaxInt
	for _, c := range candidates {
		if d := editDistance(strings.ToLower(s), strings.ToLower(c)); d < bestD || d == bestD && c < best {
			best, bestD = c, d
		}
	}
	if bestD > min(4, max(1, len(s)/3)) {
		return ""
	}
	return best
}

// editDistance is the Levenshtein distance between a and b, in bytes.
func editDistance(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			cost := 1
			if a[i-1] == b[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}
