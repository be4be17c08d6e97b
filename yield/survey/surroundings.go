package survey

import (
	"bytes"
	"fmt"
	"path/filepath"
	"strings"

	"sunstring/geo"
	"sunstring/geo/osm"
)

// surroundingsFormat tells a surroundings file's format by its name: "osm" or "geojson".
func surroundingsFormat(path string) (string, bool) {
	switch strings.ToLower(filepath.Ext(path)) {
	case ".osm", ".xml":
		return "osm", true
	case ".geojson", ".json":
		return "geojson", true
	}
	return "", false
}

// loadSurroundings reads each surroundings file the site file lists and adds its obstacles near
// the roofs to the site, each with the file's name as written in the site file as its source.
func (p *Project) loadSurroundings(read ReadFunc) error {
	cfg := p.Cfg
	for _, name := range cfg.Surroundings {
		path := cfg.Path(name)
		raw, err := read(path, "surroundings file")
		if err != nil {
			return err
		}
		format, _ := surroundingsFormat(name)
		var imp *geo.Surroundings
		switch format {
		case "osm":
			imp, err = osm.Read(bytes.NewReader(raw), p.Site.Proj, osm.Options{File: path})
		case "geojson":
			if osm.HasKinds(raw) {
				imp, err = geoJSONSurroundings(raw, path, p.Site.Proj, cfg.ElevationM)
			} else {
				imp, err = osm.ReadGeoJSON(bytes.NewReader(raw), p.Site.Proj, osm.Options{File: path})
			}
		}
		if err != nil {
			return err
		}
		if err := p.Site.AddSurroundings(imp, name, cfg.SurroundingsRadiusM); err != nil {
			return err
		}
	}
	return nil
}

// geoJSONSurroundings reads a GeoJSON of blocks and trees (sunstring's kinds), strictly, in the
// site's frame.
func geoJSONSurroundings(raw []byte, path string, proj *geo.ENU, elev *float64) (*geo.Surroundings, error) {
	lon, lat, _ := proj.Inverse(geo.Vec3{})
	s, err := geo.Decode(bytes.NewReader(raw), geo.DecodeOptions{File: path, OriginLonDeg: &lon, OriginLatDeg: &lat, ElevationM: elev})
	if err != nil {
		return nil, err
	}
	if len(s.Faces)+len(s.Avoids)+len(s.Panels) > 0 {
		return nil, badInput{fmt.Errorf("%s: a surroundings file holds blocks and trees only; draw roofs, buildings, avoid areas and panels in the map", path)}
	}
	return &geo.Surroundings{Blocks: s.Blocks, Trees: s.Trees, Warnings: s.Warnings}, nil
}
