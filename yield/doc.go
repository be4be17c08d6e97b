// Package yield turns a site model, its placed modules and a weather year into energy: it
// finds the sun for every time step, asks the shading engine what each cell sees, transposes
// the sky's light onto every module (Perez et al. 1990 by default), applies incidence-angle
// losses (Martin & Ruiz 2001) and cell temperature by mounting (King, Boyson & Kratochvil 2004), builds the year of module
// I-V curves once (package electric) and evaluates string layouts on it: annual and monthly
// AC energy with a loss breakdown from plane-of-array irradiation to AC.
//
// Published methods beyond those of the sub-packages: the diffuse incidence-angle modifiers of
// the ASHRAE form use the effective incidence angles of Brandemuehl, M. J. & Beckman, W. A.
// (1980), "Transmission of diffuse radiation through CPC and flat plate collector glazings",
// Solar Energy 24(5):511–513 (as given in Duffie & Beckman, Solar Engineering of Thermal
// Processes, §5.4; from memory); the performance ratio is final yield over reference yield as
// IEC 61724-1 defines it.
//
// Sub-packages: weather (series, readers, synthetic years), irradiance (sky models),
// electric (module, string and inverter electrics), layout (string-layout search) and
// report (charts, PDF, GeoJSON and summary output).
package yield
