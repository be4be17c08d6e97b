// Package roofgen builds invented large roofs for benchmarks: a low-pitch commercial roof
// holding a chosen number of modules, with rooftop units on it and trees and a neighbouring
// building around it, as a GeoJSON map and a site file. Everything is made up: the place, the
// building, the module and the inverter.
//
// The generator is deterministic (a seeded generator places the obstructions), so a benchmark
// or a fixture built from it is the same on every run.
package roofgen
