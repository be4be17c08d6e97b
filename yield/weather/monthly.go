package weather

import (
	"encoding/binary"
	"hash/fnv"
	"math"
	"math/rand/v2"
	"slices"
	"time"

	"sunstring/yield/irradiance"
)

// Limits of the Bendt et al. (1981) daily clearness distribution (from memory): no day is
// darker than 0.05 or clearer than 0.864.
const (
	bendtKtMin = 0.05
	bendtKtMax = 0.864
)

// dayKtLag1 is the lag-one autocorrelation of daily clearness indices, about 0.3 at most
// stations (Aguiar et al. 1988; from memory): sunny and dull days come in short runs.
const dayKtLag1 = 0.3

// SyntheticNote is the remark every synthetic year carries among its Warnings: a note for the
// record, not a problem.
const SyntheticNote = "synthetic year from monthly values: monthly totals are kept, single days and hours are plausible, not measured"

// maxMonthlyGHIKWhM2 bounds monthly input: the sunniest desert months stay near 280 kWh/m²
// (common practice); more is a unit mistake (daily or annual values, or MJ).
const maxMonthlyGHIKWhM2 = 400

// feasibleShare is how much of the clear-sky envelope a month's total may use: above it
// too few hours are left below the envelope to take the month's total.
const feasibleShare = 0.95

var monthNames = [12]string{"January", "February", "March", "April", "May", "June", "July",
	"August", "September", "October", "November", "December"}

// FromMonthly synthesizes an hourly year (TypicalYear, on the standard-time clock of the
// site's zone) whose monthly global horizontal totals are ghiKWhM2 (kWh/m², January first)
// and whose monthly mean air temperatures are tempC (°C).
//
// Days take the quantiles of the Bendt et al. (1981) distribution for the month's clearness
// index, ordered by the ranks of a first-order autoregression seeded from the inputs, so the
// same inputs give the same year. Hours share each day's total by the Collares-Pereira & Rabl
// (1979) profile, evaluated at the middle of each hour's sunlit part and weighted by that
// part's length. No hour exceeds a very clear sky (Ineichen & Perez 2002, Linke turbidity 2);
// the hours of each month are then scaled so that its total is met. Beam and diffuse are
// split with Erbs et al. (1982). Air temperatures follow the monthly means with a daily swing
// that grows with the day's clearness; wind is DefaultWindMS.
//
// Input problems (negative or implausible totals, totals above what a clear sky gives, light
// in a polar night) come back together as an *InputError named "monthly climate".
func FromMonthly(s Site, ghiKWhM2, tempC [12]float64) (*Series, error) {
	y, err := monthlyYear(s, "monthly climate", ghiKWhM2, tempC)
	if err != nil {
		return nil, err
	}
	ser, ends, suns := y.ser, y.ends, y.suns
	n := len(ends)
	month, day, etr, envelope := y.month, y.day, y.etr, y.envelope
	monthETR, nDays := y.monthETR, y.nDays

	// Daily clearness: Bendt quantiles per month, in the rank order of an AR(1) sequence.
	dayETR := make([]float64, nDays)
	dayMonth := make([]int, nDays)
	for i := range n {
		dayETR[day[i]] += etr[i]
		dayMonth[day[i]] = month[i]
	}
	rng := rand.New(rand.NewPCG(seedOf(s, ghiKWhM2, tempC)))
	ar := make([]float64, nDays)
	x := rng.NormFloat64()
	for d := range ar {
		ar[d] = x
		x = dayKtLag1*x + math.Sqrt(1-dayKtLag1*dayKtLag1)*rng.NormFloat64()
	}
	dayKt := make([]float64, nDays)
	for m := range 12 {
		var days []int
		for d := range nDays {
			if dayMonth[d] == m && dayETR[d] > 0 {
				days = append(days, d)
			}
		}
		if len(days) == 0 || monthETR[m] == 0 {
			continue
		}
		gamma := bendtGamma(ghiKWhM2[m] * 1000 / monthETR[m])
		slices.SortStableFunc(days, func(a, b int) int { return cmpFloat(ar[a], ar[b]) })
		for rank, d := range days {
			dayKt[d] = bendtQuantile(gamma, (float64(rank)+0.5)/float64(len(days)))
		}
	}

	// Hours within each day: Collares-Pereira & Rabl weights over the sunlit part.
	ghi := make([]float64, n)
	weights := make([]float64, n)
	for start := 0; start < n; {
		end := start
		for end < n && day[end] == day[start] {
			end++
		}
		sumW, sumE := 0.0, 0.0
		for i := start; i < end; i++ {
			is := suns[i]
			if is.frac == 0 {
				continue
			}
			weights[i] = is.frac * rtShape(is.pos.HourAngle.Degrees(), sunsetHourAngleDeg(s.LatDeg, is.pos.Declination.Degrees()))
			sumW += weights[i]
			sumE += etr[i]
		}
		total := dayKt[day[start]] * dayETR[day[start]]
		for i := start; i < end; i++ {
			switch {
			case sumW > 0:
				ghi[i] = total * weights[i] / sumW
			case sumE > 0: // only hours at the very edge of the day: share by extraterrestrial light
				ghi[i] = total * etr[i] / sumE
			}
		}
		start = end
	}
	fitMonths(ghi, envelope, month, ghiKWhM2)

	hourKt := make([]float64, n)
	for i, e := range ends {
		rec := &ser.Records[i]
		rec.End = e
		rec.GHI = ghi[i]
		rec.DNI, rec.DHI = splitGHI(ghi[i], suns[i], s.ElevationM)
		rec.WindMS = DefaultWindMS
		hourKt[i] = dayKt[day[i]]
	}
	fillTemps(ser, tempC, hourKt)
	ser.Warnings = append(ser.Warnings, SyntheticNote)
	return ser, nil
}

// CheckMonthly validates monthly values as FromMonthly does (ranges, totals above what a
// clear sky gives at the site, light in a polar night) without synthesizing the year, and
// names the input name in its messages: e.g. "site.yaml: climate", so that a check of the
// site file finds what a survey would refuse.
func CheckMonthly(s Site, name string, ghiKWhM2, tempC [12]float64) error {
	_, err := monthlyYear(s, name, ghiKWhM2, tempC)
	return err
}

// monthYear is an empty year at a site with what FromMonthly needs of each hour.
type monthYear struct {
	ser                *Series
	ends               []time.Time
	suns               []intervalSun
	month, day         []int     // 0..11; 0-based day of the year, local standard time
	etr, envelope      []float64 // extraterrestrial horizontal and clear-sky GHI at Linke turbidity 2, W/m²
	monthETR, monthEnv [12]float64
	nDays              int
}

// monthlyYear validates monthly values (problems named name) and prepares the empty year.
func monthlyYear(s Site, name string, ghiKWhM2, tempC [12]float64) (*monthYear, error) {
	p := &problems{name: name}
	checkSite(p, s)
	for m := range 12 {
		g, t := ghiKWhM2[m], tempC[m]
		if math.IsNaN(g) || g < 0 || g > maxMonthlyGHIKWhM2 {
			p.add(0, "monthly_ghi_kwh_m2 "+monthNames[m], "value %s outside 0..%d kWh/m²", fmtNum(g), maxMonthlyGHIKWhM2)
		}
		if math.IsNaN(t) || t < limTemp.lo || t > limTemp.hi {
			p.add(0, "monthly_temp_c "+monthNames[m], "value %s outside %g..%g °C", fmtNum(t), limTemp.lo, limTemp.hi)
		}
	}
	if p.count() > 0 {
		return nil, p.err()
	}
	y := &monthYear{}
	y.ser, y.ends, y.suns = emptyYear(s, SourceMonthly)
	n := len(y.ends)
	zone := fixedZone(y.ser.TZOffsetHours)
	y.month, y.day = make([]int, n), make([]int, n)
	y.etr, y.envelope = make([]float64, n), make([]float64, n)
	for i, e := range y.ends {
		mid := e.Add(-y.ser.Interval / 2).In(zone)
		y.month[i], y.day[i] = int(mid.Month())-1, mid.YearDay()-1
		y.nDays = y.day[i] + 1
		is := y.suns[i]
		if is.frac == 0 {
			continue
		}
		i0 := irradiance.ExtraterrestrialNormal(is.doy)
		y.etr[i] = i0 * is.meanC
		g, _ := clearSky(is.pos.Zenith.Degrees(), i0, envelopeTL, s.ElevationM)
		y.envelope[i] = g * is.frac
		y.monthETR[y.month[i]] += y.etr[i]
		y.monthEnv[y.month[i]] += y.envelope[i]
	}
	for m := range 12 {
		target := ghiKWhM2[m] * 1000
		switch {
		case target > 0 && y.monthEnv[m] == 0:
			p.add(0, "monthly_ghi_kwh_m2 "+monthNames[m], "value %s, but the sun does not rise at the site in %s", fmtNum(ghiKWhM2[m]), monthNames[m])
		case target > feasibleShare*y.monthEnv[m]:
			p.add(0, "monthly_ghi_kwh_m2 "+monthNames[m], "value %s above %.0f%% of the clear-sky total %.1f kWh/m² at the site (Ineichen & Perez 2002, Linke turbidity %g); check the units (kWh/m² a month) and the site's coordinates",
				fmtNum(ghiKWhM2[m]), feasibleShare*100, y.monthEnv[m]/1000, envelopeTL)
		}
	}
	if p.count() > 0 {
		return nil, p.err()
	}
	return y, nil
}

// fitMonths caps every hour at the envelope and scales the uncapped hours of each month until
// the month's total is met. Each round caps at least one more hour or ends, so it converges
// in at most as many rounds as a month has hours; in practice a handful.
func fitMonths(ghi, envelope []float64, month []int, totalsKWhM2 [12]float64) {
	const maxRounds = 60
	for range maxRounds {
		var capped, free [12]float64
		for i, g := range ghi {
			if g >= envelope[i] {
				ghi[i] = envelope[i]
				capped[month[i]] += envelope[i]
			} else {
				free[month[i]] += g
			}
		}
		var scale [12]float64
		done := true
		for m := range 12 {
			scale[m] = 1
			if free[m] > 0 {
				scale[m] = (totalsKWhM2[m]*1000 - capped[m]) / free[m]
			}
			if math.Abs(scale[m]-1) > 1e-12 {
				done = false
			}
		}
		if done {
			return
		}
		for i, g := range ghi {
			if g < envelope[i] {
				ghi[i] = math.Min(envelope[i], g*math.Max(scale[month[i]], 0))
			}
		}
	}
}

// bendtMean is the mean of the Bendt et al. (1981) distribution f(k) ∝ exp(γk) on
// [bendtKtMin, bendtKtMax], written so that it neither overflows nor cancels for large |γ|.
func bendtMean(gamma float64) float64 {
	a, b := bendtKtMin, bendtKtMax
	d := b - a
	switch {
	case math.Abs(gamma) < 1e-6:
		return (a + b) / 2
	case gamma > 0:
		e := math.Exp(-gamma * d)
		return (b-a*e)/(1-e) - 1/gamma
	default:
		e := math.Exp(gamma * d)
		return (b*e-a)/(e-1) - 1/gamma
	}
}

// bendtGamma solves bendtMean(γ) = kt by bisection; the mean rises monotonically with γ.
// kt is kept inside the distribution's range.
func bendtGamma(kt float64) float64 {
	kt = math.Min(math.Max(kt, bendtKtMin+0.005), bendtKtMax-0.005)
	lo, hi := -1000.0, 1000.0
	for range 100 {
		mid := (lo + hi) / 2
		if bendtMean(mid) < kt {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// bendtQuantile inverts the distribution's cumulative function
// F(k) = (exp(γk) − exp(γkmin)) / (exp(γkmax) − exp(γkmin)) at u in (0, 1).
func bendtQuantile(gamma, u float64) float64 {
	a, b := bendtKtMin, bendtKtMax
	d := b - a
	switch {
	case math.Abs(gamma) < 1e-6:
		return a + u*d
	case gamma > 0:
		return b + math.Log(u+(1-u)*math.Exp(-gamma*d))/gamma
	default:
		return a + math.Log(1-u+u*math.Exp(gamma*d))/gamma
	}
}

// bendtCDF is F(k), the share of days with clearness below k.
func bendtCDF(gamma, k float64) float64 {
	a, b := bendtKtMin, bendtKtMax
	k = math.Min(math.Max(k, a), b)
	if math.Abs(gamma) < 1e-6 {
		return (k - a) / (b - a)
	}
	// Divide through by exp(γ·max(a,b)-side) to stay finite.
	if gamma > 0 {
		return (math.Exp(gamma*(k-b)) - math.Exp(gamma*(a-b))) / (1 - math.Exp(gamma*(a-b)))
	}
	return (math.Exp(gamma*(k-a)) - 1) / (math.Exp(gamma*(b-a)) - 1)
}

// rtShape is the shape of the Collares-Pereira & Rabl (1979) ratio of hourly to daily global
// irradiation, (a + b cos ω)(cos ω − cos ωs), for hour angle ω and sunset hour angle ωs in
// degrees; the constant factor is left out since each day's weights are normalized. Negative
// values (the sun a hair beyond the geometric sunset angle, lifted by refraction) are zero.
func rtShape(omegaDeg, omegaSDeg float64) float64 {
	const rad = math.Pi / 180
	a := 0.409 + 0.5016*math.Sin((omegaSDeg-60)*rad)
	b := 0.6609 - 0.4767*math.Sin((omegaSDeg-60)*rad)
	return math.Max(0, (a+b*math.Cos(omegaDeg*rad))*(math.Cos(omegaDeg*rad)-math.Cos(omegaSDeg*rad)))
}

// sunsetHourAngleDeg is ωs from cos ωs = −tan φ tan δ, 0 in polar night and 180 in polar day.
func sunsetHourAngleDeg(latDeg, declDeg float64) float64 {
	c := -math.Tan(latDeg*math.Pi/180) * math.Tan(declDeg*math.Pi/180)
	return math.Acos(math.Max(-1, math.Min(1, c))) * 180 / math.Pi
}

// seedOf hashes the inputs into the generator's seed: the same site and values always give
// the same year, and a change to any of them gives another.
func seedOf(s Site, ghi, temp [12]float64) (uint64, uint64) {
	h := fnv.New64a()
	var buf [8]byte
	put := func(v float64) {
		binary.LittleEndian.PutUint64(buf[:], math.Float64bits(v))
		h.Write(buf[:])
	}
	put(s.LatDeg)
	put(s.LonDeg)
	put(s.ElevationM)
	for m := range 12 {
		put(ghi[m])
		put(temp[m])
	}
	h.Write([]byte(zoneName(s.Zone)))
	x := h.Sum64()
	return x, x ^ 0x9e3779b97f4a7c15 // second word: the golden-ratio constant, any odd mix will do
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// checkSite adds problems for a site outside the Earth's coordinates.
func checkSite(p *problems, s Site) {
	if math.IsNaN(s.LatDeg) || s.LatDeg < -90 || s.LatDeg > 90 {
		p.add(0, "latitude", "value %s outside -90..90 degrees", fmtNum(s.LatDeg))
	}
	if math.IsNaN(s.LonDeg) || s.LonDeg < -180 || s.LonDeg > 180 {
		p.add(0, "longitude", "value %s outside -180..180 degrees", fmtNum(s.LonDeg))
	}
	if math.IsNaN(s.ElevationM) || s.ElevationM < -1000 || s.ElevationM > 9000 {
		p.add(0, "elevation_m", "value %s outside -1000..9000 m", fmtNum(s.ElevationM))
	}
}
