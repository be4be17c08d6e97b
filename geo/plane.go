package geo

import "math"

// plane is z = Z0 + GE·(e − CE) + GN·(n − CN): a roof face's height as a function of its plan
// position, fitted by least squares to the face's 3-D vertices.
type plane struct {
	CE, CN, Z0 float64 // centroid of the vertices
	GE, GN     float64 // gradient: metres of height per metre east and north
}

// fitPlane fits a plane to points by least squares on vertical residuals (a roof face is never
// vertical, so height is a function of plan position). It reports false when the points do not
// span an area in plan (all on one line).
func fitPlane(pts []Vec3) (plane, bool) {
	var p plane
	if len(pts) < 3 {
		return p, false
	}
	k := float64(len(pts))
	for _, v := range pts {
		p.CE += v.E / k
		p.CN += v.N / k
		p.Z0 += v.U / k
	}
	var see, snn, sen, sez, snz float64
	for _, v := range pts {
		e, n, z := v.E-p.CE, v.N-p.CN, v.U-p.Z0
		see += e * e
		snn += n * n
		sen += e * n
		sez += e * z
		snz += n * z
	}
	det := see*snn - sen*sen
	// Relative test: the points' plan spread must be more than a sliver.
	if det <= 1e-12*(see+snn)*(see+snn) || see+snn == 0 {
		return p, false
	}
	p.GE = (sez*snn - snz*sen) / det
	p.GN = (snz*see - sez*sen) / det
	return p, true
}

// At returns the plane's height above a plan point.
func (p plane) At(e, n float64) float64 { return p.Z0 + p.GE*(e-p.CE) + p.GN*(n-p.CN) }

// PitchDeg returns the slope from horizontal.
func (p plane) PitchDeg() float64 { return math.Atan(math.Hypot(p.GE, p.GN)) * 180 / math.Pi }

// AspectDeg returns the downhill direction clockwise from north in [0, 360); 180 for a level
// plane, whose aspect is undefined (south is as good as any and keeps rows east–west).
func (p plane) AspectDeg() float64 {
	if math.Hypot(p.GE, p.GN) < 1e-9 {
		return 180
	}
	a := math.Atan2(-p.GE, -p.GN) * 180 / math.Pi
	return normDeg(a)
}

// Distance returns the perpendicular distance of v from the plane.
func (p plane) Distance(v Vec3) float64 {
	return math.Abs(v.U-p.At(v.E, v.N)) / math.Sqrt(1+p.GE*p.GE+p.GN*p.GN)
}

// normDeg folds an angle into [0, 360).
func normDeg(a float64) float64 {
	a = math.Mod(a, 360)
	if a < 0 {
		a += 360
	}
	if a >= 360 { // −1e-15 + 360 rounds to 360
		a = 0
	}
	return a
}

// angleDiffDeg returns the smallest difference between two azimuths, in [0, 180].
func angleDiffDeg(a, b float64) float64 {
	d := math.Abs(normDeg(a) - normDeg(b))
	return math.Min(d, 360-d)
}
