package cli

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// TestOversizedMap: a map of 100 000 features (far beyond any roof) gets a clear message and
// exit status 2, with memory bounded by the map's own size.
func TestOversizedMap(t *testing.T) {
	dir := t.TempDir()
	site, err := os.ReadFile(exampleSite)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "site.yaml"), site, 0o644); err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	b.WriteString(`{"type":"FeatureCollection","features":[`)
	for i := range 100_000 {
		if i > 0 {
			b.WriteByte(',')
		}
		fmt.Fprintf(&b, `{"type":"Feature","properties":{"kind":"avoid","id":"a%d"},"geometry":{"type":"Polygon","coordinates":[[[15.43,47.05],[15.4301,47.05],[15.4301,47.0501],[15.43,47.05]]]}}`, i)
	}
	b.WriteString("]}")
	if err := os.WriteFile(filepath.Join(dir, "roof.geojson"), []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	var before runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	_, errs, code := run(t, "survey", filepath.Join(dir, "site.yaml"), "-o", filepath.Join(dir, "out"))
	var after runtime.MemStats
	runtime.ReadMemStats(&after)
	if code != 2 || !strings.Contains(errs, "100000 features") {
		t.Errorf("exit %d, %q: want 2 and the feature count", code, firstLine(errs))
	}
	// Bounded: the map is 15 MB; its tree in memory a small multiple of that (common sense
	// bound: well under 1 GB, the size of an unbounded pairwise check on 10^5 polygons).
	if grown := after.TotalAlloc - before.TotalAlloc; grown > 1<<30 {
		t.Errorf("allocated %d MB for a rejected map", grown>>20)
	}
	if _, err := os.Stat(filepath.Join(dir, "out")); err == nil {
		t.Error("output written for a rejected map")
	}
}

func TestTimeout(t *testing.T) {
	out := filepath.Join(t.TempDir(), "out")
	_, errs, code := run(t, "survey", exampleSite, "-o", out, "--timeout", "1ms")
	if code != 1 || !strings.Contains(errs, "--timeout") {
		t.Errorf("exit %d, %q: want 1 and a message naming --timeout", code, errs)
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("a timed-out run wrote its output")
	}
}

func firstLine(s string) string {
	if i := strings.IndexByte(s, '\n'); i >= 0 {
		return s[:i]
	}
	return s
}
