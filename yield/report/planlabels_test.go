package report

import (
	"fmt"
	"image/color"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/recorder"
)

// hallLike is a flat hall roof like testdata/large-roof: 31 columns by 18 rows of modules
// on one face, 20 rooftop units scattered over it and four vents close together (their modules and a setback around them
// left out, the columns counted along each row as the fill does), six trees around it, two
// of them with overlapping crowns, and a neighbouring building.
func hallLike() *Plan {
	pl := &Plan{Faces: []Shape{{ID: "hall", Ring: [][2]float64{{0, 0}, {36, 0}, {36, 32}, {0, 32}, {0, 0}}}}}
	rng := rand.New(rand.NewPCG(7, 11))
	type box struct{ x0, y0, x1, y1 float64 }
	var units []box
	for i := range 20 {
		w, h := 0.6+1.4*rng.Float64(), 0.6+1.4*rng.Float64()
		x, y := 1+rng.Float64()*(33-w), 1+rng.Float64()*(29-h)
		units = append(units, box{x, y, x + w, y + h})
		pl.Blocks = append(pl.Blocks, Shape{ID: fmt.Sprintf("unit-%d", i+1),
			Ring: [][2]float64{{x, y}, {x + w, y}, {x + w, y + h}, {x, y + h}, {x, y}}})
	}
	// Four vents 0.4 m apart: too close for four names beside them.
	for i, q := range [][2]float64{{20, 20}, {20.9, 20}, {20, 20.9}, {20.9, 20.9}} {
		x, y := q[0], q[1]
		units = append(units, box{x, y, x + 0.5, y + 0.5})
		pl.Blocks = append(pl.Blocks, Shape{ID: fmt.Sprintf("vent-%d", i+1),
			Ring: [][2]float64{{x, y}, {x + 0.5, y}, {x + 0.5, y + 0.5}, {x, y + 0.5}, {x, y}}})
	}
	for r := range 18 {
		c := 0
		for k := range 31 {
			x, y := 0.5+float64(k)*1.15, 0.5+float64(r)*1.75
			free := true
			for _, u := range units { // a 0.5 m setback around each unit
				free = free && (x+1.1 < u.x0-0.5 || x > u.x1+0.5 || y+1.7 < u.y0-0.5 || y > u.y1+0.5)
			}
			if !free {
				continue
			}
			c++
			pl.Modules = append(pl.Modules, PlanModule{ID: fmt.Sprintf("hall.%d.%d", r+1, c), Face: "hall",
				Corners:       [4][2]float64{{x, y}, {x + 1.1, y}, {x + 1.1, y + 1.7}, {x, y + 1.7}},
				UnshadedKWhM2: 1300, SunKWhM2: 1300 * (1 - 0.03*float64(k%5))})
		}
	}
	for i, t := range [][3]float64{{-20, 10, 2.5}, {44, 26, 1.8}, {-16, -12, 2}, {-6, -8, 2}, {43, 28, 2}, {3, -9, 2}} {
		pl.Trees = append(pl.Trees, TreeMark{ID: fmt.Sprintf("tree-%d", i+1), X: t[0], Y: t[1], CrownRadiusM: t[2]})
	}
	pl.Blocks = append(pl.Blocks, Shape{ID: "neighbour", Ring: [][2]float64{{-30, -35}, {-18, -35}, {-18, -24}, {-30, -24}, {-30, -35}}})
	return pl
}

// houseLike is the fixture's house roof: a face with a chimney, a vent kept free, a tree
// and a neighbour's house, its modules large enough to carry their labels.
func houseLike() *Plan {
	pr := fixture("file")
	pr.fillPlan()
	return pr.Plan
}

// houseFarTree is the house with a tree far off: its modules become too small for labels
// and the plan numbers rows and columns, few enough to number every one.
func houseFarTree() *Plan {
	pr := fixture("file")
	pr.Plan.Trees = []TreeMark{{ID: "far", X: 40, Y: -20, CrownRadiusM: 3}}
	pr.fillPlan()
	return pr.Plan
}

const planW, planH = 16 * vg.Centimeter, 13 * vg.Centimeter

var planCases = []struct {
	name  string
	plan  func() *Plan
	chart func(*Plan, vg.Length, vg.Length) (*plot.Plot, planLayout)
	reach float64 // the chart's reach for obstacles (see frameOf)
	// thinned: some column numbers are left out (31 columns of 1.15 m at the hall's
	// scale are about 5 pt apart, a two-digit number at 5 pt about 5.6 pt wide).
	thinned bool
	grid    bool // rows and columns numbered (modules too small for their labels)
}{
	{"hall-like plan", hallLike, planChart, reachM, true, true},
	{"hall-like strings", hallLike, stringsChart, 0, true, true},
	{"house-like plan", houseLike, planChart, reachM, false, false},
	{"house-like strings", houseLike, stringsChart, 0, false, false},
	{"house with a far tree, plan", houseFarTree, planChart, reachM, false, true},
}

// overlapTol is how far, in points, two boxes may reach into each other and still count as
// apart: rounding of sums of point lengths, far below a stroke of the 5 pt type.
const overlapTol = 0.01

// TestPlanLabelsApart: no name or number of the plans is drawn over another, over the
// legend's column, the scale bar or the north arrow, or off the picture.
func TestPlanLabelsApart(t *testing.T) {
	for _, tc := range planCases {
		t.Run(tc.name, func(t *testing.T) {
			p, lay := tc.chart(tc.plan(), planW, planH)
			if len(lay.boxes) != len(lay.texts) || len(lay.texts) == 0 {
				t.Fatalf("%d boxes for %d texts, want as many and some", len(lay.boxes), len(lay.texts))
			}
			dc := p.DataCanvas(draw.NewCanvas(&recorder.Canvas{}, planW, planH))
			for i, a := range lay.boxes {
				if a.Min.X < dc.Min.X-overlapTol || a.Min.Y < dc.Min.Y-overlapTol || a.Max.X > dc.Max.X+overlapTol || a.Max.Y > dc.Max.Y+overlapTol {
					t.Errorf("%q at %v runs off the drawing %v", lay.texts[i].text, a, dc.Rectangle)
				}
				if overlaps(grow(a, -overlapTol), lay.legend) {
					t.Errorf("%q at %v is in the legend's column %v", lay.texts[i].text, a, lay.legend)
				}
				for _, f := range lay.frame {
					if overlaps(grow(a, -overlapTol), f) {
						t.Errorf("%q at %v is over the scale bar or north arrow at %v", lay.texts[i].text, a, f)
					}
				}
				for j := i + 1; j < len(lay.boxes); j++ {
					if overlaps(grow(a, -overlapTol), grow(lay.boxes[j], -overlapTol)) {
						t.Errorf("%q at %v overlaps %q at %v", lay.texts[i].text, a, lay.texts[j].text, lay.boxes[j])
					}
				}
			}
		})
	}
}

// TestPlanObstaclesIdentified: every block, tree and avoid area the plan draws is named
// beside it or numbered on it, its number listed in the key in order; the plan's subtitle
// says so when some are numbered.
func TestPlanObstaclesIdentified(t *testing.T) {
	for _, tc := range planCases {
		t.Run(tc.name, func(t *testing.T) {
			pl := tc.plan()
			p, lay := tc.chart(pl, planW, planH)
			left := map[string]bool{}
			for _, id := range frameOf(pl, tc.reach).left {
				left[id] = true
			}
			var want []string
			for _, s := range pl.Blocks {
				want = append(want, s.ID)
			}
			for _, s := range pl.Avoids {
				want = append(want, s.ID)
			}
			for _, tr := range pl.Trees {
				want = append(want, tr.ID)
			}
			named, numbered := map[string]bool{}, map[string]string{}
			for _, tx := range lay.texts {
				switch tx.kind {
				case nameText:
					named[tx.id] = true
				case numberText:
					numbered[tx.id] = tx.text
				}
			}
			for _, id := range want {
				if left[id] {
					continue
				}
				if named[id] == (numbered[id] != "") {
					t.Errorf("%s: named %v, numbered %q; want one of the two", id, named[id], numbered[id])
				}
			}
			for k, id := range lay.keyed {
				if numbered[id] != fmt.Sprint(k+1) {
					t.Errorf("key entry %d is %s, numbered %q on the plan", k+1, id, numbered[id])
				}
			}
			if len(numbered) != len(lay.keyed) {
				t.Errorf("%d objects numbered, %d in the key", len(numbered), len(lay.keyed))
			}
			if len(lay.keyed) > 0 && !strings.Contains(p.Title.Text, keyNote) {
				t.Errorf("title %q does not say that objects are numbered", p.Title.Text)
			}
		})
	}
}

// TestPlanGridNumbers: row and column numbers (their digits' ink, see digitBox) stand clear
// of each other and of every module; where the columns crowd, the first, the last and every 5th are numbered and the
// subtitle says so; with room, every row and column is numbered.
func TestPlanGridNumbers(t *testing.T) {
	for _, tc := range planCases {
		if !tc.grid {
			continue
		}
		t.Run(tc.name, func(t *testing.T) {
			pl := tc.plan()
			p, lay := tc.chart(pl, planW, planH)
			dc := p.DataCanvas(draw.NewCanvas(&recorder.Canvas{}, planW, planH))
			trX, trY := p.Transforms(&dc)
			var mods []vg.Rectangle
			for _, m := range pl.Modules {
				r := vg.Rectangle{Min: vg.Point{X: vg.Length(math.Inf(1)), Y: vg.Length(math.Inf(1))}, Max: vg.Point{X: vg.Length(math.Inf(-1)), Y: vg.Length(math.Inf(-1))}}
				for _, q := range m.Corners {
					x, y := trX(q[0]), trY(q[1])
					r.Min.X, r.Min.Y, r.Max.X, r.Max.Y = min(r.Min.X, x), min(r.Min.Y, y), max(r.Max.X, x), max(r.Max.Y, y)
				}
				mods = append(mods, r)
			}
			cols := map[string]bool{}
			var colBoxes []vg.Rectangle
			rows := 0
			for i, tx := range lay.texts {
				if tx.kind != rowText && tx.kind != colText {
					continue
				}
				for _, m := range mods {
					if overlaps(grow(lay.boxes[i], -overlapTol), m) {
						t.Errorf("number %q at %v is over a module at %v", tx.text, lay.boxes[i], m)
						break
					}
				}
				if tx.kind == rowText {
					rows++
					continue
				}
				cols[tx.text] = true
				for _, b := range colBoxes {
					if overlaps(grow(lay.boxes[i], -overlapTol), b) {
						t.Errorf("column %q at %v overlaps another at %v", tx.text, lay.boxes[i], b)
					}
				}
				colBoxes = append(colBoxes, lay.boxes[i])
			}
			last := 0
			for _, m := range pl.Modules {
				var r, c int
				fmt.Sscanf(m.Label(), "%d.%d", &r, &c)
				last = max(last, c)
			}
			for _, c := range []int{1, last} {
				if !cols[fmt.Sprint(c)] {
					t.Errorf("column %d not numbered", c)
				}
			}
			if lay.colsThinned != tc.thinned {
				t.Errorf("columns thinned %v, want %v", lay.colsThinned, tc.thinned)
			}
			if says := strings.Contains(p.Title.Text, "every 5th"); says != (lay.colsThinned || lay.rowsThinned) {
				t.Errorf("title %q, saying every 5th %v; want %v", p.Title.Text, says, lay.colsThinned || lay.rowsThinned)
			}
			if !tc.thinned && len(cols) != last {
				t.Errorf("%d columns numbered, want all %d", len(cols), last)
			}
			if rows == 0 {
				t.Error("no row numbered")
			}
		})
	}
}

// TestPlanNamesDrawnLast: every name and number is drawn after the last module, so that no
// module covers it.
func TestPlanNamesDrawnLast(t *testing.T) {
	isModuleFill := func(c color.Color) bool {
		for _, s := range append(append([]color.RGBA{}, sunColours...), white) {
			if c == color.Color(s) {
				return true
			}
		}
		for _, s := range StringColours {
			if c == color.Color(tint(s, 0.6)) {
				return true
			}
		}
		return false
	}
	for _, tc := range planCases {
		t.Run(tc.name, func(t *testing.T) {
			p, lay := tc.chart(tc.plan(), planW, planH)
			rec := &recorder.Canvas{}
			p.Draw(draw.NewCanvas(rec, planW, planH))
			// The last fill in a module's colour left of the legend (whose swatches share
			// the colours), and each name's first drawing.
			var cur color.Color
			lastModule := -1
			want := map[string]bool{}
			for _, tx := range lay.texts {
				if tx.kind == nameText || tx.kind == numberText {
					want[tx.text] = true
				}
			}
			drawnAt := map[string]int{}
			for i, a := range rec.Actions {
				switch a := a.(type) {
				case *recorder.SetColor:
					cur = a.Color
				case *recorder.Fill:
					if len(a.Path) > 0 && a.Path[0].Pos.X < lay.legend.Min.X && isModuleFill(cur) {
						lastModule = i
					}
				case *recorder.FillString:
					if _, seen := drawnAt[a.String]; want[a.String] && !seen {
						drawnAt[a.String] = i
					}
				}
			}
			if lastModule < 0 {
				t.Fatal("no module drawn")
			}
			for s := range want {
				i, ok := drawnAt[s]
				if !ok {
					t.Errorf("%q not drawn", s)
					continue
				}
				if i < lastModule {
					t.Errorf("%q drawn at step %d, before the last module at step %d", s, i, lastModule)
				}
			}
		})
	}
}

// randomRoof is a seeded roof of one rectangular face with up to n blocks of up to 2 m
// scattered over it, apart but some within a few centimetres of each other (a block that
// would overlap one placed before is left out), modules around them and a few trees nearby.
func randomRoof(seed uint64, n int) *Plan {
	rng := rand.New(rand.NewPCG(seed, 3))
	wM, hM := 8+rng.Float64()*40, 6+rng.Float64()*30
	pl := &Plan{Faces: []Shape{{ID: "roof", Ring: [][2]float64{{0, 0}, {wM, 0}, {wM, hM}, {0, hM}, {0, 0}}}}}
	type box struct{ x0, y0, x1, y1 float64 }
	var bs []box
	for i := range n {
		w, h := 0.3+1.7*rng.Float64(), 0.3+1.7*rng.Float64()
		x, y := rng.Float64()*(wM-w), rng.Float64()*(hM-h)
		apart := true
		for _, b := range bs {
			apart = apart && (x+w < b.x0 || x > b.x1 || y+h < b.y0 || y > b.y1)
		}
		if !apart {
			continue
		}
		bs = append(bs, box{x, y, x + w, y + h})
		pl.Blocks = append(pl.Blocks, Shape{ID: fmt.Sprintf("block-%d", i+1),
			Ring: [][2]float64{{x, y}, {x + w, y}, {x + w, y + h}, {x, y + h}, {x, y}}})
	}
	for r := 0; 0.3+float64(r+1)*1.75 < hM; r++ {
		c := 0
		for k := 0; 0.3+float64(k+1)*1.15 < wM; k++ {
			x, y := 0.3+float64(k)*1.15, 0.3+float64(r)*1.75
			free := true
			for _, b := range bs {
				free = free && (x+1.1 < b.x0-0.3 || x > b.x1+0.3 || y+1.7 < b.y0-0.3 || y > b.y1+0.3)
			}
			if free {
				c++
				pl.Modules = append(pl.Modules, PlanModule{ID: fmt.Sprintf("roof.%d.%d", r+1, c), Face: "roof",
					Corners:       [4][2]float64{{x, y}, {x + 1.1, y}, {x + 1.1, y + 1.7}, {x, y + 1.7}},
					UnshadedKWhM2: 1200, SunKWhM2: 1200 * (1 - 0.1*rng.Float64())})
			}
		}
	}
	for i := range rng.IntN(5) {
		pl.Trees = append(pl.Trees, TreeMark{ID: fmt.Sprintf("tree-%d", i+1), X: -8 + rng.Float64()*(wM+16), Y: -8 + rng.Float64()*4,
			CrownRadiusM: 1 + 3*rng.Float64()})
	}
	return pl
}

// TestPlanLabelsRandomRoofs: on seeded roofs from bare to crowded (up to 60 blocks), the
// plan's texts never overlap nor leave the drawing, and every object is named or keyed.
func TestPlanLabelsRandomRoofs(t *testing.T) {
	for seed := range uint64(24) {
		pl := randomRoof(seed, int(seed*seed)%61)
		t.Run(fmt.Sprintf("seed %d, %d blocks", seed, len(pl.Blocks)), func(t *testing.T) {
			p, lay := planChart(pl, planW, planH)
			dc := p.DataCanvas(draw.NewCanvas(&recorder.Canvas{}, planW, planH))
			for i, a := range lay.boxes {
				if a.Min.X < dc.Min.X-overlapTol || a.Min.Y < dc.Min.Y-overlapTol || a.Max.X > dc.Max.X+overlapTol || a.Max.Y > dc.Max.Y+overlapTol {
					t.Errorf("%q at %v runs off the drawing %v", lay.texts[i].text, a, dc.Rectangle)
				}
				for j := i + 1; j < len(lay.boxes); j++ {
					if overlaps(grow(a, -overlapTol), grow(lay.boxes[j], -overlapTol)) {
						t.Errorf("%q at %v overlaps %q at %v", lay.texts[i].text, a, lay.texts[j].text, lay.boxes[j])
					}
				}
			}
			shown := map[string]bool{}
			for _, tx := range lay.texts {
				if tx.kind == nameText || tx.kind == numberText {
					shown[tx.id] = true
				}
			}
			left := map[string]bool{}
			for _, id := range frameOf(pl, reachM).left {
				left[id] = true
			}
			for _, b := range pl.Blocks {
				if !shown[b.ID] && !left[b.ID] {
					t.Errorf("%s neither named nor numbered", b.ID)
				}
			}
			// The key must fit the picture: the legend's rows (8 pt type) above its bottom.
			if lr := p.Legend.Rectangle(dc); lr.Size().Y > dc.Size().Y {
				t.Errorf("legend %v pt high, taller than the drawing's %v pt", lr.Size().Y, dc.Size().Y)
			}
		})
	}
}

// TestPlanNamesClearOfFrameMarks: a name keeps off the scale bar and the north arrow. The
// fitted frame keeps a margin for them under the drawing, so no roof here puts a name there
// by itself: the test puts a mark where the tree's name would go, just under its trunk.
func TestPlanNamesClearOfFrameMarks(t *testing.T) {
	pl := houseLike()
	p := plot.New()
	f, names := planBase(pl, p, planW, planH, reachM)
	planFrame(p, f)
	styleTitle(p, "Roof plan\nsubtitle")
	tr := pl.Trees[0]
	mark := [4]float64{tr.X - 1, tr.Y - 1.5, tr.X + 1, tr.Y - 0.3}
	lay := layoutPlan(p, planW, planH, pl, names, nil, [][4]float64{mark}, false)
	if len(lay.frame) != 1 {
		t.Fatalf("%d marks kept clear of, want 1", len(lay.frame))
	}
	found := false
	for i, tx := range lay.texts {
		if tx.id != tr.ID {
			continue
		}
		found = true
		if overlaps(grow(lay.boxes[i], -overlapTol), lay.frame[0]) {
			t.Errorf("%q at %v is over the mark at %v", tx.text, lay.boxes[i], lay.frame[0])
		}
	}
	if !found {
		t.Errorf("%s not named", tr.ID)
	}
}

// TestProposalSaysHowToFindModules: the proposal tells the homeowner where the most shaded
// modules' ids are, and the technical sheet how the plan shows ids: written on the modules
// when the plan has room for them, else read from the row and column numbers beside the
// faces.
func TestProposalSaysHowToFindModules(t *testing.T) {
	for _, tc := range []struct {
		name     string
		treeX    float64 // the fixture's tree, this far east of the roof, m
		want     string  // in the proposal
		sheet    string  // in the technical sheet
		labelled bool
	}{
		{"modules large enough for their ids", -3, "the module ids are written on the roof plan", "the drawings write row.column on each module", true},
		{"a far tree: rows and columns numbered", 40, "the roof plan numbers the rows beside each face", "the drawings number the rows beside each face", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			pr := fixture("file")
			pr.Plan.Trees = []TreeMark{{ID: "far", X: tc.treeX, Y: -20, CrownRadiusM: 3}}
			pr.fillPlan()
			if got := modulesLabelled(pr.Plan, planPictureW, planPictureH); got != tc.labelled {
				t.Fatalf("modules labelled %v, want %v", got, tc.labelled)
			}
			b, err := pr.PDF()
			if err != nil {
				t.Fatal(err)
			}
			txt := strings.Join(strings.Fields(pdfText(t, b)), " ")
			if !strings.Contains(txt, tc.want) {
				t.Errorf("proposal does not say %q", tc.want)
			}
			if b, err = pr.TechnicalPDF(); err != nil {
				t.Fatal(err)
			}
			txt = strings.Join(strings.Fields(pdfText(t, b)), " ")
			if !strings.Contains(txt, tc.sheet) {
				t.Errorf("technical sheet does not say %q", tc.sheet)
			}
		})
	}
}

// TestCrosses: a segment crosses a rectangle when part of it lies inside; hand-drawn cases
// around the unit square.
func TestCrosses(t *testing.T) {
	sq := vg.Rectangle{Max: vg.Point{X: 1, Y: 1}}
	for _, tc := range []struct {
		name string
		a, b vg.Point
		want bool
	}{
		{"through the middle", vg.Point{X: -1, Y: 0.5}, vg.Point{X: 2, Y: 0.5}, true},
		{"diagonal across", vg.Point{X: -1, Y: -1}, vg.Point{X: 2, Y: 2}, true},
		{"inside", vg.Point{X: 0.2, Y: 0.2}, vg.Point{X: 0.8, Y: 0.3}, true},
		{"above", vg.Point{X: -1, Y: 1.5}, vg.Point{X: 2, Y: 1.5}, false},
		{"stops short", vg.Point{X: -2, Y: 0.5}, vg.Point{X: -0.1, Y: 0.5}, false},
		{"past the corner", vg.Point{X: 0.5, Y: 2}, vg.Point{X: 2, Y: 0.5}, false},
		{"vertical through", vg.Point{X: 0.5, Y: -1}, vg.Point{X: 0.5, Y: 2}, true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if got := crosses(tc.a, tc.b, sq); got != tc.want {
				t.Errorf("crosses %v", got)
			}
		})
	}
}
