package geo

import (
	"math"

	"github.com/paulmach/orb"
)

// A map whose coordinates were entered latitude first ([lat, lon]) is read with east and
// north exchanged: the drawing is reflected across the north-east diagonal (a bearing θ
// becomes 90° − θ: the tree south of the house stands west of it) and, since a degree of
// longitude is cos(latitude) of a degree of latitude, stretched about 1/cos φ along one axis
// and squeezed about cos φ along the other (at 47°, a 12 × 4 m face comes out 2.8 × 17.5 m;
// its area changes only by cos(lon)/cos(lat), 1.9 % per degree between the two there). The
// site moves by the difference too, |lat − lon| in both, about 135 km per degree at 47°. The
// time-zone check sees the move only when the difference is an hour of longitude or more
// (15°); the reflection is there at any difference, even none, and it ruins the survey: the
// faces no longer run across their aspect_deg, so the rows go the wrong way (the bundled
// example moved to 46.05° E and swapped: 22 modules become 18, 8,574 kWh a year 7,583, the
// south face's two rows of five one column of ten, and every obstacle stands on another
// side). The faces show it: the eave and the ridge of a drawn face run across its aspect
// within the drawing's accuracy; read the other way round, they do so only by chance.

const (
	// swapFitDeg is how far from across the slope a face's best edge may run and still fit
	// its aspect: hand drawing on an aerial picture is good to a few degrees.
	swapFitDeg = 10.0
	// swapMisfitDeg is how far it must run from it for the reading to misfit.
	swapMisfitDeg = 30.0
	// swapMinPitchDeg: on a flatter face the aspect sets only the rows' direction, which a
	// surveyor may choose freely.
	swapMinPitchDeg = 5.0
	// swapEdgeM is the shortest edge that counts: a notch or a clipped corner says nothing.
	swapEdgeM = 1.0
	// Two faces sharing an edge (a ridge, a hip, a valley) have one height along it: within
	// swapFitM when eave heights (measured to a decimetre or two) and pitches (a degree or
	// two over a few metres of slope) are as surveyed; swapMisfitM apart is no such edge.
	swapFitM    = 0.5
	swapMisfitM = 1.5
	// swapCollinearM is how far the ends of one face's edge may lie from the other's for the
	// two to count as one shared edge.
	swapCollinearM = 0.05
)

// acrossMisfitDeg returns how far (degrees, 0 to 90) the edge of the closed ring r that runs
// most nearly across the slope of aspect aspectDeg lies from doing so, edges shorter than
// swapEdgeM left out.
func acrossMisfitDeg(r orb.Ring, aspectDeg float64) float64 {
	best := 90.0
	for i := 0; i+1 < len(r); i++ {
		dx, dy := r[i+1][0]-r[i][0], r[i+1][1]-r[i][1]
		if math.Hypot(dx, dy) < swapEdgeM {
			continue
		}
		az := math.Atan2(dx, dy) * 180 / math.Pi // clockwise from north
		d := math.Mod(math.Abs(az-(aspectDeg+90)), 180)
		best = math.Min(best, math.Min(d, 180-d))
	}
	return best
}

// sharedEdgeGapM returns the largest difference between the heights of faces a and b along
// the stretches of outline they share (edges lying along each other over swapEdgeM or more),
// and whether they share any.
func sharedEdgeGapM(a, b *Face) (gap float64, shared bool) {
	for i := 0; i+1 < len(a.Plan); i++ {
		p, q := a.Plan[i], a.Plan[i+1]
		l := math.Hypot(q[0]-p[0], q[1]-p[1])
		if l < swapEdgeM {
			continue
		}
		for j := 0; j+1 < len(b.Plan); j++ {
			c, d := b.Plan[j], b.Plan[j+1]
			if math.Abs(lineDist(p, q, c)) > swapCollinearM || math.Abs(lineDist(p, q, d)) > swapCollinearM {
				continue
			}
			t0, t1 := along(p, q, c), along(p, q, d)
			lo, hi := math.Max(0, math.Min(t0, t1)), math.Min(1, math.Max(t0, t1))
			if (hi-lo)*l < swapEdgeM {
				continue
			}
			shared = true
			for k := range 5 {
				t := lo + (hi-lo)*float64(k)/4
				x := orb.Point{p[0] + t*(q[0]-p[0]), p[1] + t*(q[1]-p[1])}
				gap = math.Max(gap, math.Abs(a.HeightAt(x)-b.HeightAt(x)))
			}
		}
	}
	return gap, shared
}

// SwapEvidence returns the ids of the hand-drawn roof faces (no building's, none flatter than
// swapMinPitchDeg) that fit their own properties only when every coordinate is read the other
// way round (latitude as longitude and longitude as latitude, the site's centre too), when
// there are any and nothing fits as drawn: the sign of coordinates entered latitude first.
// Two things are weighed, each for both readings: whether a face has an edge running across
// its aspect_deg, as its eave and ridge do (for rectangles at aspects on the compass points or
// the diagonals both readings have one: they say nothing), and whether two faces that share an
// edge have one height along it, as a ridge, a hip or a valley has. A site without a
// projection, or whose longitudes cannot be latitudes, gives nil.
func (s *Site) SwapEvidence() []string {
	if s.Proj == nil {
		return nil
	}
	lon0, lat0, _ := s.Proj.Inverse(Vec3{})
	if math.Abs(lon0) > 90 {
		return nil
	}
	other := NewENU(lat0, lon0, 0)
	var drawn, turned []Face
	for i := range s.Faces {
		f := s.Faces[i]
		if f.Building != "" || f.PitchDeg < swapMinPitchDeg {
			continue
		}
		drawn = append(drawn, f)
		t := f
		t.Plan = make(orb.Ring, len(f.Plan))
		for k, p := range f.Plan {
			lon, lat, _ := s.Proj.Inverse(Vec3{E: p[0], N: p[1]})
			if math.Abs(lon) > 90 {
				return nil
			}
			t.Plan[k] = other.Forward(lat, lon, 0).Plan()
		}
		t.SetEave()
		turned = append(turned, t)
	}
	votes := map[string]bool{}
	asDrawn := false
	vote := func(fitD, misD, fitT, misT bool, ids ...string) {
		switch {
		case fitD && misT:
			asDrawn = true
		case fitT && misD:
			for _, id := range ids {
				votes[id] = true
			}
		}
	}
	for i := range drawn {
		d, t := acrossMisfitDeg(drawn[i].Plan, drawn[i].AspectDeg), acrossMisfitDeg(turned[i].Plan, turned[i].AspectDeg)
		vote(d <= swapFitDeg, d >= swapMisfitDeg, t <= swapFitDeg, t >= swapMisfitDeg, drawn[i].ID)
		for j := range i {
			gd, sd := sharedEdgeGapM(&drawn[i], &drawn[j])
			gt, st := sharedEdgeGapM(&turned[i], &turned[j])
			if sd && st {
				vote(gd <= swapFitM, gd >= swapMisfitM, gt <= swapFitM, gt >= swapMisfitM, drawn[j].ID, drawn[i].ID)
			}
		}
	}
	if asDrawn || len(votes) == 0 {
		return nil
	}
	var out []string
	for _, f := range drawn {
		if votes[f.ID] {
			out = append(out, f.ID)
		}
	}
	return out
}
