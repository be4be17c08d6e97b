package survey

import "sunstring/geo"

// Defaults returns a Config with every optional key at its documented default (the README's
// site-file reference) and the required ones empty: a Go caller fills in the map, the time
// zone, the module and the inverter, then calls Validate.
func Defaults() *Config {
	return &Config{
		SurroundingsRadiusM: geo.DefaultSurroundingsRadiusM,
		Climate:             Climate{LowTempC: -10, HighTempC: 35, Albedo: 0.2},
		Module:              Module{MaxSystemVoltage: 1000, Mounting: "rails"},
		Inverter:            Inverter{Count: 1, EfficiencyPct: 96.0, Transformerless: true},
		Fill:                Fill{Orientation: "portrait", SetbackM: 0.3, GapM: 0.02, ClearanceM: 0.3, MinModules: 1},
		Layouts:             Layouts{Search: true, Keep: 5},
		Losses:              Losses{SoilingPct: 2, WiringPct: 1, MismatchPct: 1, AvailabilityPct: 0.5},
		Model:               Model{Sky: "perez", IAM: "martin-ruiz"},
	}
}
