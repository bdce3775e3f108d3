package cherenkov

import (
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

// step returns a straight segment of the given length along a fixed
// oblique direction from a point inside a tank.
func step(length, b0, b1 float64, charge int) phys.Segment {
	u := r3.Vector{X: 0.3, Y: -0.5, Z: 0.8}.Normalize()
	start := r3.Vector{X: 10, Y: -20, Z: 30}
	return phys.Segment{Start: start, End: start.Add(u.Mul(length)), T0: 5, T1: 5 + length/(phys.SpeedOfLight*(b0+b1)/2),
		Beta0: b0, Beta1: b1, Charge: charge, PDG: phys.MuonMinus, Track: 1}
}

// emitMany emits from nSteps copies of seg with a fixed seed.
func emitMany(t *testing.T, e *Emitter, seg phys.Segment, nSteps int, seed uint64) []Photon {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 99))
	var ph []Photon
	for range nSteps {
		var err error
		if ph, err = e.Emit(seg, rng, ph); err != nil {
			t.Fatal(err)
		}
	}
	return ph
}

// spectrumBins returns the expected fraction of photons per wavelength
// bin at speed beta, by quadrature of (1 - 1/(beta n)^2)/lambda^2 with
// the water's own index (edges on 1 nm nodes so the integrand is smooth
// in each piece except at the cutoff, where the clipped bracket is
// continuous).
func spectrumBins(w *optics.Water, beta float64, edges []float64) []float64 {
	f := func(l float64) float64 {
		nb := beta * w.Index(l)
		return math.Max(0, 1-1/(nb*nb)) / (l * l)
	}
	p := make([]float64, len(edges)-1)
	total := 0.0
	for i := range p {
		for a := edges[i]; a < edges[i+1]; a++ {
			p[i] += quad.Fixed(f, a, math.Min(a+1, edges[i+1]), 20, nil, 0)
		}
		total += p[i]
	}
	for i := range p {
		p[i] /= total
	}
	return p
}

func histogram(x []float64, edges []float64) []int {
	c := make([]int, len(edges)-1)
	for _, v := range x {
		i, _ := slices.BinarySearch(edges, v)
		c[min(max(i-1, 0), len(c)-1)]++
	}
	return c
}

func wavelengths(ph []Photon) []float64 {
	x := make([]float64, len(ph))
	for i, p := range ph {
		x[i] = p.Wavelength
	}
	return x
}

func TestEmitSpectrum(t *testing.T) {
	w := testWater(t)
	e := testEmitter(t, w, 250, 700, 1)
	for _, c := range []struct {
		beta  float64
		steps int
	}{{1, 400}, {0.74, 4000}} {
		beta := c.beta
		ph := emitMany(t, e, step(1, beta, beta, 1), c.steps, 3)
		lc, _ := e.cutoff(beta)
		var edges []float64
		for l := 250.0; l < lc; l += 15 {
			edges = append(edges, l)
		}
		edges = append(edges, lc)
		x := wavelengths(ph)
		for _, l := range x {
			if l < 250 || l > lc {
				t.Fatalf("beta %g: wavelength %g outside 250..%g nm", beta, l, lc)
			}
		}
		p := spectrumBins(w, beta, edges)
		exp := make([]float64, len(p))
		for i := range p {
			exp[i] = p[i] * float64(len(x))
		}
		obs := histogram(x, edges)
		if stat, crit := chiSquare(t, obs, exp); stat > crit {
			t.Errorf("beta %g: spectrum chi2 = %g > %g (%d bins, %d photons)", beta, stat, crit, len(obs), len(x))
		}
		// Mostly blue/violet (common practice): the spectrum falls with
		// wavelength, so the first bin outweighs the last by far.
		if beta == 1 && !(obs[0] > 4*obs[len(obs)-1]) {
			t.Errorf("spectrum does not rise to the blue: %v", obs)
		}
	}
}

func TestEmitCone(t *testing.T) {
	// Each photon is on its own wavelength's cone cos theta = 1/(n beta);
	// the histogram of cos theta follows the spectrum mapped through
	// n(lambda) (cos rises with lambda under normal dispersion).
	w := testWater(t)
	e := testEmitter(t, w, 250, 700, 1)
	const beta = 1
	seg := step(1, beta, beta, 1)
	axis := seg.End.Sub(seg.Start).Normalize()
	ph := emitMany(t, e, seg, 300, 4)
	cosines := make([]float64, len(ph))
	var azimuth r3.Vector
	for i, p := range ph {
		n, _ := e.Index(p.Wavelength)
		c := p.Dir.Dot(axis)
		if math.Abs(c-1/(n*beta)) > 1e-12 || math.Abs(p.Dir.Norm()-1) > 1e-12 {
			t.Fatalf("photon at %g nm: cos %g, want %g", p.Wavelength, c, 1/(n*beta))
		}
		cosines[i] = c
		azimuth = azimuth.Add(p.Dir.Sub(axis.Mul(c)))
	}
	// Uniform azimuth: the mean transverse vector vanishes; each of its
	// components has sigma sin(theta)/sqrt(2N) <= 0.7/sqrt(2N).
	if m := azimuth.Mul(1 / float64(len(ph))).Norm(); m > 5*0.7/math.Sqrt(2*float64(len(ph)))*math.Sqrt(2) {
		t.Errorf("mean transverse direction %g", m)
	}
	// Bin edges in wavelength map to edges in cos theta.
	var lEdges, cEdges []float64
	for l := 250.0; l <= 700; l += 15 {
		lEdges = append(lEdges, l)
		cEdges = append(cEdges, 1/(beta*w.Index(l)))
	}
	p := spectrumBins(w, beta, lEdges)
	exp := make([]float64, len(p))
	for i := range p {
		exp[i] = p[i] * float64(len(ph))
	}
	if stat, crit := chiSquare(t, histogram(cosines, cEdges), exp); stat > crit {
		t.Errorf("cos theta chi2 = %g > %g", stat, crit)
	}
	deg := math.Acos(slices.Min(cosines)) * 180 / math.Pi
	if deg > e.MaxAngle()*180/math.Pi+1e-9 {
		t.Errorf("angle %g deg beyond the maximum", deg)
	}
}

func TestEmitAlongSlowingStep(t *testing.T) {
	// An electron slowing from beta 0.80 to 0.70 across threshold
	// (0.7258 at 250 nm): positions follow the local yield, none below
	// threshold, times linear in the position.
	w := testWater(t)
	e := testEmitter(t, w, 250, 700, 1)
	const length, b0, b1 = 2.0, 0.80, 0.70
	seg := step(length, b0, b1, -1)
	axis := seg.End.Sub(seg.Start).Normalize()
	ph := emitMany(t, e, seg, 1500, 5)
	sThr := length * (b0 - e.Threshold()) / (b0 - b1)
	pos := make([]float64, len(ph))
	for i, p := range ph {
		s := p.Pos.Sub(seg.Start).Dot(axis)
		if p.Pos.Sub(seg.Start.Add(axis.Mul(s))).Norm() > 1e-12 {
			t.Fatalf("photon off the step: %v", p.Pos)
		}
		if s > sThr+1e-12 {
			t.Fatalf("photon at s = %g beyond threshold point %g", s, sThr)
		}
		if want := seg.T0 + (seg.T1-seg.T0)*s/length; math.Abs(p.Time-want) > 1e-12 {
			t.Fatalf("time %g at s = %g, want %g", p.Time, s, want)
		}
		beta := b0 + (b1-b0)*s/length
		n, _ := e.Index(p.Wavelength)
		if math.Abs(p.Dir.Dot(axis)-1/(n*beta)) > 1e-12 {
			t.Fatalf("cos %g at s = %g, want %g", p.Dir.Dot(axis), s, 1/(n*beta))
		}
		pos[i] = s
	}
	// Distribution of s against the direct Frank-Tamm yield along the step
	// (independent quadrature of the spectrum, not the emitter's tables).
	var edges []float64
	for s := 0.0; s < sThr; s += sThr / 20 {
		edges = append(edges, s)
	}
	edges[len(edges)-1] = sThr
	yieldAt := func(s float64) float64 { return bruteYield(w, 250, 700, b0+(b1-b0)*s/length) }
	exp := make([]float64, len(edges)-1)
	total := 0.0
	for i := range exp {
		exp[i] = quad.Fixed(yieldAt, edges[i], edges[i+1], 8, nil, 0)
		total += exp[i]
	}
	for i := range exp {
		exp[i] *= float64(len(pos)) / total
	}
	if stat, crit := chiSquare(t, histogram(pos, edges), exp); stat > crit {
		t.Errorf("position chi2 = %g > %g", stat, crit)
	}
	// The count: Poisson mean = z^2 times the integrated yield, checked
	// against the direct quadrature and the total within 5 sigma.
	mean, err := e.MeanPhotons(seg)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(mean-total) > 1e-4*total {
		t.Errorf("MeanPhotons %g, quadrature %g", mean, total)
	}
	if got, want := float64(len(ph)), 1500*mean; math.Abs(got-want) > 5*math.Sqrt(want) {
		t.Errorf("%g photons from 1500 steps, want %g", got, want)
	}
	// Charge 2 quadruples the mean.
	seg2 := seg
	seg2.Charge = 2
	if m2, _ := e.MeanPhotons(seg2); math.Abs(m2-4*mean) > 1e-12*mean {
		t.Errorf("charge 2 mean %g, want %g", m2, 4*mean)
	}
}

func TestPrescale(t *testing.T) {
	// With prescale p the photons per cm are p times the full yield, and
	// the spectrum is the same as the full one thinned at random by p.
	w := testWater(t)
	const p = 0.3
	full := testEmitter(t, w, 250, 700, 1)
	pre := testEmitter(t, w, 250, 700, p)
	const nSteps = 500
	seg := step(1, 1, 1, 1)
	phPre := emitMany(t, pre, seg, nSteps, 6)
	phFull := emitMany(t, full, seg, nSteps, 7)
	want := nSteps * p * full.YieldPerCm(1)
	if got := float64(len(phPre)); math.Abs(got-want) > 5*math.Sqrt(want) {
		t.Errorf("prescaled count %g, want %g +- %g (Poisson, 5 sigma)", got, want, 5*math.Sqrt(want))
	}
	thin := rand.New(rand.NewPCG(8, 8))
	var thinned []float64
	for _, ph := range phFull {
		if thin.Float64() < p {
			thinned = append(thinned, ph.Wavelength)
		}
	}
	x := wavelengths(phPre)
	slices.Sort(x)
	slices.Sort(thinned)
	d := stat.KolmogorovSmirnov(x, nil, thinned, nil)
	if crit := resolution.KSTwoSampleCritical(len(x), len(thinned), testAlpha); d > crit {
		t.Errorf("two-sample KS D = %g > %g", d, crit)
	}
}

func TestEmitBadSegments(t *testing.T) {
	w := testWater(t)
	e := testEmitter(t, w, 250, 700, 1)
	nan, inf := math.NaN(), math.Inf(1)
	cases := []struct {
		msg string
		mod func(*phys.Segment)
	}{
		{"Segment.Start", func(s *phys.Segment) { s.Start.X = nan }},
		{"Segment.End", func(s *phys.Segment) { s.End.Z = inf }},
		{"Segment.T0 = NaN", func(s *phys.Segment) { s.T0 = nan }},
		{"Segment.T1", func(s *phys.Segment) { s.T1 = s.T0 - 1 }},
		{"Segment.Beta0 = 1.1", func(s *phys.Segment) { s.Beta0 = 1.1 }},
		{"Segment.Beta1 = -0.1", func(s *phys.Segment) { s.Beta1 = -0.1 }},
		{"Segment.Beta1 = NaN", func(s *phys.Segment) { s.Beta1 = nan }},
	}
	rng := rand.New(rand.NewPCG(1, 2))
	dst := make([]Photon, 3)
	for _, c := range cases {
		seg := step(1, 1, 1, 1)
		c.mod(&seg)
		out, err := e.Emit(seg, rng, dst)
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%s: err = %v", c.msg, err)
		}
		if len(out) != 3 {
			t.Errorf("%s: dst changed to %d photons", c.msg, len(out))
		}
		if _, err := e.MeanPhotons(seg); err == nil {
			t.Errorf("%s: MeanPhotons gave no error", c.msg)
		}
	}
	// Valid but dark: below threshold, zero length, neutral.
	for _, seg := range []phys.Segment{step(1, 0.5, 0.6, 1), step(0, 1, 1, 1), step(1, 1, 1, 0)} {
		if out, err := e.Emit(seg, rng, nil); err != nil || len(out) != 0 {
			t.Errorf("dark segment %+v gave %d photons, %v", seg, len(out), err)
		}
	}
}

func TestEmitNoAllocation(t *testing.T) {
	w := testWater(t)
	e := testEmitter(t, w, 250, 700, 1)
	rng := rand.New(rand.NewPCG(1, 2))
	dst := make([]Photon, 0, 4096)
	seg := step(1, 1, 0.99, 1)
	allocs := testing.AllocsPerRun(50, func() {
		dst, _ = e.Emit(seg, rng, dst[:0])
	})
	if allocs != 0 {
		t.Errorf("Emit allocates %g times per call", allocs)
	}
}
