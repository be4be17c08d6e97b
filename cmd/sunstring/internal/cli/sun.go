package cli

import (
	"encoding/json"
	"fmt"
	"math"
	"time"

	"github.com/spf13/cobra"

	"sunstring/shading/sun"
)

func newSunCmd() *cobra.Command {
	var (
		lat, lon, elev, pressure, temp, deltaT, tilt, aspect float64
		at                                                   string
		asJSON                                               bool
	)
	c := &cobra.Command{
		Use:   "sun --lat F --lon F --time RFC3339",
		Short: "Print the sun's position for one place and time",
		Long: `Print the sun's topocentric, refraction-corrected position (Reda & Andreas 2004,
NREL/TP-560-34302) for one place and instant, with the day's sunrise, transit and sunset
in the time's own offset. Azimuth is clockwise from true north. With --tilt and --aspect,
also the angle of incidence on that surface (aspect: the direction its slope faces).`,
		Example: `  sunstring sun --lat 39.742476 --lon -105.1786 --time 2003-10-17T12:30:30-07:00 \
    --elevation 1830.14 --pressure 820 --temperature 11 --delta-t 67 --tilt 30 --aspect 170 --json`,
		Args: args(cobra.NoArgs),
		RunE: func(c *cobra.Command, _ []string) error {
			var probs []string
			if !c.Flags().Changed("lat") || lat < -90 || lat > 90 {
				probs = append(probs, "--lat: give a latitude from -90 to 90 degrees (north positive)")
			}
			if !c.Flags().Changed("lon") || lon < -180 || lon > 180 {
				probs = append(probs, "--lon: give a longitude from -180 to 180 degrees (east positive)")
			}
			t, err := time.Parse(time.RFC3339, at)
			if err != nil {
				probs = append(probs, fmt.Sprintf("--time: %q is not an RFC 3339 time with an offset, such as 2026-06-21T12:00:00+02:00", at))
			}
			if c.Flags().Changed("aspect") && !c.Flags().Changed("tilt") {
				probs = append(probs, "--aspect needs --tilt: the incidence angle is for a tilted surface")
			}
			if tilt < 0 || tilt > 180 {
				probs = append(probs, fmt.Sprintf("--tilt %g: from 0 to 180 degrees", tilt))
			}
			if aspect < 0 || aspect >= 360 {
				probs = append(probs, fmt.Sprintf("--aspect %g: from 0 to 360 degrees (clockwise from north)", aspect))
			}
			if pressure < 0 || pressure > 1200 {
				probs = append(probs, "--pressure: from 0 to 1200 mbar (0: from the elevation)")
			}
			if len(probs) > 0 {
				return usageError{joinLines(probs)}
			}
			o := sun.Observer{LatDeg: lat, LonDeg: lon, ElevationM: elev, PressureMbar: pressure}
			if c.Flags().Changed("temperature") {
				o.TempC = &temp
			}
			if c.Flags().Changed("delta-t") {
				o.DeltaTSec = &deltaT
			}
			p := sun.At(t, o)
			day := sun.RiseTransitSet(t, o)
			out := map[string]any{
				"zenith_deg":    round6(p.Zenith.Degrees()),
				"azimuth_deg":   round6(p.Azimuth.Degrees()),
				"elevation_deg": round6(p.Elevation().Degrees()),
				"time":          t.Format(time.RFC3339),
			}
			fmtT := func(x time.Time, polar bool) any {
				if polar || x.IsZero() {
					return nil
				}
				return x.In(t.Location()).Format(time.RFC3339)
			}
			out["sunrise"] = fmtT(day.Sunrise, day.PolarDay || day.PolarNight)
			out["transit"] = fmtT(day.Transit, false)
			out["sunset"] = fmtT(day.Sunset, day.PolarDay || day.PolarNight)
			if day.PolarDay {
				out["polar"] = "day"
			} else if day.PolarNight {
				out["polar"] = "night"
			}
			if c.Flags().Changed("tilt") {
				out["incidence_deg"] = round6(sun.Incidence(p, tilt, aspect).Degrees())
			}
			w := c.OutOrStdout()
			if asJSON {
				enc := json.NewEncoder(w)
				enc.SetIndent("", "  ")
				return enc.Encode(out)
			}
			_, err = fmt.Fprintf(w, "zenith %.4f°  azimuth %.4f°  elevation %.4f°", p.Zenith.Degrees(), p.Azimuth.Degrees(), p.Elevation().Degrees())
			if v, ok := out["incidence_deg"]; ok {
				fmt.Fprintf(w, "  incidence %.4f°", v)
			}
			fmt.Fprintf(w, "\nsunrise %v  transit %v  sunset %v\n", orDash(out["sunrise"]), orDash(out["transit"]), orDash(out["sunset"]))
			return err
		},
	}
	f := c.Flags()
	f.Float64Var(&lat, "lat", 0, "latitude, degrees north")
	f.Float64Var(&lon, "lon", 0, "longitude, degrees east")
	f.StringVar(&at, "time", "", "instant, RFC 3339 with offset")
	f.Float64Var(&elev, "elevation", 0, "height above sea level, m")
	f.Float64Var(&pressure, "pressure", 0, "mean air pressure, mbar (default: from the elevation)")
	f.Float64Var(&temp, "temperature", 12, "mean air temperature, °C")
	f.Float64Var(&deltaT, "delta-t", 0, "TT − UT, seconds (default: Espenak & Meeus model)")
	f.Float64Var(&tilt, "tilt", 0, "surface tilt from horizontal, degrees")
	f.Float64Var(&aspect, "aspect", 180, "direction the surface faces, degrees clockwise from north")
	f.BoolVar(&asJSON, "json", false, "print one JSON object")
	return c
}

func round6(x float64) float64 { return math.Round(x*1e6) / 1e6 }

func orDash(v any) any {
	if v == nil {
		return "—"
	}
	return v
}
