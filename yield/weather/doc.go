// Package weather owns the hourly weather a yield simulation runs on: one Series type and the
// ways to get one — read an EPW file (ReadEPW) or a CSV file (ReadCSV), synthesize a year from
// monthly totals (FromMonthly), or compute an indicative cloudless year (ClearSky).
//
// Every record stamps the END of its hour, in UTC; the sun is evaluated at the middle of an
// hour, and for the hours of sunrise and sunset at the middle of their sunlit part (found by
// bisection to within a second). Input problems come back together in one *InputError, each
// with the line, the field, what is wrong and what is allowed.
//
// # CSV format
//
// A text file of comma-separated values, one row per hour:
//
//	# Free-text comments start with '#'. Before the header, these comments give the location:
//	# latitude_deg: 47.07
//	# longitude_deg: 15.44
//	# elevation_m: 360
//	time,ghi_w_m2,dni_w_m2,dhi_w_m2,air_temp_c,wind_m_s
//	2025-06-01T13:00:00+02:00,812.0,705.5,195.3,23.4,2.1
//
// Columns, in any order:
//   - time (required): RFC 3339 with a UTC offset; the END of the hour the row describes.
//     Rows are one hour apart, in order, without gaps or repeats. Offsets may change (daylight
//     saving time); the series keeps the smallest offset as its standard time.
//   - ghi_w_m2 (required): global horizontal irradiance, mean over the hour, 0..1500 W/m².
//   - dni_w_m2, dhi_w_m2 (optional, together): direct normal and diffuse horizontal
//     irradiance, 0..1500 W/m². Without them GHI is split with Erbs et al. (1982); that needs
//     the location from the comment lines (or ReadCSVAt).
//   - air_temp_c (required): air temperature, −70..70 °C.
//   - wind_m_s (optional): wind speed, 0..40 m/s; 1 m/s when absent.
//
// Other columns are ignored with a warning. Blank lines are skipped. Every cell must hold a
// number: the CSV format has no missing-value codes.
//
// # Methods
//
//   - Clear sky: Ineichen, P. & Perez, R. (2002), "A new airmass independent formulation for
//     the Linke turbidity coefficient", Solar Energy 73(3):151–157, with the relative air mass
//     of Kasten, F. & Young, A. T. (1989), Applied Optics 28(22):4735–4738. The authors report a
//     bias close to zero and an RMS error of a few per cent against ground stations when the
//     turbidity is known; with the monthly defaults here the error is larger (common practice:
//     10 % and more in hazy months). Valid for the sun above the horizon.
//   - Beam/diffuse split: Erbs, D. G., Klein, S. A. & Duffie, J. A. (1982), "Estimation of the
//     diffuse radiation fraction for hourly, daily and monthly-average global radiation",
//     Solar Energy 28(4):293–302; RMS error of hourly diffuse of about 15–20 % (from memory).
//   - Daily clearness of synthetic days: the generalized distribution of Bendt, P.,
//     Collares-Pereira, M. & Rabl, A. (1981), "The frequency distribution of daily insolation
//     values", Solar Energy 27(1):1–5, from the monthly mean clearness index K̄t alone, with
//     kt between 0.05 and 0.864 (from memory). Fitted on US stations for 0.3 ≤ K̄t ≤ 0.75.
//     Days take the distribution's quantiles, placed in an order that gives a lag-one
//     autocorrelation near 0.3 as reported for daily clearness by Aguiar, R. J., Collares-
//     Pereira, M. & Conde, J. P. (1988), "Simple procedure for generating sequences of daily
//     radiation values using a library of Markov transition matrices", Solar Energy
//     40(3):269–279 (the value from memory): a seeded Gaussian first-order autoregression is
//     generated and the quantiles are assigned in its rank order.
//   - Hours within a day: the ratio rt of hourly to daily global irradiation of
//     Collares-Pereira, M. & Rabl, A. (1979), "The average distribution of solar radiation —
//     correlations between diffuse and hemispherical and between daily and hourly insolation
//     values", Solar Energy 22(2):155–164. Derived from long-term averages; individual days
//     deviate, which is why only monthly totals are promised.
//   - Sun position: package sunstring/shading/sun. Extraterrestrial irradiance and air mass:
//     package sunstring/yield/irradiance.
//
// # Checks for a survey
//
// CheckYear refuses a series that is not exactly one year of hourly records (8760, or 8784
// when the dates include 29 February). NoonShift compares when the light of the clearest days
// arrives with solar noon at the site, which finds files stamped in the wrong zone or at the
// start instead of the end of each hour; NoonWarning turns a shift of 20 minutes or more into
// a message.
//
// Synthetic years (FromMonthly) reproduce the monthly global totals to within 0.1 % and the
// monthly mean temperatures exactly; single hours and days are plausible, not forecasts.
package weather
