package cli

import (
	"fmt"

	"gonum.org/v1/plot/vg"

	"sunstring/geo"
	"sunstring/yield"
	"sunstring/yield/report"
)

// outputs renders every file of the report.
func (p *project) outputs(m *yield.Model, s *report.Summary, ls []rankedLayout, svg bool) (outputSet, error) {
	files := outputSet{}
	js, err := s.JSON()
	if err != nil {
		return nil, err
	}
	files["summary.json"] = js
	gj, err := geo.ExportGeoJSON(p.Site, p.Modules, func(i int) map[string]any {
		r := s.ModuleResults[i]
		props := map[string]any{
			"shade_loss_pct":      report.Round(r.ShadeLossPct, 2),
			"beam_shade_loss_pct": report.Round(r.BeamShadeLossPct, 2),
			"annual_poa_kwh_m2":   report.Round(r.AnnualPOAkWhM2, 1),
		}
		if r.String != "" {
			props["string"] = r.String
		}
		return props
	})
	if err != nil {
		return nil, fmt.Errorf("modules.geojson: %w", err)
	}
	files["modules.geojson"] = gj
	note := ""
	if s.Climate.Source == "indicative" {
		note = "INDICATIVE: clear-sky year, no climate data"
	}
	formats := []report.Format{report.PNG}
	if svg {
		formats = append(formats, report.SVG)
	}
	for _, f := range formats {
		b, err := report.Render(report.MonthlyChart(&s.MonthlyACkWh, &s.MonthlyUnshaded, note), 16*vg.Centimeter, 9*vg.Centimeter, f)
		if err != nil {
			return nil, err
		}
		files["monthly"+f.Ext()] = b
	}
	return files, nil
}
