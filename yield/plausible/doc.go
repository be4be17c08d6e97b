// Package plausible holds the checks that catch input which is well formed but wrong: values
// each inside its own range that together describe no real system or place. Each check
// returns findings (package finding) that name the file and the key or feature, say by how
// much, and say what to do.
//
// The thresholds are the trade's ranges, each with its source beside it:
//
//   - module efficiency (STC power over area at 1000 W/m²): crystalline silicon modules sold
//     today reach about 18–24 % (common practice); below 10 % or above 25 % the power or the
//     size is likely mistyped (a warning). Above 33.7 %, the detailed-balance limit of a
//     single-junction cell under AM1.5 (Shockley & Queisser 1961, J. Appl. Phys. 32:510, as
//     recomputed by Rühle 2016, Solar Energy 130:139–147; the value from memory), no flat
//     module can go: a fail.
//   - DC/AC ratio (module STC power over inverter AC power): designs usually lie between 1.0
//     and 1.3, and up to 1.5 is sold as "oversizing" (common practice); outside 0.75–1.5 a
//     warning, above 5 a fail (no inverter is meant for that: a unit mistake, kW for W).
//   - clipping above 3 % of the energy and a performance ratio below 0.6: modern unshaded
//     systems reach 0.75–0.85 (IEC 61724-1 definition; values from trade literature).
//   - a time zone whose standard offset lies more than 2.5 hours from the longitude's
//     (15° an hour; zones stray up to about 2 h, common practice), and coordinates that fit
//     the zone only when latitude and longitude are swapped. The zone tells a swap only when
//     the two lie 15° or more apart; closer, the map's faces do (geo.Site.SwapEvidence, worded
//     by the survey).
//   - a face receiving less than 75 % of the best face's annual irradiation: a north face of a
//     35° gable in central Europe gets about 55–65 % of the south face (common practice), an
//     east or west face about 80–85 %.
package plausible
