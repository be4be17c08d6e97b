package geo

import (
	"fmt"
	"math"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// DefaultSurroundingsRadiusM is how far from the roof faces imported obstacles are kept when the
// caller does not say: at a sun 10° high a 15 m building casts its shadow about 85 m (common
// practice for a site's neighbourhood).
const DefaultSurroundingsRadiusM = 100.0

// Surroundings are obstacles read from a file beside the map (an OpenStreetMap extract or a
// GeoJSON of blocks and trees), in the site's local metres, with the notes made on reading.
type Surroundings struct {
	Blocks []Block
	Trees  []Tree
	// Warnings are about the file as a whole; Assumed lists, by obstacle id, what the reader
	// had to assume (heights the file does not give). Only the notes of the obstacles kept
	// reach the site's warnings.
	Warnings []string
	Assumed  map[string][]string
}

// SurroundingsError is an imported obstacle that cannot join the site.
type SurroundingsError struct{ Msg string }

func (e *SurroundingsError) Error() string { return e.Msg }

// BadInput reports whether the error is the user's input (always).
func (e *SurroundingsError) BadInput() bool { return true }

// AddSurroundings adds the imported obstacles that lie within radiusM (0: the default) of a roof
// face to the site, with source as their Source. A block that holds the middle of a roof face is
// the site's own building, mapped too: it is left out with a note, so that it does not stand
// over its own roof. An obstacle already imported under the same id (two overlapping extracts)
// is kept once. An id that the map uses for something else is an error.
func (s *Site) AddSurroundings(imp *Surroundings, source string, radiusM float64) error {
	if imp == nil {
		return nil
	}
	if radiusM <= 0 {
		radiusM = DefaultSurroundingsRadiusM
	}
	s.Warnings = append(s.Warnings, imp.Warnings...)
	used := map[string]string{} // id → source ("" drawn)
	for _, f := range s.Faces {
		used[f.ID] = ""
	}
	for _, o := range s.Obstacles() {
		if b := o.Prism; b != nil {
			used[o.ID] = b.Source
		} else {
			used[o.ID] = o.Crown.Source
		}
	}
	for _, a := range s.Avoids {
		used[a.ID] = ""
	}
	for _, p := range s.Panels {
		used[p.ID] = ""
	}
	claim := func(id string) (bool, error) {
		src, ok := used[id]
		switch {
		case !ok:
			used[id] = source
			return true, nil
		case src == "":
			return false, &SurroundingsError{fmt.Sprintf("%s: id %q is used in the map too; rename one", source, id)}
		}
		s.Warnings = append(s.Warnings, fmt.Sprintf("%s: %s is in %s too; read once", source, id, src))
		return false, nil
	}
	for _, b := range imp.Blocks {
		if face, own := s.holdsFace(b.Footprint); own {
			s.Warnings = append(s.Warnings, fmt.Sprintf("%s: %s is the site's own building (it holds roof face %q); left out", source, b.ID, face))
			continue
		}
		if s.roofDistance(b.Footprint) > radiusM {
			continue
		}
		if ok, err := claim(b.ID); err != nil {
			return err
		} else if !ok {
			continue
		}
		b.Source, b.Index = source, len(s.Blocks)
		s.Blocks = append(s.Blocks, b)
		s.assumed(imp, source, b.ID)
	}
	for _, t := range imp.Trees {
		ring := orb.Ring{t.Trunk, t.Trunk}
		if s.roofDistance(ring)-t.CrownRadiusM > radiusM {
			continue
		}
		if ok, err := claim(t.ID); err != nil {
			return err
		} else if !ok {
			continue
		}
		t.Source, t.Index = source, len(s.Trees)
		s.Trees = append(s.Trees, t)
		s.assumed(imp, source, t.ID)
	}
	return nil
}

func (s *Site) assumed(imp *Surroundings, source, id string) {
	for _, a := range imp.Assumed[id] {
		s.Warnings = append(s.Warnings, fmt.Sprintf("%s: %s: %s", source, id, a))
	}
}

// holdsFace reports whether the footprint holds a point inside a roof face, and which face.
func (s *Site) holdsFace(fp orb.Ring) (string, bool) {
	for _, f := range s.Faces {
		if planar.RingContains(fp, interiorPoint(f.Plan)) {
			return f.ID, true
		}
	}
	return "", false
}

// roofDistance returns the plan distance from the ring to the nearest roof face (0 when they
// overlap); +Inf without faces.
func (s *Site) roofDistance(r orb.Ring) float64 {
	best := math.Inf(1)
	for _, f := range s.Faces {
		if ringsOverlap(r, f.Plan, 0) || len(r) > 2 && planar.RingContains(r, f.Plan[0]) || planar.RingContains(f.Plan, r[0]) {
			return 0
		}
		for i := 0; i+1 < len(r); i++ {
			for j := 0; j+1 < len(f.Plan); j++ {
				best = math.Min(best, segSegDist(r[i], r[i+1], f.Plan[j], f.Plan[j+1]))
			}
		}
	}
	return best
}
