// Package irradiance owns the conversion of weather irradiance into the irradiance that
// reaches a module's cells, and the cell temperature that follows from it. Every function
// is pure: values in, values out, no state.
//
// It owns:
//   - the extraterrestrial normal irradiance, after Spencer, J. W. (1971), "Fourier series
//     representation of the position of the sun", Search 2(5):172. Its accuracy is about
//     1e-4 in the distance correction factor (from memory).
//   - the relative air mass, after Kasten, F. & Young, A. T. (1989), "Revised optical air
//     mass tables and approximation formula", Applied Optics 28(22):4735–4738; within about
//     0.5 % of the tabulated air mass up to a zenith angle of 90° (from memory).
//   - the split of global horizontal irradiance into beam and diffuse, after Erbs, D. G.,
//     Klein, S. A. & Duffie, J. A. (1982), "Estimation of the diffuse radiation fraction
//     for hourly, daily and monthly-average global radiation", Solar Energy 28(4):293–302.
//     Fitted on hourly data from five US stations; the hourly diffuse fraction scatters by
//     roughly ±0.1 (absolute) around the fit (from memory), so it is meant for hourly or coarser steps.
//   - the transposition of beam, sky diffuse and ground-reflected light onto a tilted
//     plane, with three sky models:
//     Perez, R., Ineichen, P., Seals, R., Michalsky, J. & Stewart, R. (1990), "Modeling
//     daylight availability and irradiance components from direct and global irradiance",
//     Solar Energy 44(5):271–289 (the default; hourly RMS errors of the tilted-plane diffuse of roughly
//     10–20 % of the mean are typical in its validations, from memory);
//     Hay, J. E. & Davies, J. A. (1980), "Calculation of the solar radiation incident on
//     an inclined surface", Proc. First Canadian workshop on solar radiation data, 59–72;
//     and the isotropic sky of Liu, B. Y. H. & Jordan, R. C. (1963), "The long-term average
//     performance of flat-plate solar-energy collectors", Solar Energy 7(2):53–74, which
//     underestimates sunny-day irradiance on steep planes by several percent.
//     Ground reflection is isotropic with a single albedo for all models.
//   - incidence-angle modifiers for reflection losses at the module's front:
//     the ASHRAE form of Souka, A. F. & Safwat, H. H. (1966), "Determination of the optimum
//     orientations for the double-exposure, flat-plate collector and its reflectors",
//     Solar Energy 10(4):170–174, which goes to zero at a cutoff angle and is poor beyond
//     about 80°; and Martin, N. & Ruiz, J. M. (2001), "Calculation of the PV modules angular
//     losses under field conditions by means of an analytical model", Solar Energy
//     Materials and Solar Cells 70(1):25–38, fitted to measured modules at all angles,
//     with its closed-form approximations for isotropic sky diffuse and ground light.
//   - cell temperature by mounting (rails, open rack, flush): King, D. L., Boyson, W. E. &
//     Kratochvil, J. A. (2004), "Photovoltaic array performance model", Sandia report
//     SAND2004-3535, eq. 11–12 with its Table 1 coefficients; the report gives about ±5 °C
//     (from memory). Also Faiman, D. (2008), "Assessing the outdoor operating performance of
//     photovoltaic modules", Progress in Photovoltaics 16(4):307–315, a steady-state heat
//     balance with an RMS error of about 1.5–2 K on the paper's data (from memory); and
//     the NOCT linear rise (Ross, R. G. (1980), "Flat-plate photovoltaic array design
//     optimization", 14th IEEE PVSC, 1126–1132), which ignores wind.
//
// Bibliographic details (titles, pages) are from memory, except the journal references of
// Perez et al. (1990), Erbs et al. (1982), Kasten & Young (1989) and Kopp & Lean (2011),
// which were checked against a second source. The solar constant is 1367 W/m² (the value of
// the handbooks, e.g. Duffie & Beckman); Kopp, G. & Lean, J. L. (2011), "A new, lower value
// of total solar irradiance: evidence and climate significance", Geophysical Research
// Letters 38, L01706, measure 1360.8 ± 0.5 W/m², about 0.5 % less.
//
// Conventions: irradiance in W/m², angles in degrees (zenith from vertical, incidence from
// the plane's normal, tilt from horizontal), temperatures in °C, wind in m/s at the
// height the weather file reports. Out-of-range inputs are clamped as each function
// documents; nothing panics.
package irradiance
