package layout

import (
	"math"

	"sunstring/yield/electric"
)

// Point is a module's centre in the site's local frame (east, north, up; metres).
type Point struct{ X, Y, Z float64 }

func dist(a, b Point) float64 { return math.Sqrt(sq(a.X-b.X) + sq(a.Y-b.Y) + sq(a.Z-b.Z)) }

func sq(x float64) float64 { return x * x }

// Chain orders one string's modules for wiring: it starts at the module farthest from the
// string's centre (an end of the group) and goes on to the nearest module not yet wired.
// Nearest-neighbour chains are within a few percent of the shortest path on the grid-like
// groups a roof gives (common practice for cable estimates); ties go to the lower index so
// the order is deterministic.
func Chain(str []int, pos []Point) []int {
	out := append([]int(nil), str...)
	if len(out) < 3 || len(pos) == 0 {
		return out
	}
	var c Point
	for _, m := range out {
		c.X += pos[m].X
		c.Y += pos[m].Y
		c.Z += pos[m].Z
	}
	f := 1 / float64(len(out))
	c = Point{c.X * f, c.Y * f, c.Z * f}
	start := 0
	for i, m := range out {
		if d, ds := dist(pos[m], c), dist(pos[out[start]], c); d > ds+1e-9 || math.Abs(d-ds) <= 1e-9 && m < out[start] {
			start = i
		}
	}
	out[0], out[start] = out[start], out[0]
	for i := 1; i < len(out); i++ {
		best := i
		for j := i + 1; j < len(out); j++ {
			d, db := dist(pos[out[i-1]], pos[out[j]]), dist(pos[out[i-1]], pos[out[best]])
			if d < db-1e-9 || math.Abs(d-db) <= 1e-9 && out[j] < out[best] {
				best = j
			}
		}
		out[i], out[best] = out[best], out[i]
	}
	return out
}

// ExtraCableM estimates the string cable a layout needs beyond the modules' own leads: each
// string is wired along its Chain, and a hop between consecutive modules longer than reachM
// (how far two neighbours' leads reach, about one module length — common practice) needs
// the rest as extra cable. Home runs to the inverter depend on where it hangs, which the site
// file does not say, and are left out. No positions: zero.
func ExtraCableM(l electric.Layout, pos []Point, reachM float64) float64 {
	if len(pos) == 0 {
		return 0
	}
	total := 0.0
	for _, in := range l.Inputs {
		for _, str := range in {
			total += stringCable(Chain(str, pos), pos, reachM)
		}
	}
	return total
}

// stringCable is the extra cable of one string wired in the given order.
func stringCable(chain []int, pos []Point, reachM float64) float64 {
	total := 0.0
	for i := 1; i < len(chain); i++ {
		if d := dist(pos[chain[i-1]], pos[chain[i]]); d > reachM {
			total += d - reachM
		}
	}
	return total
}
