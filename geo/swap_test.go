package geo

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"
)

// drawnFace is a roof face for swapMap: corners in local metres (east, north), unclosed.
type drawnFace struct {
	id     string
	aspect float64
	pts    [][2]float64
	asIs   bool // written longitude first even in a swapped map, about the swapped map's centre
}

// swapMap writes faces (pitch 35°, eaves at 6 m) as a map at latitude lat0 and longitude
// lon0; swap writes every coordinate latitude first.
func swapMap(lat0, lon0 float64, swap bool, faces ...drawnFace) string {
	mLat := 1 / 111195.0
	mLon := mLat / math.Cos(lat0*math.Pi/180)
	var fs []string
	for _, f := range faces {
		var parts []string
		for _, p := range append(f.pts, f.pts[0]) {
			lon, lat := lon0+p[0]*mLon, lat0+p[1]*mLat
			switch {
			case swap && f.asIs:
				lon, lat = lat0+p[0]*mLat/math.Cos(lon0*math.Pi/180), lon0+p[1]*mLat
			case swap:
				lon, lat = lat, lon
			}
			parts = append(parts, fmt.Sprintf("[%.9f,%.9f]", lon, lat))
		}
		fs = append(fs, fmt.Sprintf(`{"type":"Feature","geometry":{"type":"Polygon","coordinates":[[%s]]},"properties":{"kind":"roof","id":%q,"pitch_deg":35,"aspect_deg":%g,"eave_height_m":6}}`,
			strings.Join(parts, ","), f.id, f.aspect))
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(fs, ",") + `]}`
}

// turn rotates the corners by deg clockwise about the origin.
func turn(deg float64, pts ...[2]float64) [][2]float64 {
	a := deg * math.Pi / 180
	out := make([][2]float64, len(pts))
	for i, p := range pts {
		out[i] = [2]float64{p[0]*math.Cos(a) + p[1]*math.Sin(a), -p[0]*math.Sin(a) + p[1]*math.Cos(a)}
	}
	return out
}

// TestSwapEvidence: a drawing written latitude first is mirrored across the north-east
// diagonal; a face then runs across its aspect only by chance, and a shared ridge no longer
// has one height (analytic: a gable's two faces meet at 6 + 4·tan 35° = 8.80 m along a ridge
// drawn east–west; mirrored, the shared edge runs north–south and the faces' heights along it
// cross, 10 m apart at its ends). Rectangles at compass-point aspects fit either reading by
// their edges alone, and faces on the diagonals fit both readings whole: nothing to say.
func TestSwapEvidence(t *testing.T) {
	gable := []drawnFace{
		{"S", 180, [][2]float64{{0, 0}, {10, 0}, {10, 4}, {0, 4}}, false},
		{"N", 0, [][2]float64{{0, 4}, {10, 4}, {10, 8}, {0, 8}}, false},
	}
	// A garage turned 20° clockwise from the compass, its slope facing 200°.
	garage := drawnFace{"G", 200, turn(20, [2]float64{0, 0}, [2]float64{6, 0}, [2]float64{6, 5.5}, [2]float64{0, 5.5}), false}
	// A gable turned 45°: its faces look south-east and north-west.
	diagonal := []drawnFace{
		{"SE", 135, turn(45, [2]float64{0, 0}, [2]float64{10, 0}, [2]float64{10, 4}, [2]float64{0, 4}), false},
		{"NW", 315, turn(45, [2]float64{0, 4}, [2]float64{10, 4}, [2]float64{10, 8}, [2]float64{0, 8}), false},
	}
	tests := []struct {
		name     string
		lat, lon float64
		swap     bool
		faces    []drawnFace
		want     []string
	}{
		{"gable drawn right, 1° apart", 47.05, 46.05, false, gable, nil},
		{"gable swapped, 1° apart", 47.05, 46.05, true, gable, []string{"S", "N"}},
		{"gable swapped, latitude equal to longitude", 45, 45, true, gable, []string{"S", "N"}},
		{"gable swapped, 31.6° apart", 47.05, 15.43, true, gable, []string{"S", "N"}},
		{"turned face swapped", 47.05, 46.05, true, []drawnFace{garage}, []string{"G"}},
		{"turned face drawn right", 47.05, 46.05, false, []drawnFace{garage}, nil},
		{"lone south face swapped: a rectangle fits both", 47.05, 46.05, true, gable[:1], nil},
		{"faces on the diagonals swapped: both readings fit", 47.05, 46.05, true, diagonal, nil},
		// One face that fits only as drawn outweighs the others: nothing is said.
		{"gable swapped beside a face fitting as drawn", 47.05, 46.05, true,
			append(slices.Clone(gable), drawnFace{"X", 200, turn(20, [2]float64{20, 0}, [2]float64{26, 0}, [2]float64{26, 5}, [2]float64{20, 5}), true}), nil},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s, err := Decode(strings.NewReader(swapMap(tc.lat, tc.lon, tc.swap, tc.faces...)), DecodeOptions{File: "m.geojson"})
			if err != nil {
				t.Fatal(err)
			}
			if got := s.SwapEvidence(); !slices.Equal(got, tc.want) {
				t.Errorf("SwapEvidence = %q, want %q", got, tc.want)
			}
		})
	}
}
