// Package electric owns the electrical model of a PV array: the module's
// single-diode curve fitted to its datasheet, cells and bypass diodes under
// per-cell irradiance, modules in series, strings in parallel on MPPT
// inputs, the inverter (window, current limit, efficiency, clipping, night
// consumption), several inverters side by side (Plant, each clipping on its
// own), the annual engine that evaluates string layouts, and the
// string-sizing and leakage checks. It does no I/O and does not log.
//
// Published methods:
//
//   - Single-diode model and its translation to irradiance and temperature:
//     W. De Soto, S. A. Klein, W. A. Beckman (2006), "Improvement and
//     validation of a model for photovoltaic array performance", Solar
//     Energy 80:78–88. Five parameters from Isc, Voc, Imp, Vmp and the Voc
//     temperature coefficient; the fit reproduces the four STC points to
//     solver precision (tested within 0.05 %). The authors report power
//     within a few per cent for crystalline silicon over 200–1000 W/m².
//     Band gap of silicon 1.121 eV, dEg/dT −0.0002677/K (from the paper).
//   - Explicit I(V) and V(I) with the Lambert W function: A. Jain, A. Kapoor
//     (2004), "Exact analytical solutions of the parameters of real solar
//     cells using Lambert W-function", Solar Energy Materials & Solar Cells
//     81:269–277. Exact to double precision; W is evaluated from its
//     logarithm so that huge arguments do not overflow, with the iteration of
//     Fritsch, Shafer & Crowley (1973), Commun. ACM 16:123–124. Along a
//     curve's current grid each point starts from the point two before it
//     (two interleaved chains the processor overlaps): in forward bias a
//     fourth-order Taylor guess of ln W, e^δ from its series and one Halley
//     step on u = ln W (one division, no logarithm); near the knee and in
//     reverse bias a Taylor guess from the previous point and a step of the
//     iteration above. Both agree with the cold start to a few ulps (tested).
//   - Inverter: D. L. King, S. Gonzalez, G. M. Galbraith, W. E. Boyson
//     (2007), "Performance model for grid-connected photovoltaic inverters",
//     Sandia report SAND2007-5036, as an option; otherwise a curve of
//     efficiency against load. The report states the model within about
//     0.1 % of measured efficiency over the inverter's operating range.
//   - Several inverters: a layout's inputs are dealt to them by the
//     largest-first rule for balancing loads, R. L. Graham (1969), "Bounds on
//     multiprocessing timing anomalies", SIAM J. Appl. Math. 17(2):416–429
//     (from memory); a heuristic, not an optimum.
//   - String checks: the voltage window of IEC 62548-1 (N·Voc at the coldest
//     temperature, N·Vmp at the hottest cell) and its 1.25·Isc factor
//     (from memory); the residual-current limits of IEC 62109-2 for
//     transformerless inverters (from memory).
//
// Reverse bias: a shaded cell is driven through the single-diode equation
// with its shunt resistance (the ohmic part of Bishop's 1988 model, J. W.
// Bishop, Solar Cells 25:73–89, without the avalanche term). Breakdown is
// neglected because the bypass diode clamps a substring at −0.5 V before a
// cell reaches it: with up to 24 cells a substring, the shaded cell sees at
// most about 23 × 0.6 + 0.5 ≈ 14 V reverse, below the 15–20 V breakdown of
// common cells (from memory). The most shaded cell therefore limits its
// substring's current, the weakest-cell behaviour.
//
// Curves are polylines on a current grid of 64 even points plus points around
// the bypass diodes' knees (see Curve); series and parallel connection are
// exact operations on polylines, and the maximum power is exact on the
// polyline: within 0.1 % of the exact model, evenly lit or with a partly
// shaded cell (up to 1.7 % low for a module whose knee is not among the step's
// four most shared, see NewYear).
// A cell's points are computed only while its substring's bypass diode is
// off (every cell's voltage falls with current, so a bypassed substring stays
// bypassed at higher currents); this changes no point of the curve.
// NewYear builds the curves of a batch of steps on GOMAXPROCS goroutines
// while the caller's step function fills the next batch; the step function
// still runs in step order on the caller's goroutine, and the year does not
// depend on the number of goroutines (tested).
package electric
