package geom

import (
	"fmt"
	"math"

	"github.com/golang/geo/r3"
)

// Layout builds a detector with sensors of photocathode diameter
// cathodeDiameter (cm) spread evenly over the sensor surface of t so that the
// photocathode coverage, N pi (D/2)^2 / t.InnerArea(), is as close as the
// integer sensor counts allow to coverage (a fraction, e.g. 0.4). Check
// Coverage() for the value reached; for a few hundred sensors or more it is
// within 1% of the request.
//
// The barrel gets rings equally spaced in z, each with the same number of
// sensors equally spaced in azimuth; ring count and sensors per ring are
// chosen to make the cells near square (aspect within 1.25) while hitting
// the sensor count. Each cap gets a square grid clipped so that every
// photocathode lies inside the cap disk. A square grid, not a hexagonal
// one, because it is the same lattice as the barrel's rings x azimuth, so
// the sensor density and neighbour pattern do not change at the barrel-cap
// edge; its densest packing (pi/4 = 78.5%) lies far above the coverages
// wanted in practice. The cap pitch is chosen to give the cap its area's
// share of the sensors, and the barrel count takes up the rounding.
//
// Sensors are numbered barrel first (ring by ring upward, azimuth
// increasing from +x), then the top cap, then the bottom cap, each cap row
// by row in y then x. A coverage above MaxCoverage(t, cathodeDiameter) is an
// error that states the maximum.
func Layout(t Tank, cathodeDiameter, coverage float64) (*Detector, error) {
	if err := t.Validate(); err != nil {
		return nil, err
	}
	if err := checkDiameter(t, cathodeDiameter); err != nil {
		return nil, err
	}
	if !(coverage > 0) || math.IsInf(coverage, 1) {
		return nil, fmt.Errorf("geom: coverage = %v must be positive and finite", coverage)
	}
	pl := newPlanner(t, cathodeDiameter)
	if max := pl.maxCoverage(); coverage > max {
		return nil, fmt.Errorf("geom: coverage = %v exceeds %.6g, the most that %g cm sensors can reach in this tank without overlapping",
			coverage, max, cathodeDiameter)
	}
	return NewDetector(t, cathodeDiameter, pl.sensors(coverage))
}

// MaxCoverage returns the largest coverage Layout can reach in t with
// photocathodes of diameter cathodeDiameter (cm): every barrel ring and
// azimuth step and the cap grid pitch at one diameter.
func MaxCoverage(t Tank, cathodeDiameter float64) (float64, error) {
	if err := t.Validate(); err != nil {
		return 0, err
	}
	if err := checkDiameter(t, cathodeDiameter); err != nil {
		return 0, err
	}
	return newPlanner(t, cathodeDiameter).maxCoverage(), nil
}

// planner works out the sensor counts of a layout.
type planner struct {
	r, h, diameter float64
	sensorArea     float64 // pi (D/2)^2
	area           float64 // sensor surface area
	maxRings       int     // most rings that fit on the barrel
	maxPerRing     int     // most sensors that fit on one ring
	caps           capLattice
}

// nearlyInt absorbs rounding when a length is an exact multiple of D.
const nearlyInt = 1 + 1e-12

func newPlanner(t Tank, diameter float64) planner {
	c := t.cylinder()
	return planner{
		r: c.r, h: c.h, diameter: diameter,
		sensorArea: math.Pi * diameter * diameter / 4,
		area:       c.area(),
		maxRings:   int(2 * c.h / diameter * nearlyInt),
		maxPerRing: int(2 * math.Pi * c.r / diameter * nearlyInt),
		caps:       newCapLattice(c.r-diameter/2, diameter),
	}
}

func (pl planner) maxCoverage() float64 {
	n := pl.maxRings*pl.maxPerRing + 2*pl.caps.maxCount()
	return float64(n) * pl.sensorArea / pl.area
}

// sensors places the layout for the requested coverage.
func (pl planner) sensors(coverage float64) []Sensor {
	total := coverage * pl.area / pl.sensorArea // wanted sensor count, real
	capArea := math.Pi * pl.r * pl.r
	capPick := pl.caps.best(total * capArea / pl.area)
	rings, perRing := pl.barrel(total - 2*float64(capPick.count))
	if rest := total - float64(rings*perRing); math.Abs(rest-2*float64(capPick.count)) > 1 {
		// The barrel is full (or empty): let the caps take up the rest.
		capPick = pl.caps.best(rest / 2)
	}

	sensors := make([]Sensor, 0, rings*perRing+2*capPick.count)
	dz := 2 * pl.h / float64(rings)
	for i := range rings {
		z := -pl.h + dz*(float64(i)+0.5)
		for j := range perRing {
			phi := 2 * math.Pi * float64(j) / float64(perRing)
			c, s := math.Cos(phi), math.Sin(phi)
			sensors = append(sensors, Sensor{
				Pos: r3.Vector{X: pl.r * c, Y: pl.r * s, Z: z}, Dir: r3.Vector{X: -c, Y: -s}, Surface: Barrel,
			})
		}
	}
	for _, cp := range []struct {
		z, dir float64
		s      Surface
	}{{pl.h, -1, Top}, {-pl.h, 1, Bottom}} {
		pl.caps.each(capPick, func(x, y float64) {
			sensors = append(sensors, Sensor{Pos: r3.Vector{X: x, Y: y, Z: cp.z}, Dir: r3.Vector{Z: cp.dir}, Surface: cp.s})
		})
	}
	return sensors
}

// barrel chooses rings x perRing close to want sensors. Among the
// combinations with near-square cells (azimuth step over ring spacing within
// [1/1.25, 1.25]) it takes the one nearest in count, then the squarest; if
// that misses the count by more than half of the 1% Layout aims for (near
// full packing), any aspect is allowed.
func (pl planner) barrel(want float64) (rings, perRing int) {
	if want < 0.5 || pl.maxRings == 0 || pl.maxPerRing == 0 {
		return 0, 0
	}
	type choice struct {
		rings, perRing int
		miss, skew     float64
	}
	pick := func(maxSkew float64) (choice, bool) {
		best, found := choice{}, false
		for nr := 1; nr <= pl.maxRings; nr++ {
			np := min(max(int(math.Round(want/float64(nr))), 1), pl.maxPerRing)
			c := choice{rings: nr, perRing: np}
			c.miss = math.Abs(float64(nr*np) - want)
			c.skew = math.Abs(math.Log((2 * math.Pi * pl.r / float64(np)) / (2 * pl.h / float64(nr))))
			if c.skew > maxSkew {
				continue
			}
			if !found || c.miss < best.miss || (c.miss == best.miss && c.skew < best.skew) {
				best, found = c, true
			}
		}
		return best, found
	}
	c, ok := pick(math.Log(1.25))
	if !ok || c.miss > 0.005*want {
		if all, _ := pick(math.Inf(1)); !ok || all.miss < c.miss {
			c = all
		}
	}
	return c.rings, c.perRing
}

// capLattice counts the points of a square lattice inside the disk of
// radius rmax on which photocathode centres may sit. With doubled integer
// coordinates (a, b) a point is at (a, b) q/2 for pitch q; the lattice
// through the origin has a and b even, the offset lattice both odd. A point
// of norm m = a^2 + b^2 is inside for m q^2/4 <= rmax^2, so for each parity
// the count as a function of q steps at the integer norms, and cum[m] is the
// number of points of norm <= m. The pitch q >= D bounds the norms by
// mmax = 4 rmax^2 / D^2.
type capLattice struct {
	rmax, diameter float64
	mmax           float64
	cum            [2][]int // by parity: 0 even (through the origin), 1 odd
}

// capChoice is a cap grid: parity, largest norm included, pitch.
type capChoice struct {
	parity, norm, count int
	pitch               float64
}

func newCapLattice(rmax, diameter float64) capLattice {
	l := capLattice{rmax: rmax, diameter: diameter, mmax: 4 * rmax * rmax / (diameter * diameter) * nearlyInt}
	top := int(l.mmax)
	for p := range 2 {
		cum := make([]int, top+1)
		amax := int(math.Sqrt(float64(top)))
		for a := -amax; a <= amax; a++ {
			if (a-p)%2 != 0 {
				continue
			}
			for b := -amax; b <= amax; b++ {
				if m := a*a + b*b; (b-p)%2 == 0 && m <= top {
					cum[m]++
				}
			}
		}
		for m := 1; m <= top; m++ {
			cum[m] += cum[m-1]
		}
		l.cum[p] = cum
	}
	return l
}

func (l capLattice) maxCount() int {
	return max(l.cum[0][len(l.cum[0])-1], l.cum[1][len(l.cum[1])-1])
}

// best returns the cap grid whose count is nearest want. The pitch puts the
// cutoff halfway between the norm of the outermost included ring of points
// and the next one, so the points are clear of the rim by a margin.
func (l capLattice) best(want float64) capChoice {
	var best capChoice
	bestMiss := math.Inf(1)
	for p, cum := range l.cum {
		for m, n := range cum {
			if (m > 0 && n == cum[m-1]) || math.Abs(float64(n)-want) >= bestMiss {
				continue // no point of norm m, or no better
			}
			best, bestMiss = capChoice{parity: p, norm: m, count: n}, math.Abs(float64(n)-want)
		}
	}
	next := best.norm + 1
	for cum := l.cum[best.parity]; next < len(cum) && cum[next] == cum[best.norm]; next++ {
	}
	cut := math.Min((float64(best.norm)+float64(next))/2, l.mmax/nearlyInt)
	best.pitch = l.diameter
	if cut > 0 {
		best.pitch = math.Max(2*l.rmax/math.Sqrt(cut), l.diameter)
	}
	return best
}

// each calls fn with the centre of every point of the grid c, row by row.
func (l capLattice) each(c capChoice, fn func(x, y float64)) {
	amax := int(math.Sqrt(float64(c.norm)))
	for b := -amax; b <= amax; b++ {
		for a := -amax; a <= amax; a++ {
			if (a-c.parity)%2 == 0 && (b-c.parity)%2 == 0 && a*a+b*b <= c.norm && c.count > 0 {
				fn(float64(a)*c.pitch/2, float64(b)*c.pitch/2)
			}
		}
	}
}
