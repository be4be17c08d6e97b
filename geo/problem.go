package geo

import (
	"errors"
	"fmt"
	"strings"
)

// ErrBadMap is wrapped by every Problems error so that callers can test with errors.Is.
var ErrBadMap = errors.New("geo: bad map")

// Problem is one thing wrong with a map, located as precisely as the input allows.
type Problem struct {
	File    string // as given in DecodeOptions.File
	Index   int    // feature index in the FeatureCollection; -1 for the file as a whole
	ID      string // the feature's id, when it has one
	Field   string // property or member name, e.g. "pitch_deg" or "geometry"
	Msg     string // what is wrong and what is allowed
	Line    int    // 1-based; 0 when unknown
	Col     int    // 1-based, in characters; 0 when unknown
	Pointer string // RFC 6901 JSON Pointer to the offending value
}

// String formats the problem as one line: `file:line:col: feature N (id "X"): field: msg`.
func (p Problem) String() string {
	var b strings.Builder
	if p.File != "" {
		b.WriteString(p.File)
	} else {
		b.WriteString("map")
	}
	switch {
	case p.Line > 0 && p.Col > 0:
		fmt.Fprintf(&b, ":%d:%d", p.Line, p.Col)
	case p.Line > 0:
		fmt.Fprintf(&b, ":%d", p.Line)
	}
	b.WriteString(": ")
	if p.Index >= 0 {
		fmt.Fprintf(&b, "feature %d", p.Index)
		if p.ID != "" {
			fmt.Fprintf(&b, " (id %q)", p.ID)
		}
		b.WriteString(": ")
	}
	if p.Field != "" {
		b.WriteString(p.Field)
		b.WriteString(": ")
	}
	b.WriteString(p.Msg)
	return b.String()
}

// Problems is every problem found in one map. It is the error Decode returns for bad input.
type Problems []Problem

// Error returns one line per problem.
func (ps Problems) Error() string {
	lines := make([]string, len(ps))
	for i, p := range ps {
		lines[i] = p.String()
	}
	return strings.Join(lines, "\n")
}

// BadInput reports whether the error is the user's input (always true): the command line maps
// it to exit status 2.
func (ps Problems) BadInput() bool { return true }

// Unwrap lets errors.Is(err, ErrBadMap) hold.
func (ps Problems) Unwrap() error { return ErrBadMap }
