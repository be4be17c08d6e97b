package sun

import "time"

// DeltaT returns TT − UT in seconds at t from the polynomial model of Espenak & Meeus (2006),
// Five Millennium Canon of Solar Eclipses, NASA/TP-2006-214141, section 2.6. The model is
// fitted to the historical record of Morrison & Stephenson (2004) and to observations up to
// 2005; after 2005 it extrapolates and runs a few seconds high in the 2020s (the model gives
// about 74 s for mid-2024 against roughly 69 s observed, the latter from memory). A second of ΔT
// moves the sun by about 0.004″, far below the algorithm's own uncertainty. Observer.DeltaTSec overrides it.
func DeltaT(t time.Time) float64 {
	yr, mo, _ := t.UTC().Date()
	return deltaTYear(float64(yr) + (float64(mo)-0.5)/12)
}

// deltaTYear evaluates the model at decimal year y (the middle of a month, as the model's
// authors prescribe).
func deltaTYear(y float64) float64 {
	switch {
	case y < -500:
		u := (y - 1820) / 100
		return -20 + 32*u*u
	case y < 500:
		u := y / 100
		return 10583.6 + u*(-1014.41+u*(33.78311+u*(-5.952053+u*(-0.1798452+u*(0.022174192+u*0.0090316521)))))
	case y < 1600:
		u := (y - 1000) / 100
		return 1574.2 + u*(-556.01+u*(71.23472+u*(0.319781+u*(-0.8503463+u*(-0.005050998+u*0.0083572073)))))
	case y < 1700:
		t := y - 1600
		return 120 + t*(-0.9808+t*(-0.01532+t/7129))
	case y < 1800:
		t := y - 1700
		return 8.83 + t*(0.1603+t*(-0.0059285+t*(0.00013336-t/1174000)))
	case y < 1860:
		t := y - 1800
		return 13.72 + t*(-0.332447+t*(0.0068612+t*(0.0041116+t*(-0.00037436+t*(0.0000121272+t*(-0.0000001699+t*0.000000000875))))))
	case y < 1900:
		t := y - 1860
		return 7.62 + t*(0.5737+t*(-0.251754+t*(0.01680668+t*(-0.0004473624+t/233174))))
	case y < 1920:
		t := y - 1900
		return -2.79 + t*(1.494119+t*(-0.0598939+t*(0.0061966-t*0.000197)))
	case y < 1941:
		t := y - 1920
		return 21.20 + t*(0.84493+t*(-0.076100+t*0.0020936))
	case y < 1961:
		t := y - 1950
		return 29.07 + t*(0.407+t*(-1.0/233+t/2547))
	case y < 1986:
		t := y - 1975
		return 45.45 + t*(1.067+t*(-1.0/260-t/718))
	case y < 2005:
		t := y - 2000
		return 63.86 + t*(0.3345+t*(-0.060374+t*(0.0017275+t*(0.000651814+t*0.00002373599))))
	case y < 2050:
		t := y - 2000
		return 62.92 + t*(0.32217+t*0.005589)
	case y < 2150:
		u := (y - 1820) / 100
		return -20 + 32*u*u - 0.5628*(2150-y)
	default:
		u := (y - 1820) / 100
		return -20 + 32*u*u
	}
}
