package irradiance

import (
	"math"
	"math/rand/v2"
	"testing"
)

type benchHour struct {
	sky          Sky
	incidenceDeg float64
	airC, windMS float64
}

// syntheticYear builds 8760 hourly skies for a south-facing 30° plane at latitude 47°:
// Cooper's declination, hour-angle midpoints, a random clearness per hour split with Erbs.
func syntheticYear() []benchHour {
	const lat, tilt = 47 * deg, 30 * deg
	rng := rand.New(rand.NewPCG(2026, 1))
	hours := make([]benchHour, 0, 8760)
	for d := 1; d <= 365; d++ {
		dec := 23.45 * deg * math.Sin(2*math.Pi*float64(284+d)/365)
		i0 := ExtraterrestrialNormal(d)
		for h := range 24 {
			w := (float64(h) + 0.5 - 12) * 15 * deg
			cosZ := math.Cos(lat)*math.Cos(dec)*math.Cos(w) + math.Sin(lat)*math.Sin(dec)
			cosT := math.Cos(lat-tilt)*math.Cos(dec)*math.Cos(w) + math.Sin(lat-tilt)*math.Sin(dec)
			z := math.Acos(cosZ) / deg
			ghi := math.Max(0, i0*cosZ*rng.Float64()*0.8)
			dni, dhi := Erbs(ghi, z, d)
			hours = append(hours, benchHour{
				sky:          Sky{DNI: dni, DHI: dhi, GHI: ghi, ZenithDeg: z, DNIExtra: i0, Albedo: 0.2},
				incidenceDeg: math.Acos(math.Max(-1, math.Min(1, cosT))) / deg,
				airC:         10 + 10*rng.Float64(),
				windMS:       5 * rng.Float64(),
			})
		}
	}
	return hours
}

// BenchmarkTransposeYear: Perez transposition, Martin–Ruiz IAM on the beam-like parts and
// the diffuse parts, and Faiman cell temperature, for one face over 8760 hours.
func BenchmarkTransposeYear(b *testing.B) {
	hours := syntheticYear()
	const tiltDeg, ar = 30.0, 0.16
	skyIAM, groundIAM := DiffuseIAMMartinRuiz(tiltDeg, ar)
	var sink float64
	b.ReportAllocs()
	for b.Loop() {
		sum := 0.0
		for i := range hours {
			h := &hours[i]
			c := Transpose(Perez, h.sky, h.incidenceDeg, tiltDeg)
			eff := (c.Beam+c.Circumsolar)*IAMMartinRuiz(h.incidenceDeg, ar) +
				(c.Isotropic+c.Horizon)*skyIAM + c.Ground*groundIAM
			sum += CellTempFaiman(eff, h.airC, h.windMS, FaimanU0, FaimanU1)
		}
		sink += sum
	}
	if math.IsNaN(sink) {
		b.Fatal("NaN in the year")
	}
}
