package cherenkov

import (
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

// Photon is one emitted Cherenkov photon: position (cm), unit direction,
// time (ns) and vacuum wavelength (nm).
type Photon struct {
	Pos, Dir   r3.Vector
	Time       float64
	Wavelength float64
}

// Table sizes: the index grid is at most 1 nm apart (like optics.Water);
// the yield is tabulated at betaNodes speeds from threshold to 1.
const (
	maxIndexStep = 1.0
	betaNodes    = 2049
)

// frankTammConstant is 2 pi alpha times 1e7 nm/cm: with wavelengths in nm,
// 2 pi alpha int (1 - 1/(beta n)^2) dlambda/lambda^2 times it is photons
// per cm.
const frankTammConstant = 2 * math.Pi * phys.FineStructure * 1e7

// Emitter turns charged-track segments into Cherenkov photons over a
// wavelength band. It copies the water's phase index onto its own grid
// (at most 1 nm apart, linear in between) and precomputes the Frank-Tamm
// yield vs beta. An *Emitter is immutable and safe for concurrent use.
type Emitter struct {
	lo, hi   float64
	h, invH  float64
	index    []float64 // phase index at lo + i h, non-increasing
	s1       []float64 // int_lo^lambda_i dlambda / (n^2 lambda^2), nm^-1
	prescale float64
	keep     func(lambda float64) float64 // thinning by wavelength; nil keeps all
	// Yield table: betaLo + k dBeta, k < betaNodes; yield in photons/cm for
	// unit charge (not prescaled), cum its integral over beta from betaLo.
	betaLo, dBeta, invDBeta float64
	yield, cum              []float64
}

// NewEmitter builds an emitter for the band lo..hi (nm, inside
// water.Band()) that keeps a fraction prescale in (0, 1] of the photons:
// pass the largest detection efficiency of the sensors (e.g. a pmt
// model's MaxEfficiency) and apply the rest of the efficiency, divided by
// prescale, as a survival probability at the sensor.
func NewEmitter(water *optics.Water, lo, hi, prescale float64) (*Emitter, error) {
	if water == nil {
		return nil, fmt.Errorf("cherenkov: NewEmitter water is nil")
	}
	wlo, whi := water.Band()
	if !(lo >= wlo && lo < whi) {
		return nil, fmt.Errorf("cherenkov: NewEmitter lo = %g nm outside the water band %g..%g nm", lo, wlo, whi)
	}
	if !(hi > lo && hi <= whi) {
		return nil, fmt.Errorf("cherenkov: NewEmitter hi = %g nm must lie in (lo = %g, %g] nm", hi, lo, whi)
	}
	intervals := int(math.Ceil((hi - lo) / maxIndexStep))
	h := (hi - lo) / float64(intervals)
	index := make([]float64, intervals+1)
	for i := range index {
		l := lo + float64(i)*h
		if i == intervals {
			l = hi
		}
		index[i] = water.Index(l)
	}
	return newEmitter(lo, hi, index, prescale)
}

// NewThinningEmitter is NewEmitter whose photons are also thinned by
// wavelength: a photon of wavelength lambda drawn at the prescaled rate is
// kept with probability keep(lambda), which must lie in [0, 1] over the
// band. Thinning a Poisson process by a probability that depends only on
// the photon's own wavelength leaves a Poisson process whose spectrum is
// the prescaled one times keep: a simulator passes the sensors'
// wavelength-dependent efficiency over the prescale, so that only photons
// that could make a photoelectron are followed. MeanPhotons and EmitMean's
// mean stay the prescaled means before thinning. keep is checked on the
// emitter's wavelength grid; it is called once per photon and must be safe
// for concurrent use.
func NewThinningEmitter(water *optics.Water, lo, hi, prescale float64, keep func(lambda float64) float64) (*Emitter, error) {
	if keep == nil {
		return nil, fmt.Errorf("cherenkov: NewThinningEmitter keep is nil")
	}
	e, err := NewEmitter(water, lo, hi, prescale)
	if err != nil {
		return nil, err
	}
	for i := range e.index {
		l := min(lo+float64(i)*e.h, hi)
		if k := keep(l); !(k >= 0 && k <= 1) {
			return nil, fmt.Errorf("cherenkov: NewThinningEmitter keep(%g nm) = %g must lie in [0, 1]", l, k)
		}
	}
	e.keep = keep
	return e, nil
}

// newEmitter builds the tables from the index at intervals+1 equally
// spaced wavelengths from lo to hi.
func newEmitter(lo, hi float64, index []float64, prescale float64) (*Emitter, error) {
	if !(prescale > 0 && prescale <= 1) {
		return nil, fmt.Errorf("cherenkov: NewEmitter prescale = %g must lie in (0, 1]", prescale)
	}
	for i, n := range index {
		if !(n > 1) || math.IsInf(n, 1) || (i > 0 && n > index[i-1]) {
			return nil, fmt.Errorf("cherenkov: refractive index %g at %g nm must be finite, > 1 and not rise with wavelength",
				n, lo+float64(i)*(hi-lo)/float64(len(index)-1))
		}
	}
	e := &Emitter{lo: lo, hi: hi, index: index, prescale: prescale}
	e.h = (hi - lo) / float64(len(index)-1)
	e.invH = 1 / e.h
	e.s1 = make([]float64, len(index))
	for i := 1; i < len(index); i++ {
		e.s1[i] = e.s1[i-1] + e.gaussS1(i-1, e.h)
	}
	e.betaLo = 1 / index[0]
	e.dBeta = (1 - e.betaLo) / (betaNodes - 1)
	e.invDBeta = 1 / e.dBeta
	e.yield = make([]float64, betaNodes)
	e.cum = make([]float64, betaNodes)
	for k := range betaNodes {
		beta := e.betaLo + float64(k)*e.dBeta
		if k == betaNodes-1 {
			beta = 1
		}
		e.yield[k] = e.exactYield(beta)
		if k > 0 {
			e.cum[k] = e.cum[k-1] + e.dBeta*(e.yield[k]+e.yield[k-1])/2
		}
	}
	return e, nil
}

// Gauss-Legendre 8-point nodes and weights on [-1, 1] (Abramowitz and
// Stegun, table 25.4).
var (
	glX = [8]float64{-0.9602898564975363, -0.7966664774136267, -0.5255324099163290, -0.1834346424956498,
		0.1834346424956498, 0.5255324099163290, 0.7966664774136267, 0.9602898564975363}
	glW = [8]float64{0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.3626837833783620,
		0.3626837833783620, 0.3137066458778873, 0.2223810344533745, 0.1012285362903763}
)

// gaussS1 integrates 1/(n^2 lambda^2) over [lambda_i, lambda_i + width]
// inside grid interval i, where n is linear.
func (e *Emitter) gaussS1(i int, width float64) float64 {
	l0 := e.lo + float64(i)*e.h
	n0, dn := e.index[i], (e.index[i+1]-e.index[i])*e.invH
	sum := 0.0
	for k, x := range glX {
		d := width / 2 * (1 + x)
		n, l := n0+dn*d, l0+d
		sum += glW[k] / (n * n * l * l)
	}
	return sum * width / 2
}

// indexAt interpolates the emitter's index table; lambda inside the band.
func (e *Emitter) indexAt(lambda float64) float64 {
	f := (lambda - e.lo) * e.invH
	i := int(f)
	if i >= len(e.index)-1 {
		i = len(e.index) - 2
	}
	f -= float64(i)
	return e.index[i] + f*(e.index[i+1]-e.index[i])
}

// cutoff returns the longest wavelength emitted at speed beta (where
// n(lambda) beta = 1, or hi) and the grid interval it falls in. It
// returns lo when beta is below threshold everywhere.
func (e *Emitter) cutoff(beta float64) (lambda float64, interval int) {
	last := len(e.index) - 1
	target := 1 / beta
	if e.index[last] >= target {
		return e.hi, last - 1
	}
	if e.index[0] <= target {
		return e.lo, 0
	}
	// Bisect for index[i] > target >= index[j], j = i+1.
	i, j := 0, last
	for j-i > 1 {
		if m := (i + j) / 2; e.index[m] > target {
			i = m
		} else {
			j = m
		}
	}
	t := (e.index[i] - target) / (e.index[i] - e.index[j])
	return e.lo + (float64(i)+t)*e.h, i
}

// exactYield evaluates the Frank-Tamm integral for unit charge at beta,
// photons per cm: 2 pi alpha int over lambda < cutoff of
// (1 - 1/(beta n)^2)/lambda^2, with int dlambda/lambda^2 in closed form.
func (e *Emitter) exactYield(beta float64) float64 {
	lc, i := e.cutoff(beta)
	if lc <= e.lo {
		return 0
	}
	s1 := e.s1[i] + e.gaussS1(i, lc-(e.lo+float64(i)*e.h))
	return frankTammConstant * math.Max(0, 1/e.lo-1/lc-s1/(beta*beta))
}

// YieldPerCm returns the Frank-Tamm photon yield per cm in the band for a
// particle of unit charge at speed beta in [0, 1], before prescaling
// (interpolated in a table; 0 below threshold, NaN outside [0, 1]).
func (e *Emitter) YieldPerCm(beta float64) float64 {
	if !(beta >= 0 && beta <= 1) {
		return math.NaN()
	}
	k, t := e.betaBin(beta)
	if k < 0 {
		return 0
	}
	return e.yield[k] + t*e.invDBeta*(e.yield[k+1]-e.yield[k])
}

// betaBin returns the yield-table interval k and the offset t = beta -
// beta_k in it, or k = -1 below the table.
func (e *Emitter) betaBin(beta float64) (k int, t float64) {
	if beta <= e.betaLo {
		return -1, 0
	}
	k = min(int((beta-e.betaLo)*e.invDBeta), betaNodes-2)
	return k, beta - (e.betaLo + float64(k)*e.dBeta)
}

// yieldIntegral returns int_{betaLo}^{beta} YieldPerCm dbeta (exact for
// the piecewise-linear table).
func (e *Emitter) yieldIntegral(beta float64) float64 {
	k, t := e.betaBin(beta)
	if k < 0 {
		return 0
	}
	return e.cum[k] + t*e.yield[k] + t*t*e.invDBeta*(e.yield[k+1]-e.yield[k])/2
}

// meanYield returns the yield per cm averaged over a step on which beta
// runs linearly from b0 to b1.
func (e *Emitter) meanYield(b0, b1 float64) float64 {
	if math.Abs(b1-b0) < 1e-9 {
		return e.YieldPerCm((b0 + b1) / 2)
	}
	return (e.yieldIntegral(b1) - e.yieldIntegral(b0)) / (b1 - b0)
}

// MeanPhotons returns the expected number of (prescaled) photons from seg:
// prescale Charge^2 int YieldPerCm(beta(s)) ds, or an error naming a bad
// field of seg.
func (e *Emitter) MeanPhotons(seg phys.Segment) (float64, error) {
	if err := checkSegment(seg); err != nil {
		return 0, err
	}
	return e.mean(seg, seg.Length()), nil
}

func (e *Emitter) mean(seg phys.Segment, length float64) float64 {
	z := float64(seg.Charge)
	return e.prescale * z * z * length * e.meanYield(seg.Beta0, seg.Beta1)
}

// Emit appends to dst the photons of the straight segment seg, whose speed
// runs linearly in path length from Beta0 to Beta1. The number is Poisson
// with mean MeanPhotons(seg). Each photon's position s along the step and
// wavelength lambda are drawn jointly from the density proportional to
// (1 - 1/(beta(s) n(lambda))^2)/lambda^2 where positive, by rejection
// from s uniform and 1/lambda^2 on the band below the cutoff of the
// fastest end: exact in distribution, and no photon where beta(s) is below
// threshold. The direction is on the cone cos theta = 1/(n(lambda) beta(s))
// about the step, uniform in azimuth; the time is interpolated linearly in
// s from T0 to T1 (the speed changes little within a step). A bad segment
// (NaN or infinite coordinates or times, T1 < T0, a speed outside [0, 1])
// returns dst unchanged and an error naming the field. An emitter from
// NewThinningEmitter then keeps each photon with probability
// keep(lambda), drawing its direction only for the kept ones. Emit
// allocates nothing beyond growing dst.
func (e *Emitter) Emit(seg phys.Segment, rng *rand.Rand, dst []Photon) ([]Photon, error) {
	dst, _, err := e.EmitMean(seg, rng, dst)
	return dst, err
}

// EmitMean is Emit that also returns MeanPhotons(seg), which it computes
// anyway, so that a caller wanting both pays for it once.
func (e *Emitter) EmitMean(seg phys.Segment, rng *rand.Rand, dst []Photon) ([]Photon, float64, error) {
	if err := checkSegment(seg); err != nil {
		return dst, 0, err
	}
	axis := seg.End.Sub(seg.Start)
	length := axis.Norm()
	mean := e.mean(seg, length)
	if length == 0 || seg.Charge == 0 {
		return dst, mean, nil
	}
	count := poisson(rng, mean)
	if count == 0 {
		return dst, mean, nil
	}
	axis = axis.Mul(1 / length)
	frame := phys.NewFrame(axis)
	b0, db := seg.Beta0, seg.Beta1-seg.Beta0
	t0, dt := seg.T0, seg.T1-seg.T0
	bmax := math.Max(seg.Beta0, seg.Beta1)
	lc, _ := e.cutoff(bmax)
	// Largest bracket on the proposal region: fastest speed, largest index.
	nbMax := bmax * e.index[0]
	bracketMax := 1 - 1/(nbMax*nbMax)
	invLo := 1 / e.lo
	span := invLo - 1/lc
	for range count {
		var u, beta, lambda, nb float64
		for {
			u = rng.Float64()
			beta = b0 + db*u
			lambda = 1 / (invLo - rng.Float64()*span)
			nb = beta * e.indexAt(lambda)
			if rng.Float64()*bracketMax < 1-1/(nb*nb) {
				break
			}
		}
		if e.keep != nil && !(rng.Float64() < e.keep(lambda)) {
			continue
		}
		dst = append(dst, Photon{
			Pos:        seg.Start.Add(axis.Mul(u * length)),
			Dir:        frame.Deflect(1/nb, 2*math.Pi*rng.Float64()),
			Time:       t0 + dt*u,
			Wavelength: lambda,
		})
	}
	return dst, mean, nil
}

func checkSegment(seg phys.Segment) error {
	finite := func(v r3.Vector) bool {
		// x - x is 0 for finite x and NaN for NaN or +-Inf.
		return v.X-v.X == 0 && v.Y-v.Y == 0 && v.Z-v.Z == 0
	}
	switch {
	case !finite(seg.Start):
		return fmt.Errorf("cherenkov: Segment.Start = %v must be finite", seg.Start)
	case !finite(seg.End):
		return fmt.Errorf("cherenkov: Segment.End = %v must be finite", seg.End)
	case math.IsNaN(seg.T0) || math.IsInf(seg.T0, 0):
		return fmt.Errorf("cherenkov: Segment.T0 = %g ns must be finite", seg.T0)
	case math.IsNaN(seg.T1) || math.IsInf(seg.T1, 0) || seg.T1 < seg.T0:
		return fmt.Errorf("cherenkov: Segment.T1 = %g ns must be finite and >= T0 = %g", seg.T1, seg.T0)
	case !(seg.Beta0 >= 0 && seg.Beta0 <= 1):
		return fmt.Errorf("cherenkov: Segment.Beta0 = %g must lie in [0, 1]", seg.Beta0)
	case !(seg.Beta1 >= 0 && seg.Beta1 <= 1):
		return fmt.Errorf("cherenkov: Segment.Beta1 = %g must lie in [0, 1]", seg.Beta1)
	}
	return nil
}

// Band returns the emission band (nm).
func (e *Emitter) Band() (lo, hi float64) { return e.lo, e.hi }

// Prescale returns the fraction of photons kept.
func (e *Emitter) Prescale() float64 { return e.prescale }

// Threshold returns the lowest speed that emits in the band, 1/n at the
// band's largest index (its short end).
func (e *Emitter) Threshold() float64 { return e.betaLo }

// Index returns the phase index the emitter uses at lambda (nm), or an
// error naming lambda outside the band.
func (e *Emitter) Index(lambda float64) (float64, error) {
	if err := e.checkLambda(lambda); err != nil {
		return 0, err
	}
	return e.indexAt(lambda), nil
}

// ThresholdAt returns the threshold speed 1/n(lambda) at lambda (nm).
func (e *Emitter) ThresholdAt(lambda float64) (float64, error) {
	n, err := e.Index(lambda)
	if err != nil {
		return 0, err
	}
	return 1 / n, nil
}

// Angle returns the Cherenkov angle (radians), acos(1/(n(lambda) beta)),
// at wavelength lambda (nm) and speed beta. It returns an error naming the
// argument when lambda is outside the band, beta outside [0, 1], or beta
// below the threshold at lambda.
func (e *Emitter) Angle(lambda, beta float64) (float64, error) {
	n, err := e.Index(lambda)
	if err != nil {
		return 0, err
	}
	if !(beta >= 0 && beta <= 1) {
		return 0, fmt.Errorf("cherenkov: beta = %g must lie in [0, 1]", beta)
	}
	c := 1 / (n * beta)
	if c > 1 {
		return 0, fmt.Errorf("cherenkov: beta = %g is below the threshold %g at %g nm", beta, 1/n, lambda)
	}
	return math.Acos(c), nil
}

// MaxAngle returns the largest Cherenkov angle in the band (beta = 1 at
// the largest index), radians.
func (e *Emitter) MaxAngle() float64 { return math.Acos(1 / e.index[0]) }

func (e *Emitter) checkLambda(lambda float64) error {
	if !(lambda >= e.lo && lambda <= e.hi) {
		return fmt.Errorf("cherenkov: wavelength %g nm outside the emitter band %g..%g nm", lambda, e.lo, e.hi)
	}
	return nil
}
