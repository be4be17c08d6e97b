package report

import (
	"bytes"
	"image/png"
	"strings"
	"testing"

	"gonum.org/v1/plot/vg"
)

// The layouts chart draws the equivalent layouts' bars in the accent colour and the
// equivalence band behind them, and it draws the small plans: a layout within the margin
// shows accent pixels, the band its tint; a summary without layouts draws an empty chart.
func TestLayoutAdviceChart(t *testing.T) {
	pl := &Plan{}
	for i := range 4 {
		x := float64(i) * 1.2
		pl.Modules = append(pl.Modules, PlanModule{ID: string(rune('a' + i)), Corners: [4][2]float64{{x, 0}, {x + 1.1, 0}, {x + 1.1, 1.7}, {x, 1.7}}})
	}
	s := &Summary{
		EquivalenceMarginPct: 0.5,
		LayoutAdvice:         &LayoutAdvice{Chosen: "second", Equivalent: []string{"first", "second"}},
		Layouts: []Layout{
			{Name: "first", AnnualACkWh: 1000, EquivalentToBest: true, Strings: [][]string{{"a", "b"}, {"c", "d"}}},
			{Name: "second", AnnualACkWh: 997, BehindBestKWh: 3, EquivalentToBest: true, Strings: [][]string{{"a", "c"}, {"b", "d"}}},
			{Name: "third", AnnualACkWh: 980, BehindBestKWh: 20, Strings: [][]string{{"a", "b", "c"}}},
		},
	}
	for _, c := range []struct {
		name     string
		s        *Summary
		minShare float64 // of the picture in the accent colour
	}{
		// Two bars, one a hairline, of about 3/20 of the axis; the plans' first string is the
		// accent too: at least a fraction of a percent (common sense bound).
		{"equivalent layouts", s, 0.002},
		{"no layouts", &Summary{}, 0},
	} {
		t.Run(c.name, func(t *testing.T) {
			b, err := Render(LayoutAdviceChart(c.s, pl), 16*vg.Centimeter, 12*vg.Centimeter, PNG)
			if err != nil {
				t.Fatal(err)
			}
			img, err := png.Decode(bytes.NewReader(b))
			if err != nil {
				t.Fatal(err)
			}
			n := 0
			for y := img.Bounds().Min.Y; y < img.Bounds().Max.Y; y++ {
				for x := img.Bounds().Min.X; x < img.Bounds().Max.X; x++ {
					r, g, bl, _ := img.At(x, y).RGBA()
					if r>>8 == uint32(Accent.R) && g>>8 == uint32(Accent.G) && bl>>8 == uint32(Accent.B) {
						n++
					}
				}
			}
			share := float64(n) / float64(img.Bounds().Dx()*img.Bounds().Dy())
			if c.minShare > 0 && share < c.minShare || c.minShare == 0 && share > 0.001 {
				t.Errorf("accent share %.4f, want at least %.4f (none when there are no layouts)", share, c.minShare)
			}
		})
	}
}

// TestLayoutChartShortensLongNames: a long structural name is cut with an ellipsis beside
// its bar, so that the bars keep their width (the full name is in the technical sheet).
func TestLayoutChartShortensLongNames(t *testing.T) {
	long := "strings of 10 and 10, shaded modules spread over one input's strings, strings in parallel"
	s := &Summary{Layouts: []Layout{{Name: "roof order", AnnualACkWh: 1000}, {Name: long, AnnualACkWh: 990, BehindBestKWh: 10}}}
	p := LayoutAdviceChart(s, &Plan{})
	cut := false
	for _, tk := range p.Y.Tick.Marker.Ticks(p.Y.Min, p.Y.Max) {
		if n := len([]rune(tk.Label)); n > maxRowName {
			t.Errorf("label %q has %d runes, want at most %d", tk.Label, n, maxRowName)
		}
		if strings.HasPrefix(tk.Label, "2. strings of 10 and 10") && strings.HasSuffix(tk.Label, "…") {
			cut = true
		}
	}
	if !cut {
		t.Errorf("the long name is not shortened with an ellipsis")
	}
}

// A name is cut to the columns it may take, a CJK character or emoji counting two (East
// Asian Width, Unicode Standard Annex #11, through golang.org/x/text/width).
func TestShorten(t *testing.T) {
	cases := []struct {
		name, in string
		n        int
		want     string
	}{
		{"fits", "south", 5, "south"},
		{"Latin cut", "southwest", 5, "sout…"},
		{"CJK fits in twice its length", "南面", 4, "南面"},
		{"CJK cut by columns", "南東の屋根", 6, "南東…"},
		{"emoji is wide", "🏠🏠🏠", 5, "🏠🏠…"},
		{"Cyrillic is narrow", "юго-запад", 9, "юго-запад"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := shorten(tc.in, tc.n); got != tc.want {
				t.Errorf("shorten(%q, %d) = %q, want %q", tc.in, tc.n, got, tc.want)
			}
		})
	}
}
