package weather_test

import (
	"fmt"
	"strings"
	"time"

	"sunstring/yield/weather"
)

// A synthetic hourly year from monthly totals of global horizontal irradiation and monthly
// mean air temperatures, for an invented site at 47° N in central Europe. The year keeps each
// month's total to within 0.1 %.
func ExampleFromMonthly() {
	zone := time.FixedZone("UTC+1", 3600)
	site := weather.Site{LatDeg: 47.07, LonDeg: 15.44, ElevationM: 360, Zone: zone}
	ghi := [12]float64{35, 55, 95, 130, 160, 170, 175, 150, 105, 70, 38, 28} // kWh/m²
	temp := [12]float64{-1, 1, 5, 10, 15, 18, 20, 19.5, 15, 10, 4, 0}        // °C

	s, err := weather.FromMonthly(site, ghi, temp)
	if err != nil {
		fmt.Println(err)
		return
	}
	annual := 0.0
	for _, m := range s.Monthly() {
		annual += m.GHIKWhM2
	}
	fmt.Println(len(s.Records), "hours from", s.Source, "values")
	fmt.Printf("annual GHI %.0f kWh/m² (monthly inputs sum to 1211)\n", annual)
	fmt.Printf("June %.0f kWh/m², mean %.1f °C\n", s.Monthly()[5].GHIKWhM2, s.Monthly()[5].TempC)
	// Output:
	// 8760 hours from monthly values
	// annual GHI 1211 kWh/m² (monthly inputs sum to 1211)
	// June 170 kWh/m², mean 18.0 °C
}

// Reading a few hours of the CSV format (a survey needs a whole year). The location comes from
// the comment lines; the missing direct and diffuse columns are split from GHI with Erbs et
// al. (1982), and the wind defaults to 1 m/s. Times come back in UTC, stamping each hour's end.
func ExampleReadCSV() {
	const doc = `# latitude_deg: 47.07
# longitude_deg: 15.44
# elevation_m: 360
time,ghi_w_m2,air_temp_c
2025-06-01T12:00:00+02:00,702.0,21.5
2025-06-01T13:00:00+02:00,812.0,23.4
2025-06-01T14:00:00+02:00,455.0,22.0
`
	s, err := weather.ReadCSV(strings.NewReader(doc), "june.csv")
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%d hours at %.2f° N, %.2f° E, UTC%+.0f\n", len(s.Records), s.LatDeg, s.LonDeg, s.TZOffsetHours)
	for _, r := range s.Records {
		fmt.Printf("%s GHI %.0f, DNI %.0f, DHI %.0f W/m², wind %.0f m/s\n",
			r.End.Format(time.RFC3339), r.GHI, r.DNI, r.DHI, r.WindMS)
	}
	for _, w := range s.Warnings {
		fmt.Println("warning:", w)
	}
	// Output:
	// 3 hours at 47.07° N, 15.44° E, UTC+2
	// 2025-06-01T10:00:00Z GHI 702, DNI 479, DHI 289 W/m², wind 1 m/s
	// 2025-06-01T11:00:00Z GHI 812, DNI 646, DHI 229 W/m², wind 1 m/s
	// 2025-06-01T12:00:00Z GHI 455, DNI 67, DHI 395 W/m², wind 1 m/s
	// warning: 3 hours without direct and diffuse values: split from GHI with the Erbs et al. (1982) correlation
	// warning: the data covers 3 hours (2025-06-01T10:00:00Z to 2025-06-01T12:00:00Z), not one whole year; annual figures cover this span only
}
