package report

import (
	"bytes"
	"image/png"
	"testing"

	"gonum.org/v1/plot/vg"
)

func TestMonthlyChartPNG(t *testing.T) {
	ac := [12]float64{100, 150, 300, 400, 500, 520, 540, 480, 350, 220, 120, 80}
	un := ac
	for i := range un {
		un[i] *= 1.1
	}
	b, err := Render(MonthlyChart(&ac, &un, ""), 16*vg.Centimeter, 9*vg.Centimeter, PNG)
	if err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	// 16 cm at 200 dpi is 1260 px (16/2.54·200); allow a pixel of rounding.
	if w := img.Bounds().Dx(); w < 1259 || w > 1261 {
		t.Errorf("width %d px, want 1260 ± 1", w)
	}
	// The chart is not empty: the accent colour of the bars covers a visible share of the
	// picture (12 bars of roughly 11 pt by up to 80 % of the plot height; common sense bound).
	n := 0
	for y := img.Bounds().Min.Y; y < img.Bounds().Max.Y; y++ {
		for x := img.Bounds().Min.X; x < img.Bounds().Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			if r>>8 == uint32(Accent.R) && g>>8 == uint32(Accent.G) && bl>>8 == uint32(Accent.B) {
				n++
			}
		}
	}
	if frac := float64(n) / float64(img.Bounds().Dx()*img.Bounds().Dy()); frac < 0.03 || frac > 0.5 {
		t.Errorf("accent share %.3f, want between 0.03 and 0.5", frac)
	}
}
