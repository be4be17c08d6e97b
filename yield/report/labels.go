package report

import (
	"gonum.org/v1/plot/vg"
)

// labelBoard places labels in turn, each at the first of its candidate boxes (points on the
// canvas) that lies inside bounds and keeps clear of what is already there: hard boxes (labels
// placed before, what must stay in sight) no label may overlap; soft ones (modules, tree
// crowns) a label leaves uncovered when one of its candidates can. One helper for every chart
// whose labels crowd: the sun path's obstruction names and the roof plans' names and numbers.
type labelBoard struct {
	bounds     vg.Rectangle
	hard, soft []occupied
	// gap is the least room, in points, kept between a label and what it keeps clear of.
	gap vg.Length
}

// occupied is a box labels keep clear of; owner (0: none) marks the object it belongs to,
// which does not keep its own labels out.
type occupied struct {
	r     vg.Rectangle
	owner int
}

// place returns the index of the candidate taken, -1 when none fits; the box taken becomes
// hard for the labels placed after it. strict makes the soft boxes hard for this label.
func (b *labelBoard) place(cands []vg.Rectangle, owner int, strict bool) int {
	rounds := []bool{true, false} // with the soft boxes, then without
	if strict {
		rounds = rounds[:1]
	}
	for _, withSoft := range rounds {
		for i, r := range cands {
			if !b.free(r, owner, withSoft) {
				continue
			}
			b.hard = append(b.hard, occupied{r: r})
			return i
		}
	}
	return -1
}

// free reports whether r lies inside the bounds and clear of the hard boxes (and the soft
// ones, withSoft) of every owner but owner.
func (b *labelBoard) free(r vg.Rectangle, owner int, withSoft bool) bool {
	if r.Min.X < b.bounds.Min.X || r.Min.Y < b.bounds.Min.Y || r.Max.X > b.bounds.Max.X || r.Max.Y > b.bounds.Max.Y {
		return false
	}
	g := grow(r, b.gap)
	clear := func(ks []occupied) bool {
		for _, k := range ks {
			if (owner == 0 || k.owner != owner) && overlaps(k.r, g) {
				return false
			}
		}
		return true
	}
	return clear(b.hard) && (!withSoft || clear(b.soft))
}

// grow widens r by d on every side.
func grow(r vg.Rectangle, d vg.Length) vg.Rectangle {
	return vg.Rectangle{Min: vg.Point{X: r.Min.X - d, Y: r.Min.Y - d}, Max: vg.Point{X: r.Max.X + d, Y: r.Max.Y + d}}
}

// overlaps reports whether two rectangles share more than an edge.
func overlaps(a, b vg.Rectangle) bool {
	return a.Min.X < b.Max.X && b.Min.X < a.Max.X && a.Min.Y < b.Max.Y && b.Min.Y < a.Max.Y
}
