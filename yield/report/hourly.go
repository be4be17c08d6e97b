package report

import (
	"bytes"
	"encoding/csv"
	"math"
	"strconv"
	"time"
)

// HourlyRow is one weather record of the hourly CSV and what the chosen layout made of it.
type HourlyRow struct {
	EndUTC        time.Time // end of the interval (records stamp the interval's end: package weather)
	GHI, DNI, DHI float64   // W/m², means over the interval
	AirTempC      float64
	// POA is the plane-of-array irradiance, W/m², the mean over the modules with shade
	// (before incidence-angle and soiling losses); 0 while the sun is down.
	POA float64
	// BeamLitPct is the mean over the modules of the share of cell area in direct sun, %;
	// NaN while the sun is down.
	BeamLitPct float64
	// ACW is the mean AC power of the chosen layout over the interval, W, after the flat DC
	// losses (module tolerance mismatch, DC wiring) but before availability and the inverter's
	// night consumption; 0 while the sun is down.
	ACW float64
}

// HourlyHeader is the CSV header: units in every column name.
var HourlyHeader = []string{"time_utc_end", "ghi_w_m2", "dni_w_m2", "dhi_w_m2", "air_temp_c", "poa_w_m2", "beam_lit_pct", "ac_w"}

// HourlyCSV writes the rows as CSV with HourlyHeader, RFC 3339 times and fixed decimals, so
// the same inputs give the same bytes. beam_lit_pct is empty while the sun is down.
func HourlyCSV(rows []HourlyRow) ([]byte, error) {
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	if err := w.Write(HourlyHeader); err != nil {
		return nil, err
	}
	f := func(x float64, d int) string { return strconv.FormatFloat(Round(x, d)+0, 'f', d, 64) }
	for _, r := range rows {
		lit := ""
		if !math.IsNaN(r.BeamLitPct) {
			lit = f(r.BeamLitPct, 1)
		}
		rec := []string{r.EndUTC.UTC().Format(time.RFC3339), f(r.GHI, 1), f(r.DNI, 1), f(r.DHI, 1), f(r.AirTempC, 1), f(r.POA, 1), lit, f(r.ACW, 1)}
		if err := w.Write(rec); err != nil {
			return nil, err
		}
	}
	w.Flush()
	return buf.Bytes(), w.Error()
}
