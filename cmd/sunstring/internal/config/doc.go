// Package config reads and validates the site file (YAML): the site, its climate, the module,
// the inverter, the fill rules, the layouts to compare and the loss factors.
//
// Precedence, highest first: SUNSTRING_ environment variables (key path upper-cased, dots as
// underscores: SUNSTRING_INVERTER_AC_POWER_W), command-line flags bound to a key, the site
// file, the defaults. Unknown keys in the file are an error.
package config
