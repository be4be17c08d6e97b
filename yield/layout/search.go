package layout

import (
	"context"
	"errors"
	"fmt"

	"sunstring/yield/electric"
)

// Evaluator returns a layout's annual energy in Wh (higher is better). The search calls it
// from several goroutines at once, so it must be safe for concurrent use; it must give the
// same value for the same layout whatever the order of strings within an input, of inputs,
// and of modules within a string (true of any electrical model of identical inputs).
type Evaluator func(l electric.Layout) (float64, error)

// Problem is what the search arranges.
type Problem struct {
	// Features describe, per module, when it is shaded: a vector of the same length for
	// every module (for instance the shaded share of beam irradiance by month and hour),
	// larger meaning more shade. Modules with close vectors are shaded alike and belong in
	// one string. Nil or empty vectors: all modules alike.
	Features [][]float64
	// Positions are the modules' centres (optional: nil means no cable estimate and no
	// contiguity preference).
	Positions []Point
	// ReachM is how far two neighbouring modules' leads reach without extra cable (m);
	// zero means 1.8 m, about a module's length (common practice).
	ReachM float64
	Bounds Bounds
	Inputs int // inverter inputs (identical); with several inverters, all of theirs together
	// Faces label each module's roof face (optional, any integers): modules on different
	// faces are never taken as alike, since their orientations differ.
	Faces []int
	// Order is the caller's roof order of the modules, used as one of the starts
	// (optional: nil means index order).
	Order []int
	// Starts are layouts of the caller's own to start from as well (optional), for instance
	// the roof order and the user's own layouts. A start that breaks the bounds is skipped.
	Starts []electric.Layout
}

// Options tune the search. The zero value searches with every module used, cable reported
// but not weighed, five candidates returned and a budget of 400 evaluations.
type Options struct {
	// LeaveOut allows layouts that leave some modules unconnected, when that yields more
	// (a module so shaded it costs its string more than it gives).
	LeaveOut bool
	// CableWeightWh is the annual energy (Wh) one metre of extra cable is worth in the
	// ranking: Score = EnergyWh − CableWeightWh·CableM.
	CableWeightWh float64
	Keep          int // distinct candidates returned; 0 means 5
	// MaxEvals is the budget of evaluations of new layouts at each level of freedom (see
	// Search); cache hits are free. Zero means 400.
	MaxEvals int
	// Progress, when set, is told how many layouts are evaluated (done) out of the most the
	// search may evaluate in all (total), screens counted at 1/ScreenCost: done never falls;
	// total shrinks when a level ends before its budget, and the last call has done equal to
	// total.
	Progress func(done, total int)
	// Screen, when set, estimates a layout's energy (Wh, as the Evaluator) at a fraction of
	// its cost, for instance over every fourth step of the year; ScreenCost is how many screens
	// cost one evaluation in the budget (zero means 4). The search then screens its starts and
	// each batch of neighbours and evaluates in full only the most promising: the best starts
	// (a sixth, at least eight, and the best of each shape), and of a batch the few whose
	// screen beats the current layout's. The caller's Starts and every reported value go
	// through the Evaluator. Exhaustive levels do not screen.
	Screen     Evaluator
	ScreenCost int
}

// Candidate is one evaluated layout.
type Candidate struct {
	Layout   electric.Layout // strings in wiring order (Chain) when positions are given
	Shape    Shape
	Left     []int   // modules left unconnected
	EnergyWh float64 // the evaluator's value
	CableM   float64 // ExtraCableM
	Score    float64 // EnergyWh − CableWeightWh·CableM, the ranking
	Start    string  // the start the local search began from
}

// Result is what a search found and how hard it looked.
type Result struct {
	Candidates []Candidate // distinct layouts, best first, at most Options.Keep
	// Evaluated is the number of distinct layouts evaluated; Screened the number screened
	// (Options.Screen), some of which were then evaluated.
	Evaluated, Screened int
	// Exhaustive reports whether every layout of the bounds was evaluated (small roofs):
	// the best candidate is then the optimum of the evaluator.
	Exhaustive bool
	// BudgetSpent reports whether a level's local search stopped because its budget ran
	// out rather than at a layout none of whose neighbours is better.
	BudgetSpent bool
}

// Names of the starts, as Candidate.Start reports them.
const (
	StartClustered  = "clustered by shade"
	StartRoofOrder  = "roof order"
	StartShadeRank  = "ranked by shade"
	StartGiven      = "given by the caller"
	StartNarrower   = "the search with less freedom"
	StartEnumerated = "every layout enumerated"
)

// ErrNoShape means no layout of the bounds takes the modules.
var ErrNoShape = errors.New("layout: no string layout fits the bounds")

// Search looks for the layouts that give the most energy.
//
// It never goes backwards. With more freedom (LeaveOut, or more than one input) it first runs
// the search with less freedom (without LeaveOut; then with one input fewer, as long as some
// shape fits) exactly as that search would run on its own, and starts from its results: the
// best it reports is never worse than the narrower search's. The caller's Starts are always
// evaluated, so the best is never worse than any of them either.
//
// At each level, when the number of distinct layouts of the bounds is within the budget it
// evaluates them all (Result.Exhaustive). Otherwise, for every valid shape (Shapes) it builds
// starts in which modules with similar shade share a string — balanced clustering of the
// Features, the roof order, and a ranking by total shade — and evaluates them on all cores;
// then it improves the best starts of distinct shapes by local search on the full evaluator
// over the whole neighbourhood (see moveKind): every swap of two modules whose shade differs
// between two strings, every move of one module between single-string inputs and, with
// LeaveOut, in and out of the unconnected pool. Neighbours are evaluated in batches, most
// promising first (by how much closer they bring each module to its string's shade pattern);
// the best improvement of the first batch holding one is taken, and the local search stops
// when no neighbour is better or the budget is spent. Every evaluated layout is a candidate;
// the distinct best Keep are returned, best first. The result depends only on the inputs
// (ties go to the lower module index), however many goroutines evaluate.
func Search(ctx context.Context, p Problem, eval Evaluator, opt Options) (Result, error) {
	n := len(p.Features)
	if n == 0 {
		n = len(p.Order)
	}
	if n == 0 {
		return Result{}, nil
	}
	if err := p.check(n); err != nil {
		return Result{}, err
	}
	if opt.Keep <= 0 {
		opt.Keep = 5
	}
	if opt.MaxEvals <= 0 {
		opt.MaxEvals = 400
	}
	if opt.ScreenCost <= 0 {
		opt.ScreenCost = 4
	}
	if p.ReachM == 0 {
		p.ReachM = 1.8
	}
	if len(shapesFor(p, n, opt.LeaveOut)) == 0 {
		return Result{}, fmt.Errorf("%w: %d modules, %d inputs, %d..%d in series, up to %d in parallel",
			ErrNoShape, n, p.Inputs, p.Bounds.MinSeries, p.Bounds.MaxSeries, p.Bounds.MaxParallel)
	}
	s := newSearcher(ctx, p, n, eval, opt)
	levels := s.levels(p.Inputs, opt.LeaveOut)
	var best []state
	for i, lv := range levels {
		// A level stops at its budget, checked before each batch of neighbours: it may end a
		// batch less one beyond it.
		perLevel := opt.MaxEvals + searchBatch - 1
		s.stop, s.after = s.spent()+perLevel, (len(levels)-1-i)*perLevel
		var err error
		if best, err = s.runLevel(lv, best); err != nil {
			return Result{}, err
		}
		// A level that ends before its budget (a local optimum, or fewer layouts than the
		// budget) gives the rest back: the total shrinks to what is still possible.
		s.stop = s.spent()
		s.report()
	}
	return Result{Candidates: s.ranked(), Evaluated: len(s.cache), Screened: len(s.screened), Exhaustive: s.exhaustive, BudgetSpent: s.budgetSpent}, nil
}

// report tells Options.Progress how many layouts are evaluated out of the most the search may
// evaluate: the evaluations so far, the current level's unspent budget and the budgets of the
// levels still to come.
func (s *searcher) report() {
	if s.opt.Progress != nil {
		s.opt.Progress(s.spent(), max(s.stop, s.spent())+s.after)
	}
}

// level is one degree of freedom of the search: how many inputs it may use and whether it
// may leave modules out.
type level struct {
	inputs   int
	leaveOut bool
}

// levels lists the searches to run, narrowest first, ending with the one asked for: every
// level but the last is exactly the search the next one would run first on its own. The
// narrowest uses the fewest inputs that take the modules without leaving any out, each next
// one twice as many, so that several inverters' many inputs cost a few levels, not one level
// an input; none uses more inputs than the modules can make strings (no layout could use
// them).
func (s *searcher) levels(inputs int, leaveOut bool) []level {
	var out []level
	most := s.n / max(s.p.Bounds.MinSeries, 1)
	for k := 1; k < inputs && k <= most; k++ {
		if AnyShape(s.n, s.n, k, s.p.Bounds) {
			for ; k < inputs && k <= most; k *= 2 {
				out = append(out, level{k, false})
			}
			break
		}
	}
	if len(shapesForInputs(s.p, s.n, false, inputs)) > 0 {
		out = append(out, level{inputs, false})
	}
	if leaveOut {
		out = append(out, level{inputs, true})
	}
	return out
}

// shapesFor lists the shapes the search considers.
func shapesFor(p Problem, n int, leaveOut bool) []Shape {
	return shapesForInputs(p, n, leaveOut, p.Inputs)
}

func shapesForInputs(p Problem, n int, leaveOut bool, inputs int) []Shape {
	return Shapes(n, minModules(p, n, leaveOut, inputs), inputs, p.Bounds)
}

// minModules is the fewest modules a layout of the level connects: all of them, unless
// modules may be left out or the inputs cannot take them all.
func minModules(p Problem, n int, leaveOut bool, inputs int) int {
	capacity := inputs * p.Bounds.MaxParallel * p.Bounds.MaxSeries
	if leaveOut || capacity < n {
		// Leaving out more than a quarter of the roof never pays for itself in practice;
		// the cap keeps the number of shapes small.
		return min(n, capacity) - n/4
	}
	return n
}

func (p *Problem) check(n int) error {
	if p.Inputs < 1 {
		return fmt.Errorf("layout: search needs at least one input, got %d", p.Inputs)
	}
	if len(p.Features) != 0 && len(p.Features) != n {
		return fmt.Errorf("layout: %d feature vectors for %d modules", len(p.Features), n)
	}
	for i, f := range p.Features {
		if len(f) != len(p.Features[0]) {
			return fmt.Errorf("layout: module %d: feature vector of %d values, module 0 has %d", i, len(f), len(p.Features[0]))
		}
	}
	if len(p.Faces) != 0 && len(p.Faces) != n {
		return fmt.Errorf("layout: %d face labels for %d modules", len(p.Faces), n)
	}
	if len(p.Positions) != 0 && len(p.Positions) != n {
		return fmt.Errorf("layout: %d positions for %d modules", len(p.Positions), n)
	}
	if len(p.Order) != 0 {
		if len(p.Order) != n {
			return fmt.Errorf("layout: roof order of %d modules for %d", len(p.Order), n)
		}
		seen := make([]bool, n)
		for _, m := range p.Order {
			if m < 0 || m >= n || seen[m] {
				return fmt.Errorf("layout: roof order is not a permutation of 0..%d (module %d)", n-1, m)
			}
			seen[m] = true
		}
	}
	return nil
}
