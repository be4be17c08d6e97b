package layout

import (
	"cmp"
	"slices"
	"strconv"
	"strings"

	"sunstring/yield/electric"
)

// state is a layout under search: strings in slot order (each sorted), the pool of left-out
// modules (sorted), and its evaluation.
type state struct {
	shape  Shape
	inputs []int // slot → input
	strs   [][]int
	pool   []int
	energy float64
	cable  float64
	score  float64
	start  string
	key    string // canonical form, set by canon
	layout electric.Layout
}

func (st *state) clone() state {
	c := *st
	c.shape = slices.Clone(st.shape)
	c.strs = make([][]int, len(st.strs))
	for i, s := range st.strs {
		c.strs[i] = slices.Clone(s)
	}
	c.pool = slices.Clone(st.pool)
	c.inputs = slices.Clone(st.inputs)
	if c.key != "" {
		c.layout = build(c.shape, c.strs) // share nothing with st
	}
	return c
}

// canon sorts strings and inputs so that equal layouts get equal keys.
func (st *state) canon() {
	for _, s := range st.strs {
		slices.Sort(s)
	}
	slices.Sort(st.pool)
	// Re-derive the shape from the (possibly moved) string lengths, then order inputs.
	type in struct{ strs [][]int }
	ins := make([]in, 0, len(st.shape))
	k := 0
	for _, is := range st.shape {
		var g in
		for range is.Strings {
			g.strs = append(g.strs, st.strs[k])
			k++
		}
		slices.SortFunc(g.strs, func(a, b []int) int { return slices.Compare(a, b) })
		ins = append(ins, g)
	}
	slices.SortStableFunc(ins, func(a, b in) int {
		ma, mb := len(a.strs)*len(a.strs[0]), len(b.strs)*len(b.strs[0])
		return cmp.Or(cmp.Compare(mb, ma), cmp.Compare(len(b.strs[0]), len(a.strs[0])), slices.Compare(a.strs[0], b.strs[0]))
	})
	st.shape = st.shape[:0]
	st.strs = st.strs[:0]
	st.inputs = st.inputs[:0]
	var sb strings.Builder
	for i, g := range ins {
		st.shape = append(st.shape, InputShape{len(g.strs), len(g.strs[0])})
		if i > 0 {
			sb.WriteByte('|')
		}
		for j, s := range g.strs {
			if j > 0 {
				sb.WriteByte('/')
			}
			for k, m := range s {
				if k > 0 {
					sb.WriteByte(',')
				}
				sb.WriteString(strconv.Itoa(m))
			}
			st.strs = append(st.strs, s)
			st.inputs = append(st.inputs, i)
		}
	}
	st.key = sb.String()
	st.layout = build(st.shape, st.strs)
}

func replace(s []int, old, new int) {
	s[slices.Index(s, old)] = new
}

func remove(s []int, m int) []int {
	i := slices.Index(s, m)
	return slices.Delete(s, i, i+1)
}
