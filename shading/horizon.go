package shading

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// Horizon is a far horizon: the elevation of distant terrain against azimuth, the same from
// every point of the site because the terrain is far away compared with the roof. The zero
// value (and a nil *Horizon) is a flat horizon at elevation 0.
type Horizon struct {
	az, el []float64 // degrees; az strictly increasing in [0, 360)
}

// Sentinel errors of the horizon reader; a *HorizonError wraps one of them.
var (
	ErrHorizonHeader = errors.New("shading: horizon header must be azimuth_deg,elevation_deg")
	ErrHorizonNumber = errors.New("shading: horizon value is not a number")
	ErrHorizonRange  = errors.New("shading: horizon value out of range")
	ErrHorizonOrder  = errors.New("shading: horizon azimuths must increase strictly")
	ErrHorizonEmpty  = errors.New("shading: horizon has no points")
)

// HorizonError is a problem in a horizon file, with the file's name and the line.
type HorizonError struct {
	Name string
	Line int // 1-based; 0 when the problem is the file as a whole
	Msg  string
	Err  error // one of the ErrHorizon… sentinels, or the CSV reader's error
}

func (e *HorizonError) Error() string {
	where := e.Name
	if e.Line > 0 {
		where = fmt.Sprintf("%s:%d", e.Name, e.Line)
	}
	if e.Msg == "" {
		return fmt.Sprintf("%s: %v", where, e.Err)
	}
	return fmt.Sprintf("%s: %v: %s", where, e.Err, e.Msg)
}

func (e *HorizonError) Unwrap() error { return e.Err }

// BadInput reports whether the error is the user's input (always: the command exits with 2).
func (e *HorizonError) BadInput() bool { return true }

// ReadHorizon reads a far-horizon profile: CSV with the header "azimuth_deg,elevation_deg"
// and one point per row, azimuth in [0, 360) strictly increasing, elevation in [0, 90).
// name is used in error messages only.
func ReadHorizon(r io.Reader, name string) (*Horizon, error) {
	cr := csv.NewReader(r)
	cr.FieldsPerRecord = 2
	cr.TrimLeadingSpace = true
	cr.ReuseRecord = true
	bad := func(line int, err error, msg string) error {
		return &HorizonError{Name: name, Line: line, Msg: msg, Err: err}
	}
	rec, err := cr.Read()
	if err == io.EOF {
		return nil, bad(0, ErrHorizonEmpty, "the file is empty")
	}
	if err != nil {
		return nil, csvError(name, err)
	}
	if strings.TrimPrefix(strings.TrimSpace(rec[0]), "\ufeff") != "azimuth_deg" || strings.TrimSpace(rec[1]) != "elevation_deg" {
		return nil, bad(1, ErrHorizonHeader, fmt.Sprintf("found %q,%q", rec[0], rec[1]))
	}
	h := &Horizon{}
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvError(name, err)
		}
		line, _ := cr.FieldPos(0)
		az, err1 := strconv.ParseFloat(strings.TrimSpace(rec[0]), 64)
		el, err2 := strconv.ParseFloat(strings.TrimSpace(rec[1]), 64)
		switch {
		case err1 != nil:
			return nil, bad(line, ErrHorizonNumber, fmt.Sprintf("azimuth_deg %q", rec[0]))
		case err2 != nil:
			return nil, bad(line, ErrHorizonNumber, fmt.Sprintf("elevation_deg %q", rec[1]))
		case !(az >= 0 && az < 360):
			return nil, bad(line, ErrHorizonRange, fmt.Sprintf("azimuth_deg %g, allowed [0, 360)", az))
		case !(el >= 0 && el < 90):
			return nil, bad(line, ErrHorizonRange, fmt.Sprintf("elevation_deg %g, allowed [0, 90)", el))
		case len(h.az) > 0 && az <= h.az[len(h.az)-1]:
			return nil, bad(line, ErrHorizonOrder, fmt.Sprintf("azimuth_deg %g after %g", az, h.az[len(h.az)-1]))
		}
		h.az = append(h.az, az)
		h.el = append(h.el, el)
	}
	if len(h.az) == 0 {
		return nil, bad(0, ErrHorizonEmpty, "a header but no rows")
	}
	return h, nil
}

func csvError(name string, err error) error {
	var pe *csv.ParseError
	if errors.As(err, &pe) {
		return &HorizonError{Name: name, Line: pe.Line, Err: pe.Err}
	}
	return &HorizonError{Name: name, Err: err}
}

// HorizonFromPoints builds a horizon from azimuth and elevation points in degrees with the
// same rules as ReadHorizon.
func HorizonFromPoints(azDeg, elDeg []float64) (*Horizon, error) {
	var b strings.Builder
	b.WriteString("azimuth_deg,elevation_deg\n")
	if len(azDeg) != len(elDeg) {
		return nil, &HorizonError{Name: "points", Err: ErrHorizonRange, Msg: "azimuth and elevation counts differ"}
	}
	for i := range azDeg {
		fmt.Fprintf(&b, "%s,%s\n", strconv.FormatFloat(azDeg[i], 'g', -1, 64), strconv.FormatFloat(elDeg[i], 'g', -1, 64))
	}
	return ReadHorizon(strings.NewReader(b.String()), "points")
}

// ElevationDeg returns the horizon's elevation at an azimuth (degrees, any value; it wraps at
// 360), interpolating linearly between points and across north between the last and the
// first point.
func (h *Horizon) ElevationDeg(azimuthDeg float64) float64 {
	if h == nil || len(h.az) == 0 || math.IsNaN(azimuthDeg) || math.IsInf(azimuthDeg, 0) {
		return 0
	}
	n := len(h.az)
	if n == 1 {
		return h.el[0]
	}
	a := math.Mod(azimuthDeg, 360)
	if a < 0 {
		a += 360
	}
	// Binary search for the first point with az > a.
	lo, hi := 0, n
	for lo < hi {
		m := (lo + hi) / 2
		if h.az[m] <= a {
			lo = m + 1
		} else {
			hi = m
		}
	}
	var a0, e0, a1, e1 float64
	switch lo {
	case 0: // before the first point: between the last (shifted back a turn) and the first
		a0, e0, a1, e1 = h.az[n-1]-360, h.el[n-1], h.az[0], h.el[0]
	case n: // after the last point: between the last and the first (shifted on a turn)
		a0, e0, a1, e1 = h.az[n-1], h.el[n-1], h.az[0]+360, h.el[0]
	default:
		a0, e0, a1, e1 = h.az[lo-1], h.el[lo-1], h.az[lo], h.el[lo]
	}
	return e0 + (e1-e0)*(a-a0)/(a1-a0)
}

// maxElevationDeg is the highest point of the profile.
func (h *Horizon) maxElevationDeg() float64 {
	m := 0.0
	if h != nil {
		for _, e := range h.el {
			m = math.Max(m, e)
		}
	}
	return m
}
