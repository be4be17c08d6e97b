package geo

import (
	"fmt"
	"math"
	"strconv"
)

// number returns a JSON number as a finite float64.
func number(n *jnode) (float64, bool) {
	if n == nil || n.kind != 'n' {
		return 0, false
	}
	x, err := strconv.ParseFloat(n.str, 64)
	if err != nil || math.IsInf(x, 0) || math.IsNaN(x) {
		return 0, false
	}
	return x, true
}

// prop reads an optional numeric property and checks its range [lo, hi] (hiOpen: [lo, hi)).
// It returns present=false when the property is absent or null.
func (d *decoder) prop(f *rawFeature, name string, lo, hi float64, hiOpen bool, rule string) (v float64, present, ok bool) {
	n := f.props.member(name)
	if n == nil || n.kind == 'z' {
		return 0, false, true
	}
	x, isNum := number(n)
	if !isNum {
		got := n.typeName()
		if n.kind == 's' {
			got = fmt.Sprintf("the string %q", n.str)
		}
		d.fproblem(f, n, name, fmt.Sprintf("must be a number, got %s; %s", got, rule))
		return 0, true, false
	}
	if x < lo || x > hi || hiOpen && x == hi {
		d.fproblem(f, n, name, fmt.Sprintf("%g is out of range; %s", x, rule))
		return x, true, false
	}
	return x, true, true
}

// need reads a required numeric property.
func (d *decoder) need(f *rawFeature, name string, lo, hi float64, hiOpen bool, rule string) (float64, bool) {
	v, present, ok := d.prop(f, name, lo, hi, hiOpen, rule)
	if !present {
		d.fproblem(f, f.props, name, "missing; "+rule)
		return 0, false
	}
	return v, ok
}

// jsonText returns a short excerpt of the input at n, for messages.
func jsonText(data []byte, n *jnode) string {
	switch n.kind {
	case 'n':
		return n.str
	case 's':
		return strconv.Quote(n.str)
	}
	return n.typeName()
}

// source reads the optional "source" property of an obstacle: the file it was imported from,
// which an export writes so that the surveyor can tell drawn from imported. Anything but a
// string is ignored.
func (d *decoder) source(f *rawFeature) string {
	if n := f.props.member("source"); n != nil && n.kind == 's' {
		return n.str
	}
	return ""
}

// flag reads an optional true/false property; absent or null is false.
func (d *decoder) flag(f *rawFeature, name string) bool {
	n := f.props.member(name)
	if n == nil || n.kind == 'z' {
		return false
	}
	if n.kind != 'b' {
		d.fproblem(f, n, name, fmt.Sprintf("must be true or false, got %s", jsonText(nil, n)))
		return false
	}
	return n.b
}
