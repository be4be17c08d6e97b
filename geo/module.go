package geo

// CellGrid is the arrangement of a module's cells: Cols across the module's width (short side)
// and Rows along its length. Cell index = row·Cols + col, row 0 at the module's Origin end.
type CellGrid struct{ Cols, Rows int }

// Len returns the number of cells.
func (g CellGrid) Len() int { return g.Cols * g.Rows }

// Module is a placed module: a rectangle in 3-D spanned from Origin by U (across the width)
// and V (along the length), so that U×V points out of the roof.
type Module struct {
	ID       string // "<face>.<row>.<col>"
	Face     string
	Row, Col int  // row 1 at the eave, column 1 at the left seen from below the eave
	Portrait bool // the long side runs up the slope
	// Source is the id of the hand-drawn panel the module comes from; empty for a module
	// placed by Fill.
	Source string
	// Grid is the module's cell arrangement, as Fill was given it.
	Grid CellGrid

	Origin  Vec3
	U, V    Vec3 // unit vectors
	WidthM  float64
	LengthM float64
}

// Corners returns the four corners counter-clockwise seen from outside: Origin, Origin+W·U,
// Origin+W·U+L·V, Origin+L·V.
func (m *Module) Corners() [4]Vec3 {
	w, l := m.U.Scale(m.WidthM), m.V.Scale(m.LengthM)
	return [4]Vec3{m.Origin, m.Origin.Add(w), m.Origin.Add(w).Add(l), m.Origin.Add(l)}
}

// Normal returns the outward unit normal.
func (m *Module) Normal() Vec3 { return m.U.Cross(m.V).Unit() }

// Center returns the module's centre.
func (m *Module) Center() Vec3 {
	return m.Origin.Add(m.U.Scale(m.WidthM / 2)).Add(m.V.Scale(m.LengthM / 2))
}

// AreaM2 returns the module's area.
func (m *Module) AreaM2() float64 { return m.WidthM * m.LengthM }

// CellCenters returns the centre of every cell of grid g, in cell-index order.
func (m *Module) CellCenters(g CellGrid) []Vec3 {
	out := make([]Vec3, 0, g.Len())
	du, dv := m.WidthM/float64(g.Cols), m.LengthM/float64(g.Rows)
	for r := range g.Rows {
		for c := range g.Cols {
			out = append(out, m.Origin.Add(m.U.Scale((float64(c)+0.5)*du)).Add(m.V.Scale((float64(r)+0.5)*dv)))
		}
	}
	return out
}
