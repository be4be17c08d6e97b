package cli

import (
	"path/filepath"
	"testing"
)

// BenchmarkSurveyExample is the whole survey of the bundled example through the command tree:
// loading, fill, synthetic weather year, sun, shade, module curves, layout search, charts,
// PDF and the atomic write. Issue target: ≤ 3 s.
func BenchmarkSurveyExample(b *testing.B) {
	b.ReportAllocs()
	dir := b.TempDir()
	for b.Loop() {
		root := NewRoot()
		root.SetArgs([]string{"survey", exampleSite, "-o", filepath.Join(dir, "out")})
		root.SetOut(discard{})
		root.SetErr(discard{})
		if err := root.Execute(); err != nil {
			b.Fatal(err)
		}
	}
}

type discard struct{}

func (discard) Write(p []byte) (int, error) { return len(p), nil }
