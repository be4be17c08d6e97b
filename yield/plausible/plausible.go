package plausible

import (
	"fmt"
	"math"
	"time"

	"sunstring/yield/finding"
)

// Thresholds, with their sources in the package documentation.
const (
	effWarnLowPct  = 10
	effWarnHighPct = 25
	effFailPct     = 33.7 // single-junction detailed-balance limit under AM1.5

	dcacWarnLow  = 0.75
	dcacWarnHigh = 1.5
	dcacFail     = 5

	clipWarnPct = 3
	prWarnLow   = 0.6

	zoneWarnH   = 2.5 // hours between the zone's standard offset and the longitude's
	swapFitH    = 1.0 // the swapped reading fits the zone this well …
	swapMisfitH = 1.5 // … and the given one misfits by more than this

	poorFaceShare = 0.75
)

// stcIrradiance is the irradiance of standard test conditions, W/m² (IEC 60904-3).
const stcIrradiance = 1000.0

// Module checks a module's STC power against its size. subject names the site file's keys
// (e.g. "site.yaml: module"). It returns the efficiency in percent and its findings.
func Module(subject string, powerW, lengthM, widthM float64) (effPct float64, out finding.List) {
	area := lengthM * widthM
	if !(area > 0) || !(powerW > 0) || math.IsInf(area, 0) || math.IsInf(powerW, 0) {
		return math.NaN(), nil // ranges are the site file's own checks
	}
	effPct = powerW / (area * stcIrradiance) * 100
	switch {
	case effPct > effFailPct:
		out.Add(finding.Fail, "module_efficiency", subject,
			"power_w %g W on %.2f × %.2f m is %.1f %% efficient, above the %.1f %% no single-junction module can exceed; check power_w (W at STC), length_m and width_m (metres)",
			powerW, lengthM, widthM, effPct, effFailPct)
	case effPct > effWarnHighPct:
		out.Add(finding.Warning, "module_efficiency", subject,
			"power_w %g W on %.2f × %.2f m is %.1f %% efficient, above the %d %% silicon modules reach; check power_w, length_m and width_m against the datasheet",
			powerW, lengthM, widthM, effPct, effWarnHighPct)
	case effPct < effWarnLowPct:
		out.Add(finding.Warning, "module_efficiency", subject,
			"power_w %g W on %.2f × %.2f m is %.1f %% efficient, below the %d %% of any silicon module sold today; check power_w, length_m and width_m against the datasheet",
			powerW, lengthM, widthM, effPct, effWarnLowPct)
	}
	return effPct, out
}

// DCAC checks the ratio of the modules' STC power dcW to the inverter's AC power acW.
// subject names the inverter's key (e.g. "site.yaml: inverter.ac_power_w").
func DCAC(subject string, dcW, acW float64) (ratio float64, out finding.List) {
	if !(dcW > 0) || !(acW > 0) {
		return math.NaN(), nil
	}
	ratio = dcW / acW
	switch {
	case ratio > dcacFail:
		out.Add(finding.Fail, "dc_ac_ratio", subject,
			"%.1f kWp of modules on %.3g kW of inverter is a DC/AC ratio of %.1f, above %d; check ac_power_w (watts, not kilowatts) or choose an inverter for the array",
			dcW/1000, acW/1000, ratio, dcacFail)
	case ratio > dcacWarnHigh:
		out.Add(finding.Warning, "dc_ac_ratio", subject,
			"%.1f kWp of modules on %.3g kW of inverter is a DC/AC ratio of %s, above %.1f: the inverter will clip much of the sunny hours' energy; choose a larger inverter or fewer modules (usual ratios 1.0–1.3)",
			dcW/1000, acW/1000, ratioText(ratio, dcacWarnHigh), dcacWarnHigh)
	case ratio < dcacWarnLow:
		out.Add(finding.Warning, "dc_ac_ratio", subject,
			"%.1f kWp of modules on %.3g kW of inverter is a DC/AC ratio of %s, below %.2f: the inverter runs at low load and low efficiency most of the time; a smaller inverter would do (usual ratios 1.0–1.3)",
			dcW/1000, acW/1000, ratioText(ratio, dcacWarnLow), dcacWarnLow)
	}
	return ratio, out
}

// ratioText gives a ratio to two decimals, or to three when two would print the limit it
// crossed ("1.503, above 1.5", never "1.50, above 1.5").
func ratioText(ratio, limit float64) string {
	if t := fmt.Sprintf("%.2f", ratio); t != fmt.Sprintf("%.2f", limit) {
		return t
	}
	return fmt.Sprintf("%.3f", ratio)
}

// Result checks a survey's result: the share of the energy lost to the inverter's AC limit
// (clipPct, percent of the energy reaching it) and the performance ratio pr. subject names
// the layout.
func Result(subject string, clipPct, pr float64) (out finding.List) {
	if clipPct > clipWarnPct {
		out.Add(finding.Warning, "clipping", subject,
			"the inverter's AC limit cuts %.1f %% of the energy, more than %d %%; choose a larger inverter or fewer modules", clipPct, clipWarnPct)
	}
	if pr > 0 && pr < prWarnLow {
		out.Add(finding.Warning, "performance_ratio", subject,
			"performance ratio %.2f, below %.1f (unshaded systems reach 0.75–0.85); look at the loss breakdown for the step that takes most (shade, clipping, the inverter's window)", pr, prWarnLow)
	}
	return out
}

// standardOffsetH returns zone's standard-time offset from UTC in hours: the smaller of the
// offsets in mid-January and mid-July, since daylight saving time adds to standard time.
func standardOffsetH(zone *time.Location) float64 {
	_, jan := time.Date(2025, 1, 15, 12, 0, 0, 0, zone).Zone()
	_, jul := time.Date(2025, 7, 15, 12, 0, 0, 0, zone).Zone()
	return float64(min(jan, jul)) / 3600
}

// zoneMisfitH returns how many hours the zone's standard offset lies from the mean solar time
// of longitude lonDeg, wrapped to (−12, 12].
func zoneMisfitH(stdH, lonDeg float64) float64 {
	return math.Mod(lonDeg/15-stdH+36, 24) - 12
}

// Zone checks the site's time zone against its coordinates: a zone far from the longitude
// shifts every hour of a weather file, and coordinates that fit the zone only when latitude
// and longitude change places were most likely entered swapped. subject names the place the
// coordinates come from (the map, or the site file's latitude and longitude), zoneKey the
// time zone's key.
func Zone(subject, zoneKey string, zone *time.Location, latDeg, lonDeg float64) (out finding.List) {
	if zone == nil || math.IsNaN(latDeg) || math.IsNaN(lonDeg) {
		return nil
	}
	std := standardOffsetH(zone)
	d := zoneMisfitH(std, lonDeg)
	swapped := math.Abs(zoneMisfitH(std, latDeg))
	// Below 15° (an hour) between latitude and longitude the zone cannot tell the two
	// readings apart. A swap is never harmless there: the site moves |lat − lon| in both,
	// 134 km a degree at 47°, and a map written latitude first comes out mirrored, stretched
	// 1/cos φ one way and squeezed cos φ the other (the bundled example moved to 46.05° E and
	// swapped: 18 modules instead of 22, 7,583 instead of 8,574 kWh a year, the plan area
	// 1.9 % larger). The map's faces show the mirroring at any distance: see
	// geo.Site.SwapEvidence, which the survey adds when this check says nothing.
	if math.Abs(lonDeg) <= 90 && math.Abs(d) > swapMisfitH && swapped < swapFitH && math.Abs(lonDeg-latDeg) > 15 {
		out.Add(finding.Warning, "coordinates_swapped", subject,
			"latitude %.4f and longitude %.4f look swapped: the time zone %s (UTC%+g standard) fits longitude %.4f, not %.4f. GeoJSON gives longitude first ([lon, lat]); swap the two numbers in every coordinate (and in the site file's latitude and longitude, if given)",
			latDeg, lonDeg, zone, std, latDeg, lonDeg)
		return out
	}
	if math.Abs(d) > zoneWarnH {
		out.Add(finding.Warning, "timezone_far", zoneKey,
			"%s (UTC%+g standard) is %.1f hours from the site's longitude %.2f° (15° an hour); check the zone: a wrong one shifts every hour of the weather and the shade",
			zone, std, d, lonDeg)
	}
	return out
}

// FaceIrradiation is one roof face's annual plane-of-array irradiation without shade.
type FaceIrradiation struct {
	ID      string
	Subject string  // where the face is drawn: `roof.geojson: feature 2 (id "N")`
	KWhM2   float64 // kWh/m² a year
	Modules int     // modules placed on it
}

// PoorFaces flags every face with modules that receives less than 75 % of the best face's
// irradiation, saying by how much, so that nobody wires a dark face in unawares.
func PoorFaces(faces []FaceIrradiation) (out finding.List) {
	best := -1
	for i, f := range faces {
		if best < 0 || f.KWhM2 > faces[best].KWhM2 {
			best = i
		}
	}
	if best < 0 || !(faces[best].KWhM2 > 0) {
		return nil
	}
	b := faces[best]
	for _, f := range faces {
		share := f.KWhM2 / b.KWhM2
		if f.Modules == 0 || share >= poorFaceShare {
			continue
		}
		its := fmt.Sprintf("its %d modules earn", f.Modules)
		if f.Modules == 1 {
			its = "its 1 module earns"
		}
		out.Add(finding.Warning, "poor_face", f.Subject,
			"face %q receives %.0f kWh/m² a year, %.0f %% less than face %q (%.0f kWh/m²); %s about %.0f %% less each. Keep it empty (keep_empty: true on its roof feature) unless the customer wants the extra energy at that price",
			f.ID, f.KWhM2, (1-share)*100, b.ID, b.KWhM2, its, (1-share)*100)
	}
	return out
}
