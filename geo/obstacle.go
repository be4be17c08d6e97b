package geo

// Obstacle is one body that can shade the modules, whatever map kind drew it, in one of the
// two shapes the shading package ray-tests and the plan draws: a prism (walls from BaseM to
// HeightM under a flat or gabled top) or a tree crown. Exactly one of Prism and Crown is set;
// they point into the Site and must not be changed.
type Obstacle struct {
	Kind  string // the map kind that made it, for messages: "block", "tree"
	ID    string
	Index int // feature index in the map
	Prism *Block
	Crown *Tree
}

// Obstacles returns every shade-casting body of the site, kind by kind in the order of the
// package's kind table (buildings' walls, blocks, then trees), each kind in map order. Roof faces are not
// listed: they shade as faces.
func (s *Site) Obstacles() []Obstacle {
	if s == nil {
		return nil
	}
	var out []Obstacle
	for _, k := range kinds {
		if k.obstacles != nil {
			out = append(out, k.obstacles(s)...)
		}
	}
	return out
}
