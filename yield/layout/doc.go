// Package layout builds string layouts: the bounds on modules per string and strings per
// input from the inverter's limits at the temperature extremes, a plain layout that wires
// modules in roof order, and (search.go) the shade-aware search that ranks layouts by annual
// energy on a prepared year.
//
// Published method: the string-length bounds follow the IEC 62548-1 rule (N·Voc at the lowest
// expected temperature below the inverter's and the module's maximum DC voltage, N·Vmp at the
// hottest cell at or above the MPPT minimum). The search itself (clustered starts, swaps and
// moves) is the project's own and promises a good layout, not the optimum.
package layout
