package geo

import (
	"bytes"
	"errors"
	"fmt"
	"strings"
	"testing"
)

// hugeObject is a map whose first feature's properties hold n extra members, the last of them
// a duplicate of the first when dup is set.
func hugeObject(n int, dup bool) []byte {
	var b bytes.Buffer
	b.WriteString(`{"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {`)
	for i := range n {
		fmt.Fprintf(&b, `"k%d": %d, `, i, i)
	}
	if dup {
		b.WriteString(`"k0": 1, `)
	}
	b.WriteString(`"kind": "avoid", "id": "a"}, "geometry": null}]}`)
	return b.Bytes()
}

// hugeArray is a map whose first ring holds n numbers.
func hugeArray(n int) []byte {
	var b bytes.Buffer
	b.WriteString(`{"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {"kind": "roof"}, "geometry": {"type": "Polygon", "coordinates": [[`)
	b.WriteString(strings.Repeat("0,", n-1))
	b.WriteString("0]]}}]}")
	return b.Bytes()
}

// TestTreeLimits: maps beyond what a site map can be are refused with one message that names
// the file, the JSON Pointer and the limit; a large object with a repeated member names it.
func TestTreeLimits(t *testing.T) {
	for _, c := range []struct {
		name string
		data []byte
		want []string
	}{
		{"values", hugeArray(MaxMapValues + 10), []string{"big.geojson:1:", "/features/0/geometry/coordinates/0/", "more than 1000000 JSON values"}},
		{"depth", []byte(strings.Repeat("[", 40) + strings.Repeat("]", 40)), []string{"big.geojson:1:34", "at /0/0/0/0", "nested more than 32 deep"}},
		{"duplicate in a large object", hugeObject(5000, true), []string{`/features/0/properties/k0`, `member "k0" appears twice`}},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, err := Decode(bytes.NewReader(c.data), DecodeOptions{File: "big.geojson"})
			var ps Problems
			if !errors.As(err, &ps) || len(ps) != 1 {
				t.Fatalf("want one problem, got %v", err)
			}
			msg := ps.Error() + " " + ps[0].Pointer
			for _, w := range c.want {
				if !strings.Contains(msg, w) {
					t.Errorf("message %q lacks %q", msg, w)
				}
			}
		})
	}
}

// BenchmarkTreeLargeObject reads one object of 200,000 members: the duplicate check must stay
// linear (comparing each name with every earlier one took minutes).
func BenchmarkTreeLargeObject(b *testing.B) {
	data := hugeObject(200_000, false)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := parseTree(data); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkTreeHugeArray reads a 60 MB map whose ring holds 30 million numbers, refused at
// MaxMapValues: allocated bytes show the bound on the tree.
func BenchmarkTreeHugeArray(b *testing.B) {
	data := hugeArray(30_000_000)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := parseTree(data); err == nil {
			b.Fatal("accepted")
		}
	}
}
