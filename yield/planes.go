package yield

import (
	"time"

	"sunstring/shading/sun"
	"sunstring/yield/irradiance"
	"sunstring/yield/weather"
)

// Plane is a tilted plane, such as a roof face, to receive the weather.
type Plane struct {
	TiltDeg   float64 // from horizontal
	AspectDeg float64 // the direction it faces (downhill), clockwise from north
}

// PlaneIrradiation returns each plane's annual irradiation without shade, kWh/m²: beam, sky
// diffuse (sky model sky) and ground-reflected light (albedo), before incidence-angle and
// soiling losses, with the sun of every record found as the survey finds it (interval
// midpoint, or the middle of the sunlit part at sunrise and sunset). It is what a face would
// receive with nothing around it: cheap enough for `check`, which compares faces with it
// before any shade is computed.
func PlaneIrradiation(w *weather.Series, obs sun.Observer, zone *time.Location, sky irradiance.SkyModel, albedo float64, planes []Plane) []float64 {
	out := make([]float64, len(planes))
	if w == nil || len(planes) == 0 {
		return out
	}
	if zone == nil {
		zone = time.UTC
	}
	iv := w.Interval
	if iv <= 0 {
		iv = time.Hour
	}
	hours := iv.Hours()
	for _, r := range w.Records {
		p, lit := stepSun(r.End.Add(-iv), r.End, obs)
		if lit == 0 || !p.Up() {
			continue
		}
		doy := r.End.Add(-iv / 2).In(zone).YearDay()
		s := irradiance.Sky{DNI: r.DNI, DHI: r.DHI, GHI: r.GHI, ZenithDeg: p.Zenith.Degrees(),
			DNIExtra: irradiance.ExtraterrestrialNormal(doy), Albedo: albedo}
		for i, pl := range planes {
			theta := sun.Incidence(p, pl.TiltDeg, pl.AspectDeg).Degrees()
			out[i] += irradiance.Transpose(sky, s, theta, pl.TiltDeg).Total() * hours / 1000
		}
	}
	return out
}
