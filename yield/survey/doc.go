// Package survey runs a whole PV roof survey as a library: from a validated site
// configuration (Config) and the files it names (read through a ReadFunc the caller provides)
// to the placed modules (Load), the simulated year, the ranked string layouts and the summary
// (Project.Run), and the report files as bytes (Result.Render).
//
// A front end (the sunstring command, a batch of sites, a service) decodes the site file into
// a Config, calls Config.Validate, Load, Run and Render, and writes the files where it wants.
// The package opens no file by path and logs nothing; errors of the user's input implement
// BadInput() bool.
//
// The models are those of the packages it calls: solar position after Reda & Andreas (2004),
// NREL/TP-560-34302 (shading/sun); per-cell beam shade by ray tests (shading); Perez et al.
// (1990), Hay & Davies (1980) or isotropic transposition, Martin & Ruiz (2001) or ASHRAE
// incidence-angle modifiers and King et al. (2004) cell temperature by mounting (yield/irradiance); the
// single-diode model of De Soto et al. (2006) per cell with bypass diodes (yield/electric);
// the layout search (yield/layout). Its figures are estimates: local codes and a licensed
// installer have the final word on voltages, currents and layouts.
package survey
