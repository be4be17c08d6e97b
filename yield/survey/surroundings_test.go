package survey_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"sunstring/geo"
	"sunstring/yield/survey"
)

// street lays out, in metres about an invented origin, a south roof, a gabled neighbour to its
// south and a tree to its south-east; lonlat turns metres into "[lon,lat]".
var streetProj = geo.NewENU(15.43, 47.05, 0)

func lonlat(e, n float64) (float64, float64) {
	lon, lat, _ := streetProj.Inverse(geo.Vec3{E: e, N: n})
	return lon, lat
}

func polygonJSON(pts [][2]float64) string {
	var b strings.Builder
	b.WriteString(`{"type":"Polygon","coordinates":[[`)
	for i, p := range append(pts, pts[0]) {
		lon, lat := lonlat(p[0], p[1])
		if i > 0 {
			b.WriteString(",")
		}
		fmt.Fprintf(&b, "[%.10f,%.10f]", lon, lat)
	}
	b.WriteString("]]}")
	return b.String()
}

func rectPts(x0, y0, x1, y1 float64) [][2]float64 {
	return [][2]float64{{x0, y0}, {x1, y0}, {x1, y1}, {x0, y1}}
}

func streetMap(roof, obstacles bool) string {
	var fs []string
	if roof {
		fs = append(fs, `{"type":"Feature","properties":{"kind":"roof","id":"S","pitch_deg":30,"aspect_deg":180,"eave_height_m":5},"geometry":`+
			polygonJSON(rectPts(-5.5, -2.8, 5.5, 2.8))+`}`)
	}
	if obstacles {
		fs = append(fs, `{"type":"Feature","properties":{"kind":"block","id":"neighbour","height_m":8,"ridge_m":11,"ridge_azimuth_deg":90},"geometry":`+
			polygonJSON(rectPts(-6, -20, 6, -12))+`}`)
		lon, lat := lonlat(8, -10)
		fs = append(fs, fmt.Sprintf(`{"type":"Feature","properties":{"kind":"tree","id":"lime","height_m":12,"crown_radius_m":3,"crown_base_m":6},"geometry":{"type":"Point","coordinates":[%.10f,%.10f]}}`, lon, lat))
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(fs, ",\n") + "]}"
}

// streetOSM is the same neighbour and tree as OpenStreetMap would hold them: a way tagged with
// its height, roof height and the direction its roof slopes face, and a tree node.
func streetOSM() string {
	var b strings.Builder
	b.WriteString("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<osm version=\"0.6\" generator=\"hand\">\n")
	for i, p := range rectPts(-6, -20, 6, -12) {
		lon, lat := lonlat(p[0], p[1])
		fmt.Fprintf(&b, "  <node id=\"%d\" lat=\"%.10f\" lon=\"%.10f\"/>\n", i+1, lat, lon)
	}
	lon, lat := lonlat(8, -10)
	fmt.Fprintf(&b, "  <node id=\"9\" lat=\"%.10f\" lon=\"%.10f\">\n    <tag k=\"natural\" v=\"tree\"/>\n    <tag k=\"height\" v=\"12\"/>\n    <tag k=\"diameter_crown\" v=\"6\"/>\n  </node>\n", lat, lon)
	b.WriteString("  <way id=\"20\">\n    <nd ref=\"1\"/>\n    <nd ref=\"2\"/>\n    <nd ref=\"3\"/>\n    <nd ref=\"4\"/>\n    <nd ref=\"1\"/>\n" +
		"    <tag k=\"building\" v=\"house\"/>\n    <tag k=\"height\" v=\"11\"/>\n    <tag k=\"roof:height\" v=\"3\"/>\n" +
		"    <tag k=\"roof:shape\" v=\"gabled\"/>\n    <tag k=\"roof:direction\" v=\"S\"/>\n  </way>\n</osm>\n")
	return b.String()
}

func streetSurvey(t *testing.T, m string, surroundings []string) *survey.Result {
	t.Helper()
	cfg := survey.Defaults()
	cfg.Name, cfg.Map, cfg.Timezone = "street", "roof.geojson", "Europe/Vienna"
	lon0, lat0 := 15.43, 47.05
	cfg.Longitude, cfg.Latitude = &lon0, &lat0
	cfg.Climate.MonthlyGHI = []float64{36, 57, 98, 132, 160, 170, 176, 152, 107, 70, 38, 29} // invented, kWh/m²
	cfg.Climate.MonthlyT = []float64{-1, 1, 5, 10, 15, 18, 20, 20, 15, 10, 4, 0}             // invented, °C
	cfg.Module = survey.Module{PowerW: 410, VocV: 37.4, IscA: 13.9, VmpV: 31.3, ImpA: 13.1,
		TempCoeffVocPct: -0.27, TempCoeffIscPct: 0.048, TempCoeffPmaxPct: -0.34,
		CellsSeries: 120, HalfCut: true, BypassDiodes: 3, LengthM: 1.72, WidthM: 1.134, MaxSystemVoltage: 1000}
	cfg.Inverter = survey.Inverter{Count: 1, ACPowerW: 6000, MaxDCVoltageV: 600, MPPTMinV: 90, MPPTMaxV: 560,
		Inputs: 2, MaxInputCurrentA: 16, EfficiencyPct: 97.0}
	cfg.Layouts.Search = false
	cfg.Surroundings = surroundings
	if errs := cfg.Validate(); len(errs) > 0 {
		t.Fatal(errs)
	}
	// The same neighbour and tree as sunstring's kinds (street.geojson) and as a converter of
	// OpenStreetMap data writes them (tagged.geojson).
	lon, lat := lonlat(8, -10)
	return runSurvey(t, cfg, map[string]string{
		"roof.geojson":   m,
		"street.osm":     streetOSM(),
		"street.geojson": streetMap(false, true),
		"tagged.geojson": `{"type":"FeatureCollection","features":[{"type":"Feature","id":"way/20","properties":{"building":"house","height":11,"roof:height":3,"roof:shape":"gabled","roof:direction":"S"},"geometry":` +
			polygonJSON(rectPts(-6, -20, 6, -12)) + fmt.Sprintf(`},{"type":"Feature","id":"node/9","properties":{"natural":"tree","height":12,"diameter_crown":6},"geometry":{"type":"Point","coordinates":[%.10f,%.10f]}}]}`, lon, lat),
	})
}

// TestSurroundingsShadeAsDrawn: a neighbour building and a tree read from an OpenStreetMap
// extract shade the modules as the same two obstacles drawn by hand do: every module's beam shade
// loss within 0.1 percentage points. The neighbour's eaves 8 m and ridge 11 m come from height
// 11 and roof:height 3, the ridge's direction (90°) from roof:direction S, the crown's radius 3 m
// and base 6 m from diameter_crown 6 and height 12.
func TestSurroundingsShadeAsDrawn(t *testing.T) {
	drawn := streetSurvey(t, streetMap(true, true), nil)
	imported := streetSurvey(t, streetMap(true, false), []string{"street.osm"})
	d, m := drawn.Summary.ModuleResults, imported.Summary.ModuleResults
	if len(d) != len(m) || len(d) == 0 {
		t.Fatalf("%d modules drawn, %d with the extract", len(d), len(m))
	}
	worst, shaded := 0.0, 0.0
	for i := range d {
		if d[i].ID != m[i].ID {
			t.Fatalf("module %d: %s drawn, %s with the extract", i, d[i].ID, m[i].ID)
		}
		worst = math.Max(worst, math.Abs(d[i].BeamShadeLossPct-m[i].BeamShadeLossPct))
		shaded = math.Max(shaded, d[i].BeamShadeLossPct)
		if !scalar.EqualWithinAbs(d[i].BeamShadeLossPct, m[i].BeamShadeLossPct, 0.1) {
			t.Errorf("%s: beam shade %.3f %% drawn, %.3f %% from the extract", d[i].ID, d[i].BeamShadeLossPct, m[i].BeamShadeLossPct)
		}
	}
	t.Logf("%d modules, most shaded %.2f %% of beam, largest difference %.4f points", len(d), shaded, worst)
	// summary.json lists what the extract brought, with its source.
	var got []string
	for _, o := range imported.Summary.Surroundings {
		got = append(got, fmt.Sprintf("%s %s %s %g", o.Kind, o.ID, o.Source, o.HeightM))
	}
	if want := "block way/20 street.osm 11 | tree node/9 street.osm 12"; strings.Join(got, " | ") != want {
		t.Errorf("summary surroundings %q, want %q", strings.Join(got, " | "), want)
	}
	if len(drawn.Summary.Surroundings) != 0 {
		t.Errorf("drawn obstacles listed as surroundings: %v", drawn.Summary.Surroundings)
	}
	// The same two from GeoJSON, as sunstring's kinds and with OpenStreetMap tags.
	for _, f := range []string{"street.geojson", "tagged.geojson"} {
		g := streetSurvey(t, streetMap(true, false), []string{f}).Summary.ModuleResults
		if len(g) != len(d) {
			t.Fatalf("%s: %d modules, %d drawn", f, len(g), len(d))
		}
		for i := range d {
			if !scalar.EqualWithinAbs(d[i].BeamShadeLossPct, g[i].BeamShadeLossPct, 0.1) {
				t.Errorf("%s: %s: beam shade %.3f %% drawn, %.3f %% from the file", f, d[i].ID, d[i].BeamShadeLossPct, g[i].BeamShadeLossPct)
			}
		}
	}
	// The scene must shade at all, or the comparison proves nothing.
	if shaded < 1 {
		t.Errorf("the most shaded module loses %.2f %% of its beam light; the neighbour and the tree should shade the roof", shaded)
	}
}
