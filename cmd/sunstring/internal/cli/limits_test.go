package cli

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
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

// TestInputNotRegular: a named pipe or a device given as the map or the site file is refused at
// once (reading a pipe would block, and Ctrl-C with it; /dev/zero never ends), with the path
// named and exit status 2.
func TestInputNotRegular(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "roof.geojson")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	site, err := os.ReadFile(exampleSite)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "site.yaml"), site, 0o644); err != nil {
		t.Fatal(err)
	}
	zero := filepath.Join(dir, "zero")
	if err := os.WriteFile(zero, bytes.ReplaceAll(site, []byte("map: roof.geojson"), []byte("map: /dev/zero")), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		args []string
		want string
	}{
		{"map is a named pipe", []string{"check", filepath.Join(dir, "site.yaml")}, fifo + ": the map is a named pipe; give a regular file"},
		{"map is a device", []string{"check", zero}, "/dev/zero: the map is a device; give a regular file"},
		{"site file is a named pipe", []string{"check", fifo}, fifo + ": the site file is a named pipe"},
	} {
		t.Run(c.name, func(t *testing.T) {
			_, errs, code := run(t, c.args...)
			if code != 2 || !strings.Contains(errs, c.want) {
				t.Errorf("exit %d, %q: want 2 and %q", code, firstLine(errs), c.want)
			}
		})
	}
}

// TestNegativeTimeout: a negative --timeout is a usage error (exit 2), not "no limit".
func TestNegativeTimeout(t *testing.T) {
	out := filepath.Join(t.TempDir(), "out")
	_, errs, code := run(t, "survey", exampleSite, "-o", out, "--timeout", "-1s")
	if code != 2 || !strings.Contains(errs, "--timeout -1s") {
		t.Errorf("exit %d, %q: want 2 and a message naming --timeout", code, errs)
	}
}

// TestCancelledCommitWritesNothing: a run cancelled after rendering (Ctrl-C or --timeout while
// the files are written) leaves no report and no earlier report changed.
func TestCancelledCommitWritesNothing(t *testing.T) {
	out := filepath.Join(t.TempDir(), "out")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	err := outputSet{"a.txt": []byte("x")}.commit(ctx, out)
	if !errors.Is(err, context.Canceled) {
		t.Errorf("error %v, want context.Canceled", err)
	}
	if _, err := os.Stat(out); err == nil {
		t.Error("a cancelled commit wrote the output folder")
	}
	entries, _ := os.ReadDir(filepath.Dir(out))
	if len(entries) != 0 {
		t.Errorf("left behind: %v", entries)
	}
}
