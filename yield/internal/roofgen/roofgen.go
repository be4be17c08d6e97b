package roofgen

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"

	"sunstring/geo"
)

// Origin of the invented site (longitude, latitude in degrees).
const (
	LonDeg = 15.43
	LatDeg = 47.05
)

// Roof geometry: one south face at a low pitch, deep enough for RowsOfModules rows of
// portrait modules; its width follows the number of modules asked for.
const (
	PitchDeg     = 10
	EaveHeightM  = 8
	rowsOfModule = 18
	moduleL      = 1.72
	moduleW      = 1.134
	gapM         = 0.02
	setbackM     = 0.4
	unitModules  = 5.75
)

// Options choose the roof's size and its surroundings. The zero value is the reference roof:
// about 430 modules, 20 rooftop units, 6 trees; other sizes keep the same density of units
// (one per 21.5 modules).
type Options struct {
	Modules int // about this many modules fit; 0 means 430
	Units   int // rooftop units (blocks standing on the roof); 0 means one per 21.5 modules, negative none
	Trees   int // trees around the building; 0 means 6, negative none
}

func (o Options) norm() Options {
	if o.Modules <= 0 {
		o.Modules = 430
	}
	if o.Units == 0 {
		o.Units = max(1, int(math.Round(float64(o.Modules)/21.5)))
	}
	if o.Trees == 0 {
		o.Trees = 6
	}
	return o
}

// Map returns the roof as a GeoJSON FeatureCollection, one feature a line.
func Map(opt Options) []byte {
	opt = opt.norm()
	slope := 2*setbackM + rowsOfModule*(moduleL+gapM)
	depth := slope * math.Cos(PitchDeg*math.Pi/180)
	// Each rooftop unit with its clearance takes about unitModules modules; widen the roof to
	// make up for them.
	cols := (float64(opt.Modules) + unitModules*float64(max(opt.Units, 0))) / rowsOfModule
	width := 2*setbackM + math.Ceil(cols)*(moduleW+gapM)
	p := geo.NewENU(LonDeg, LatDeg, 0)
	var feats []feature
	x0, y0 := -width/2, -depth/2
	feats = append(feats, feature{
		props: map[string]any{"kind": "roof", "id": "hall", "pitch_deg": PitchDeg, "aspect_deg": 180, "eave_height_m": EaveHeightM},
		geom:  polygon(p, rect(x0, y0, x0+width, y0+depth)),
	})
	r := rand.New(rand.NewPCG(uint64(opt.Modules), 20261205))
	roofAt := func(y float64) float64 { return EaveHeightM + (y-y0)*math.Tan(PitchDeg*math.Pi/180) }
	for i := range max(opt.Units, 0) {
		// Units of 1 to 2.5 m a side, 0.8 to 2 m above the roof, kept inside the face.
		w, d := 1+1.5*r.Float64(), 1+1.5*r.Float64()
		x := x0 + 1 + r.Float64()*(width-2-w)
		y := y0 + 1 + r.Float64()*(depth-2-d)
		h := roofAt(y+d) + 0.8 + 1.2*r.Float64()
		feats = append(feats, feature{
			props: map[string]any{"kind": "block", "id": fmt.Sprintf("unit-%d", i+1), "height_m": round(h, 2)},
			geom:  polygon(p, rect(x, y, x+w, y+d)),
		})
	}
	// A taller neighbouring building to the south-west.
	feats = append(feats, feature{
		props: map[string]any{"kind": "block", "id": "neighbour", "height_m": 14},
		geom:  polygon(p, rect(x0-22, y0-30, x0-4, y0-16)),
	})
	for i := range max(opt.Trees, 0) {
		// Along the south, east and west sides, 6 to 14 m from the walls.
		var e, n float64
		switch i % 3 {
		case 0:
			e, n = x0+r.Float64()*width, y0-6-8*r.Float64()
		case 1:
			e, n = x0+width+6+8*r.Float64(), y0+r.Float64()*depth
		default:
			e, n = x0-6-8*r.Float64(), y0+r.Float64()*depth
		}
		h := 10 + 8*r.Float64()
		props := map[string]any{"kind": "tree", "id": fmt.Sprintf("tree-%d", i+1), "height_m": round(h, 1),
			"crown_radius_m": round(2.5+2*r.Float64(), 1), "crown_base_m": round(h/3, 1)}
		if i%2 == 0 {
			props["leaf_off_transmittance"] = 0.6
		}
		lon, lat, _ := p.Inverse(geo.Vec3{E: e, N: n})
		feats = append(feats, feature{props: props, geom: map[string]any{"type": "Point", "coordinates": []float64{round(lon, 9), round(lat, 9)}}})
	}
	var buf bytes.Buffer
	buf.WriteString("{\"type\": \"FeatureCollection\", \"features\": [\n")
	for i, f := range feats {
		b, err := json.Marshal(map[string]any{"type": "Feature", "properties": f.props, "geometry": f.geom})
		if err != nil {
			panic(err) // only maps, strings and numbers: cannot fail
		}
		buf.WriteString("  ")
		buf.Write(b)
		if i < len(feats)-1 {
			buf.WriteByte(',')
		}
		buf.WriteByte('\n')
	}
	buf.WriteString("]}\n")
	return buf.Bytes()
}

type feature struct {
	props map[string]any
	geom  map[string]any
}

func rect(x0, y0, x1, y1 float64) [][2]float64 {
	return [][2]float64{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}, {x0, y0}}
}

func polygon(p *geo.ENU, pts [][2]float64) map[string]any {
	ring := make([][]float64, len(pts))
	for i, q := range pts {
		lon, lat, _ := p.Inverse(geo.Vec3{E: q[0], N: q[1]})
		ring[i] = []float64{round(lon, 9), round(lat, 9)}
	}
	return map[string]any{"type": "Polygon", "coordinates": [][][]float64{ring}}
}

func round(x float64, d int) float64 {
	s := math.Pow(10, float64(d))
	return math.Round(x*s) / s
}

// SiteOptions choose the inverter side of the site file.
type SiteOptions struct {
	Map    string // the map's file name, relative to the site file
	Inputs int    // inverter inputs; 0 means 10
	// Inverters shares the 150 kW among that many identical inverters (inverter.count), each
	// with Inputs inputs; 0 means one.
	Inverters int
}

// Site returns a site file for the roof: the invented 410 W module of the example, 150 kW of
// inverters with Inputs inputs each taking two strings (up to 23 modules a string).
func Site(opt SiteOptions) []byte {
	if opt.Inputs <= 0 {
		opt.Inputs = 10
	}
	count := ""
	acW := 150000
	if opt.Inverters > 1 {
		count = fmt.Sprintf("\n  count: %d", opt.Inverters)
		acW /= opt.Inverters
	}
	if opt.Map == "" {
		opt.Map = "roof.geojson"
	}
	var b bytes.Buffer
	fmt.Fprintf(&b, `# An invented low-pitch hall roof for benchmarks, written by yield/internal/roofgen. All
# names and numbers are made up.
name: Large hall roof (invented)
map: %s
timezone: Europe/Vienna
latitude: %g
longitude: %g
climate:
  monthly_ghi_kwh_m2: [36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29]
  monthly_temp_c: [-1.0, 1.0, 5.2, 10.1, 14.8, 18.2, 20.1, 19.6, 15.2, 9.9, 4.3, 0.2]
  low_temp_c: -16
  high_temp_c: 34
  albedo: 0.2
module:
  power_w: 410
  voc_v: 37.4
  isc_a: 13.9
  vmp_v: 31.3
  imp_a: 13.1
  temp_coeff_voc_pct: -0.27
  temp_coeff_isc_pct: 0.048
  temp_coeff_pmax_pct: -0.34
  cells_series: 120
  half_cut: true
  bypass_diodes: 3
  length_m: %g
  width_m: %g
inverter:%s
  ac_power_w: %d
  max_dc_voltage_v: 1000
  mppt_min_v: 200
  mppt_max_v: 850
  inputs: %d
  max_input_current_a: 30
  efficiency_pct: [[0.05, 93.0], [0.1, 95.5], [0.2, 97.0], [0.3, 97.6], [0.5, 98.0], [1.0, 97.7]]
  night_w: 5
fill:
  orientation: portrait
  setback_m: %g
  gap_m: %g
layouts:
  search: true
  keep: 5
`, opt.Map, LatDeg, LonDeg, moduleL, moduleW, count, acW, opt.Inputs, setbackM, gapM)
	b.WriteString(`losses:
  soiling_pct: 2
  wiring_pct: 1
  mismatch_pct: 1
  availability_pct: 0.5
`)
	return b.Bytes()
}
