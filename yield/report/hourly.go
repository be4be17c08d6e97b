package report

import (
	"bytes"
	"encoding/csv"
	"math"
	"strconv"
	"time"
)

// HourlyRow is one weather record of the hourly CSV and what the chosen layout made of it.
// Values the model does not compute while the sun is down (sun position, beam share, the
// per-face and per-string light, the cell temperature) are NaN then and written empty.
type HourlyRow struct {
	EndUTC        time.Time // end of the interval (records stamp the interval's end: package weather)
	GHI, DNI, DHI float64   // W/m², means over the interval
	AirTempC      float64
	// SunElevDeg and SunAzDeg are the sun's elevation and azimuth (clockwise from north) as
	// the model took them: at the interval's midpoint, or for sunrise and sunset intervals at
	// the midpoint of their sunlit part.
	SunElevDeg, SunAzDeg float64
	// POA is the plane-of-array irradiance, W/m², the mean over the modules with shade
	// (before incidence-angle and soiling losses); 0 while the sun is down.
	POA float64
	// BeamLitPct is the mean over the modules of the share of cell area in direct sun, %.
	BeamLitPct float64
	// FacePOA is each face's plane-of-array irradiance without shade (W/m², before
	// incidence-angle and soiling losses), in the order of HourlyTable.Faces.
	FacePOA []float64
	// StringPOA is each string's plane-of-array irradiance, the mean over its modules with
	// shade (W/m², before incidence-angle and soiling losses), in the order of
	// HourlyTable.Strings.
	StringPOA []float64
	// CellTempC is the mean cell temperature of the layout's modules, °C.
	CellTempC float64
	// DCW is the mean DC power of the chosen layout at its operating points, W, before the
	// flat DC losses; 0 while the sun is down.
	DCW float64
	// ACW is the mean AC power of the chosen layout over the interval, W, after the flat DC
	// losses (module tolerance mismatch, DC wiring) but before availability and the inverter's
	// night consumption; 0 while the sun is down.
	ACW float64
}

// HourlyTable is the content of hourly.csv: the names of the faces and strings whose light
// has a column each, and one row per weather record.
type HourlyTable struct {
	Faces   []string // face ids
	Strings []string // "<input>.<string>", both from 1
	Rows    []HourlyRow
}

// Header returns the CSV header: units in every column name; one column per face
// ("poa_unshaded_<face>_w_m2") and per string ("poa_string_<input>.<string>_w_m2").
func (t HourlyTable) Header() []string {
	h := []string{"time_utc_end", "ghi_w_m2", "dni_w_m2", "dhi_w_m2", "air_temp_c",
		"sun_elevation_deg", "sun_azimuth_deg", "poa_w_m2", "beam_lit_pct"}
	for _, f := range t.Faces {
		h = append(h, "poa_unshaded_"+f+"_w_m2")
	}
	for _, s := range t.Strings {
		h = append(h, "poa_string_"+s+"_w_m2")
	}
	return append(h, "cell_temp_c", "dc_w", "ac_w")
}

// HourlyCSV writes the table as CSV with its Header, RFC 3339 times and fixed decimals, so
// the same inputs give the same bytes. NaN values are written empty.
func HourlyCSV(t HourlyTable) ([]byte, error) {
	var buf bytes.Buffer
	w := csv.NewWriter(&buf)
	if err := w.Write(t.Header()); err != nil {
		return nil, err
	}
	f := func(x float64, d int) string {
		if math.IsNaN(x) {
			return ""
		}
		return strconv.FormatFloat(Round(x, d)+0, 'f', d, 64)
	}
	for _, r := range t.Rows {
		rec := []string{r.EndUTC.UTC().Format(time.RFC3339), f(r.GHI, 1), f(r.DNI, 1), f(r.DHI, 1), f(r.AirTempC, 1),
			f(r.SunElevDeg, 2), f(r.SunAzDeg, 2), f(r.POA, 1), f(r.BeamLitPct, 1)}
		for k := range t.Faces {
			x := math.NaN()
			if k < len(r.FacePOA) {
				x = r.FacePOA[k]
			}
			rec = append(rec, f(x, 1))
		}
		for k := range t.Strings {
			x := math.NaN()
			if k < len(r.StringPOA) {
				x = r.StringPOA[k]
			}
			rec = append(rec, f(x, 1))
		}
		rec = append(rec, f(r.CellTempC, 1), f(r.DCW, 1), f(r.ACW, 1))
		if err := w.Write(rec); err != nil {
			return nil, err
		}
	}
	w.Flush()
	return buf.Bytes(), w.Error()
}
