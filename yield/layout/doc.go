// Package layout builds string layouts: the bounds on modules per string and strings per
// input from the inverter's limits at the temperature extremes, a plain layout that wires
// modules in roof order, and (search.go) the shade-aware search that ranks layouts by annual
// energy on a prepared year.
package layout
