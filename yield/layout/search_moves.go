package layout

import (
	"cmp"
	"slices"
)

// moveKind is one kind of step of the local search.
type moveKind int

// The local search's steps. Swaps keep the shape; the others change string lengths, so they
// apply only to inputs with a single string (parallel strings must stay equal).
const (
	swapModules  moveKind = iota // two modules of different strings trade places
	moveModule                   // a module goes to another single-string input
	swapWithPool                 // a connected module trades places with a left-out one
	dropModule                   // a module of a single-string input is left out
	addModule                    // a left-out module joins a single-string input
)

func (k moveKind) String() string {
	switch k {
	case swapModules:
		return "swap"
	case moveModule:
		return "move"
	case swapWithPool:
		return "swap with a left-out module"
	case dropModule:
		return "leave out"
	case addModule:
		return "connect"
	}
	return "unknown move"
}

// move is one step from a state, with its promise.
type move struct {
	gain float64 // how much closer the modules come to their strings' shade patterns
	kind moveKind
	a, b int // modules (or -1)
	i, j int // strings (j = -1: the pool)
}

// neighbours lists every step from cur, most promising first: every swap of two modules of
// different strings that are not alike (same shade and face, see newSearcher), every move of
// one module between single-string inputs, and, at a level that may leave modules out (or
// from a state that already does), the swaps with, drops to and additions from the pool. A
// swap's promise is how much closer it brings both modules to the centres of their new
// strings (squared feature distances, each module's own contribution left out of its old
// string's centre); a move's is the same for one module.
func (s *searcher) neighbours(cur *state, lv level) []move {
	ns := len(cur.strs)
	// Squared distances through dot products, ‖x − c‖² = ‖x‖² − 2x·c + ‖c‖², so that each
	// round costs one pass over the features (modules × strings dot products) and every
	// proposal after it is O(1).
	cent := make([][]float64, ns)
	cc := make([]float64, ns) // ‖Σ members‖²
	for i, str := range cur.strs {
		c := make([]float64, len(s.feat[0]))
		for _, m := range str {
			for j, x := range s.feat[m] {
				c[j] += x
			}
		}
		cent[i] = c
		cc[i] = dot(c, c)
	}
	xc := make([][]float64, s.n) // module · string sum
	for m := range s.n {
		xc[m] = make([]float64, ns)
		for i := range ns {
			xc[m][i] = dot(s.feat[m], cent[i])
		}
	}
	// distance from module m to string i's centre, m itself taken out if it is a member.
	dTo := func(m, i int, member bool) float64 {
		L := float64(len(cur.strs[i]))
		xx := s.norm[m]
		if !member {
			return xx - 2*xc[m][i]/L + cc[i]/(L*L)
		}
		if L <= 1 {
			return 0
		}
		rest := cc[i] - 2*xc[m][i] + xx // ‖Σ others‖²
		return xx - 2*(xc[m][i]-xx)/(L-1) + rest/((L-1)*(L-1))
	}
	// Room for every move at once: appending a large roof's hundred thousand swaps one by
	// one would copy them again and again.
	conn, sq := 0, 0
	for _, str := range cur.strs {
		conn += len(str)
		sq += len(str) * len(str)
	}
	out := make([]move, 0, (conn*conn-sq)/2+conn*(ns+len(cur.pool)+1)+ns*len(cur.pool))
	alone := func(i int) bool { return cur.shape[cur.inputs[i]].Strings == 1 }
	for i := range ns {
		for j := i + 1; j < ns; j++ {
			for _, a := range cur.strs[i] {
				for _, b := range cur.strs[j] {
					if s.alike[a] == s.alike[b] {
						continue // nothing to gain from swapping look-alikes
					}
					g := dTo(a, i, true) + dTo(b, j, true) - dTo(a, j, false) - dTo(b, i, false)
					out = append(out, move{g, swapModules, a, b, i, j})
				}
			}
		}
	}
	b := s.p.Bounds
	for i := range ns {
		if !alone(i) || len(cur.strs[i])-1 < b.MinSeries {
			continue
		}
		for j := range ns {
			if j == i || !alone(j) || len(cur.strs[j])+1 > b.MaxSeries {
				continue
			}
			for _, a := range cur.strs[i] {
				out = append(out, move{dTo(a, i, true) - dTo(a, j, false), moveModule, a, -1, i, j})
			}
		}
	}
	connected := s.n - len(cur.pool)
	minMods := minModules(s.p, s.n, lv.leaveOut, lv.inputs)
	for i := range ns {
		for _, a := range cur.strs[i] {
			for _, c := range cur.pool {
				if s.alike[a] != s.alike[c] {
					out = append(out, move{dTo(a, i, true) - dTo(c, i, false), swapWithPool, a, c, i, -1})
				}
			}
			if alone(i) && len(cur.strs[i])-1 >= b.MinSeries && connected-1 >= minMods {
				out = append(out, move{dTo(a, i, true), dropModule, a, -1, i, -1})
			}
		}
		if alone(i) && len(cur.strs[i])+1 <= b.MaxSeries {
			for _, c := range cur.pool {
				out = append(out, move{-dTo(c, i, false), addModule, -1, c, i, -1})
			}
		}
	}
	return out
}

// compareMoves orders moves best first. Every field is compared, so no two moves tie and
// any sort gives the one order.
func compareMoves(x, y move) int {
	return cmp.Or(cmp.Compare(y.gain, x.gain), cmp.Compare(x.kind, y.kind), cmp.Compare(x.a, y.a), cmp.Compare(x.b, y.b), cmp.Compare(x.j, y.j), cmp.Compare(x.i, y.i))
}

// orderMoves puts the k best of ms[from:] at ms[from:from+k], in order, leaving the rest
// after them in no order: a round of the local search usually takes only its first batches,
// and a large roof has a hundred thousand moves. Successive calls for the next k give the
// order a full sort would.
func orderMoves(ms []move, from, k int) {
	rest := ms[from:]
	if k < len(rest) {
		selectMoves(rest, k)
		rest = rest[:k]
	}
	slices.SortFunc(rest, compareMoves)
}

// selectMoves rearranges ms so that its k best come first, in no order (Hoare's selection,
// with the median of three as pivot).
func selectMoves(ms []move, k int) {
	lo, hi := 0, len(ms)-1
	for lo < hi {
		mid := lo + (hi-lo)/2
		// Median of three to ms[mid].
		if compareMoves(ms[mid], ms[lo]) < 0 {
			ms[mid], ms[lo] = ms[lo], ms[mid]
		}
		if compareMoves(ms[hi], ms[lo]) < 0 {
			ms[hi], ms[lo] = ms[lo], ms[hi]
		}
		if compareMoves(ms[hi], ms[mid]) < 0 {
			ms[hi], ms[mid] = ms[mid], ms[hi]
		}
		pivot := ms[mid]
		i, j := lo, hi
		for i <= j {
			for compareMoves(ms[i], pivot) < 0 {
				i++
			}
			for compareMoves(pivot, ms[j]) < 0 {
				j--
			}
			if i <= j {
				ms[i], ms[j] = ms[j], ms[i]
				i++
				j--
			}
		}
		// ms[lo..j] ≤ pivot ≤ ms[i..hi]; between them, equal to the pivot.
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return
		}
	}
}

// apply returns the state after one step (canonical, not evaluated).
func (s *searcher) apply(cur *state, mv move) state {
	nx := cur.clone()
	nx.start = cur.start
	switch mv.kind {
	case swapModules:
		replace(nx.strs[mv.i], mv.a, mv.b)
		replace(nx.strs[mv.j], mv.b, mv.a)
	case moveModule:
		nx.strs[mv.i] = remove(nx.strs[mv.i], mv.a)
		nx.strs[mv.j] = append(nx.strs[mv.j], mv.a)
		nx.shape[nx.inputs[mv.i]].Length--
		nx.shape[nx.inputs[mv.j]].Length++
	case swapWithPool:
		replace(nx.strs[mv.i], mv.a, mv.b)
		replace(nx.pool, mv.b, mv.a)
	case dropModule:
		nx.strs[mv.i] = remove(nx.strs[mv.i], mv.a)
		nx.pool = append(nx.pool, mv.a)
		nx.shape[nx.inputs[mv.i]].Length--
	case addModule:
		nx.strs[mv.i] = append(nx.strs[mv.i], mv.b)
		nx.pool = remove(nx.pool, mv.b)
		nx.shape[nx.inputs[mv.i]].Length++
	}
	nx.canon()
	return nx
}
