package sun_test

import (
	"fmt"
	"time"

	"sunstring/shading/sun"
)

// The worked example of Reda & Andreas (2004, rev. 2008), NREL/TP-560-34302, Table A5.1:
// 17 October 2003, 12:30:30 local standard time (UTC−7) near Golden, Colorado, with the
// report's pressure, temperature and ΔT. The report gives zenith 50.11162°, azimuth
// 194.34024° and incidence 25.18700° on a 30° slope facing 10° east of south.
func ExampleAt() {
	temp, deltaT := 11.0, 67.0
	o := sun.Observer{LatDeg: 39.742476, LonDeg: -105.1786, ElevationM: 1830.14,
		PressureMbar: 820, TempC: &temp, DeltaTSec: &deltaT}
	t := time.Date(2003, 10, 17, 12, 30, 30, 0, time.FixedZone("UTC-7", -7*3600))

	p := sun.At(t, o)
	fmt.Printf("zenith %.3f°, azimuth %.3f°\n", p.Zenith.Degrees(), p.Azimuth.Degrees())
	fmt.Printf("incidence on 30° tilt, aspect 170°: %.3f°\n", sun.Incidence(p, 30, 170).Degrees())
	// Output:
	// zenith 50.112°, azimuth 194.340°
	// incidence on 30° tilt, aspect 170°: 25.187°
}

// Sunrise, transit and sunset of the same local day and place, to the minute. The report
// gives sunrise 06:12:43.46 and transit 11:46:04.97 local standard time; its sunset
// (17:20:19.19) is that of the evening before, as its code takes the UT day.
func ExampleRiseTransitSet() {
	deltaT := 67.0
	o := sun.Observer{LatDeg: 39.742476, LonDeg: -105.1786, ElevationM: 1830.14, DeltaTSec: &deltaT}
	day := time.Date(2003, 10, 17, 0, 0, 0, 0, time.FixedZone("UTC-7", -7*3600))

	d := sun.RiseTransitSet(day, o)
	for _, e := range []struct {
		name string
		at   time.Time
	}{{"sunrise", d.Sunrise}, {"transit", d.Transit}, {"sunset", d.Sunset}} {
		fmt.Println(e.name, e.at.Round(time.Minute).Format("15:04"))
	}
	// Output:
	// sunrise 06:13
	// transit 11:46
	// sunset 17:19
}
