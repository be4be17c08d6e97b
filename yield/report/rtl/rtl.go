package rtl

import (
	"slices"
	"strings"
	"unicode"
)

// forms gives the presentation forms of the Arabic letters U+0621–U+064A that have
// them, in the order of the Arabic Presentation Forms-B block (U+FE80–U+FEF4): isolated,
// final, then initial and medial for the letters that join on both sides. It is built from
// the number of forms of each letter in that order, as the block lays them out.
var forms = func() map[rune][]rune {
	counts := []struct {
		r rune
		n int
	}{
		{0x621, 1}, {0x622, 2}, {0x623, 2}, {0x624, 2}, {0x625, 2}, {0x626, 4}, {0x627, 2},
		{0x628, 4}, {0x629, 2}, {0x62a, 4}, {0x62b, 4}, {0x62c, 4}, {0x62d, 4}, {0x62e, 4},
		{0x62f, 2}, {0x630, 2}, {0x631, 2}, {0x632, 2}, {0x633, 4}, {0x634, 4}, {0x635, 4},
		{0x636, 4}, {0x637, 4}, {0x638, 4}, {0x639, 4}, {0x63a, 4}, {0x641, 4}, {0x642, 4},
		{0x643, 4}, {0x644, 4}, {0x645, 4}, {0x646, 4}, {0x647, 4}, {0x648, 2}, {0x649, 2},
		{0x64a, 4},
	}
	m := make(map[rune][]rune, len(counts))
	next := rune(0xfe80)
	for _, c := range counts {
		for k := 0; k < c.n; k++ {
			m[c.r] = append(m[c.r], next)
			next++
		}
	}
	return m
}()

const (
	tatweel = 0x640 // joins on both sides and has no forms
	lam     = 0x644
)

// lamAlef gives the isolated lam–alef ligature for each alef (the final form follows it).
var lamAlef = map[rune]rune{0x622: 0xfef5, 0x623: 0xfef7, 0x625: 0xfef9, 0x627: 0xfefb}

// transparent characters (the vowel marks) do not break a join.
func transparent(r rune) bool { return unicode.Is(unicode.Mn, r) }

// dual reports whether r joins the letter after it as well as the one before.
func dual(r rune) bool { return r == tatweel || len(forms[r]) == 4 }

// joins reports whether r joins the letter before it.
func joins(r rune) bool { return r == tatweel || len(forms[r]) >= 2 }

// rtl reports whether r is written right to left (Hebrew, Arabic and their presentation
// forms).
func rtl(r rune) bool {
	return (r >= 0x590 && r <= 0x8ff) || (r >= 0xfb1d && r <= 0xfdff) || (r >= 0xfe70 && r <= 0xfeff)
}

// digit reports whether r is a digit, which keeps its left-to-right order inside
// right-to-left text.
func digit(r rune) bool { return unicode.IsDigit(r) }

// Visual returns the line s in the order a left-to-right writer should place its
// characters, with Arabic letters in their joined forms. A line without right-to-left
// characters is returned as it is.
func Visual(s string) string {
	if !strings.ContainsFunc(s, rtl) {
		return s
	}
	return string(reorder(shape([]rune(s))))
}

// shape replaces Arabic letters by their presentation forms for their position in a word.
func shape(rs []rune) []rune {
	// neighbour returns the nearest letter before (step -1) or after (step 1) i, past
	// the vowel marks, or 0.
	neighbour := func(i, step int) rune {
		for j := i + step; j >= 0 && j < len(rs); j += step {
			if !transparent(rs[j]) {
				return rs[j]
			}
		}
		return 0
	}
	out := make([]rune, 0, len(rs))
	for i := 0; i < len(rs); i++ {
		r := rs[i]
		f, ok := forms[r]
		if !ok {
			out = append(out, r)
			continue
		}
		prev := dual(neighbour(i, -1))
		if r == lam {
			// lam and alef make one ligature
			if j := i + 1; j < len(rs) {
				if lig, ok := lamAlef[rs[j]]; ok {
					if prev {
						lig++
					}
					out = append(out, lig)
					i = j
					continue
				}
			}
		}
		next := len(f) == 4 && joins(neighbour(i, 1))
		k := 0 // isolated
		switch {
		case len(f) == 1:
		case prev && next:
			k = 3
		case prev:
			k = 1
		case next:
			k = 2
		}
		out = append(out, f[k])
	}
	return out
}

// reorder reverses each right-to-left stretch of rs: from a right-to-left character to
// the last one or the last digit before a left-to-right letter, with the spaces and marks
// between (digits after right-to-left text belong to it, UAX #9 rules W2, N1 and I1).
// A mark stays after the letter it sits on, and a number keeps its own order.
func reorder(rs []rune) []rune {
	out := slices.Clone(rs)
	for i := 0; i < len(rs); {
		if !rtl(rs[i]) {
			i++
			continue
		}
		end := i + 1 // one past the stretch's last right-to-left character
		for j := i + 1; j < len(rs); j++ {
			if rtl(rs[j]) || digit(rs[j]) {
				end = j + 1
			} else if unicode.IsLetter(rs[j]) {
				break
			}
		}
		// clusters: a character with its marks, or a number
		var cl [][]rune
		for j := i; j < end; {
			k := j + 1
			if digit(rs[j]) {
				for k < end && (digit(rs[k]) || (rs[k] == '.' || rs[k] == ',') && k+1 < end && digit(rs[k+1])) {
					k++
				}
			}
			for k < end && transparent(rs[k]) {
				k++
			}
			cl = append(cl, rs[j:k])
			j = k
		}
		p := i
		for c := len(cl) - 1; c >= 0; c-- {
			p += copy(out[p:], cl[c])
		}
		i = end
	}
	return out
}
