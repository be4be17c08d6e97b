package geo

import "bytes"

// avoidKind is an area on a roof where no module may go.
var avoidKind = kind{
	name:     "avoid",
	geometry: "Polygon",
	props:    []string{"id"},
	build: func(d *decoder, f *rawFeature) {
		if r, ok := d.ring(f); ok {
			d.site.Avoids = append(d.site.Avoids, Avoid{ID: f.id, Index: f.index, Area: r})
		}
	},
	export: func(e *exporter, s *Site) []exportItem {
		var out []exportItem
		for i := range s.Avoids {
			a := &s.Avoids[i]
			out = append(out, exportItem{index: a.Index, write: func(b *bytes.Buffer) error {
				return e.feature(b, e.ring(a.Area), kv{"kind", "avoid"}, kv{"id", a.ID})
			}})
		}
		return out
	},
}

// panelKind is a module drawn by hand; its face then gets no automatic fill.
var panelKind = kind{
	name:     "panel",
	geometry: "Polygon",
	props:    []string{"id"},
	build: func(d *decoder, f *rawFeature) {
		if r, ok := d.ring(f); ok {
			d.site.Panels = append(d.site.Panels, Panel{ID: f.id, Index: f.index, Outline: r})
		}
	},
	export: func(e *exporter, s *Site) []exportItem {
		var out []exportItem
		for i := range s.Panels {
			p := &s.Panels[i]
			out = append(out, exportItem{index: p.Index, write: func(b *bytes.Buffer) error {
				return e.feature(b, e.ring(p.Outline), kv{"kind", "panel"}, kv{"id", p.ID})
			}})
		}
		return out
	},
}
