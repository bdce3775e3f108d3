package em

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

func TestThresholds(t *testing.T) {
	// Cherenkov threshold: beta(T) = 1/n for the returned T (phys.Beta is
	// an independent evaluation); Compton edge: 2k^2/(m+2k) = T at the
	// returned k (two-body kinematics, backscattering).
	for _, n := range []float64{1.33, 1.34, 1.5} {
		c, err := ConfigForIndex(n)
		if err != nil {
			t.Fatal(err)
		}
		tc := c.ChargedCut
		if b := phys.Beta(tc, phys.ElectronMass); math.Abs(b*n-1) > 1e-12 {
			t.Errorf("n=%g: beta at threshold %g, want %g", n, b, 1/n)
		}
		k := ComptonThreshold(tc)
		if edge := 2 * k * k / (phys.ElectronMass + 2*k); relDiff(edge, tc) > 1e-12 {
			t.Errorf("Compton edge of %g MeV = %g, want %g", k, edge, tc)
		}
	}
	// The numbers quoted in the documentation: 0.2567 and 0.4148 MeV.
	c := DefaultConfig()
	if math.Abs(c.ChargedCut-0.2567) > 1e-4 || math.Abs(c.PhotonCut-0.4148) > 1e-4 {
		t.Errorf("default cuts %g, %g MeV", c.ChargedCut, c.PhotonCut)
	}
	if _, err := ConfigForIndex(0.9); err == nil {
		t.Error("ConfigForIndex(0.9) gave no error")
	}
}

func TestValidation(t *testing.T) {
	p := newPhysics(t, DefaultConfig())
	rng := rand.New(rand.NewPCG(1, 1))
	good := primary(phys.Electron, 10)
	mod := func(f func(*phys.Particle)) phys.Particle { q := good; f(&q); return q }
	cases := []struct {
		name string
		part phys.Particle
		vol  phys.Volume
		want string
	}{
		{"muon", mod(func(q *phys.Particle) { q.PDG = phys.MuonMinus }), everywhere{}, "PDG = 13"},
		{"negative", mod(func(q *phys.Particle) { q.Ekin = -1 }), everywhere{}, "Ekin = -1"},
		{"NaN", mod(func(q *phys.Particle) { q.Ekin = math.NaN() }), everywhere{}, "Ekin = NaN"},
		{"too high", mod(func(q *phys.Particle) { q.Ekin = 2e5 }), everywhere{}, "Ekin = 200000"},
		{"direction", mod(func(q *phys.Particle) { q.Dir = r3.Vector{X: 1, Z: 1} }), everywhere{}, "Dir"},
		{"position", mod(func(q *phys.Particle) { q.Pos.X = math.Inf(1) }), everywhere{}, "Pos"},
		{"time", mod(func(q *phys.Particle) { q.Time = math.NaN() }), everywhere{}, "Time"},
		{"outside", mod(func(q *phys.Particle) { q.Pos.X = 10 }), ball{R: 5}, "outside"},
		{"nil volume", good, nil, "Volume"},
	}
	for _, c := range cases {
		for _, f := range []func(phys.Particle, phys.Volume, *rand.Rand, phys.Sink) error{p.Track, p.Shower} {
			err := f(c.part, c.vol, rng, &tally{})
			if err == nil || !strings.Contains(err.Error(), c.want) {
				t.Errorf("%s: error %v, want one mentioning %q", c.name, err, c.want)
			}
		}
	}
	if err := p.Track(good, everywhere{}, nil, &tally{}); err == nil {
		t.Error("nil rng accepted")
	}
	if err := p.Track(good, everywhere{}, rng, nil); err == nil {
		t.Error("nil sink accepted")
	}
	for _, f := range []func() error{
		func() error { _, err := p.CollisionStoppingPower(13, 1); return err },
		func() error { _, err := p.CSDARange(11, -1); return err },
		func() error { _, err := p.RadiativeStoppingPower(math.NaN()); return err },
		func() error { _, err := p.TotalAttenuation(1e6); return err },
		func() error { _, err := p.RestrictedCollisionStoppingPower(11, 1, 0); return err },
	} {
		if f() == nil {
			t.Error("bad argument accepted")
		}
	}
}

func TestConfigValidation(t *testing.T) {
	bad := []struct {
		f    func(*Config)
		want string
	}{
		{func(c *Config) { c.RefractiveIndex = 1 }, "RefractiveIndex"},
		{func(c *Config) { c.ChargedCut = 0.001 }, "ChargedCut"},
		{func(c *Config) { c.DeltaCut = math.NaN() }, "DeltaCut"},
		{func(c *Config) { c.BremsCut = -1 }, "BremsCut"},
		{func(c *Config) { c.PhotonCut = math.Inf(1) }, "PhotonCut"},
		{func(c *Config) { c.MaxStep = 0 }, "MaxStep"},
		{func(c *Config) { c.MaxEnergyLossFraction = 0.5 }, "MaxEnergyLossFraction"},
	}
	for _, b := range bad {
		c := DefaultConfig()
		b.f(&c)
		if _, err := New(material.Water(), c); err == nil || !strings.Contains(err.Error(), b.want) {
			t.Errorf("error %v, want one naming %s", err, b.want)
		}
	}
	m := material.Water()
	m.Density = -1
	if _, err := New(m, DefaultConfig()); err == nil || !strings.Contains(err.Error(), "Density") {
		t.Errorf("bad medium: %v", err)
	}
}

func TestEnergyConservation(t *testing.T) {
	// In an unbounded medium everything ends as deposits: the kinetic
	// energy of the primary, plus 2m for a positron primary (each pair's
	// 2m is returned when its positron annihilates). Exact up to rounding.
	p := newPhysics(t, DefaultConfig())
	rng := rand.New(rand.NewPCG(2, 3))
	for _, pdg := range []int{phys.Electron, phys.Positron, phys.Gamma} {
		for _, e := range []float64{0.3, 5, 300} {
			s := &tally{n: 1.34}
			if err := p.Shower(primary(pdg, e), everywhere{}, rng, s); err != nil {
				t.Fatal(err)
			}
			want := e
			if pdg == phys.Positron {
				want += 2 * phys.ElectronMass
			}
			if math.Abs(s.dep-want) > 1e-9*want {
				t.Errorf("PDG %d, %g MeV: deposits %.12g, want %.12g", pdg, e, s.dep, want)
			}
			if s.badTime > 0 {
				t.Errorf("PDG %d: %d segments with T1 < T0", pdg, s.badTime)
			}
		}
	}
}

// chainSink checks, for the primary track, that consecutive segments
// join in space and time and that the speed only falls.
type chainSink struct {
	t                *testing.T
	betaTh           float64
	last             phys.Segment
	have             bool
	n                int
	dep, secondaries float64
	parentBad        int
}

func (c *chainSink) Segment(s phys.Segment) {
	c.n++
	if s.Track != 1 {
		c.t.Fatalf("segment of track %d from Track of track 1", s.Track)
	}
	if !(s.Beta0 > c.betaTh) || s.Beta1 > s.Beta0 {
		c.t.Errorf("segment speeds %g -> %g (threshold %g)", s.Beta0, s.Beta1, c.betaTh)
	}
	if want := flightTime(s.Length(), s.Beta0, s.Beta1); math.Abs(s.T1-s.T0-want) > 1e-9*want+1e-12 {
		c.t.Errorf("segment time %g, length/speed gives %g", s.T1-s.T0, want)
	}
	if c.have {
		if s.Start.Sub(c.last.End).Norm() > 1e-12 || math.Abs(s.T0-c.last.T1) > 1e-12 {
			c.t.Errorf("segments do not join: %v@%g then %v@%g", c.last.End, c.last.T1, s.Start, s.T0)
		}
		if s.Beta0 > c.last.Beta1+1e-15 {
			c.t.Errorf("speed rose between steps: %g -> %g", c.last.Beta1, s.Beta0)
		}
	}
	c.last, c.have = s, true
}

func (c *chainSink) Secondary(q phys.Particle) {
	if q.Parent != 1 || q.Track != 0 {
		c.parentBad++
	}
	c.secondaries += q.Ekin
}

func (c *chainSink) Deposit(_ r3.Vector, _, e float64, _ int) { c.dep += e }

func TestTrackBookkeeping(t *testing.T) {
	// One Track call: the primary's segments form a continuous chain,
	// secondaries carry Parent = 1 and no track number, and deposits plus
	// secondary kinetic energies add up to the primary's energy (an e-
	// primary makes no positrons by itself, so no rest mass appears).
	p := newPhysics(t, DefaultConfig())
	rng := rand.New(rand.NewPCG(4, 5))
	for range 20 {
		c := &chainSink{t: t, betaTh: 1 / 1.34}
		if err := p.Track(primary(phys.Electron, 200), everywhere{}, rng, c); err != nil {
			t.Fatal(err)
		}
		if math.Abs(c.dep+c.secondaries-200) > 1e-9 {
			t.Errorf("deposits %g + secondaries %g != 200 MeV", c.dep, c.secondaries)
		}
		if c.parentBad > 0 || c.n == 0 {
			t.Errorf("%d secondaries with wrong numbering, %d segments", c.parentBad, c.n)
		}
	}
}

// boundSink records the largest distance from the origin of any segment
// end or deposit.
type boundSink struct{ rmax, dep float64 }

func (b *boundSink) Segment(s phys.Segment) {
	b.rmax = math.Max(b.rmax, math.Max(s.Start.Norm(), s.End.Norm()))
}
func (b *boundSink) Secondary(phys.Particle) {}
func (b *boundSink) Deposit(pos r3.Vector, _, e float64, _ int) {
	b.rmax = math.Max(b.rmax, pos.Norm())
	b.dep += e
}

func TestLeavesVolume(t *testing.T) {
	// A 1 GeV shower started at the centre of a 10 cm ball: nothing is
	// reported beyond the surface (bisection to 1e-6 of a step), and most
	// of the energy escapes (the ball is 0.28 X0 in radius).
	p := newPhysics(t, DefaultConfig())
	rng := rand.New(rand.NewPCG(6, 7))
	b := &boundSink{}
	if err := p.Shower(primary(phys.Electron, 1000), ball{R: 10}, rng, b); err != nil {
		t.Fatal(err)
	}
	if b.rmax > 10 {
		t.Errorf("reported point at r = %g beyond the 10 cm ball", b.rmax)
	}
	if b.dep > 200 || b.dep < 5 {
		t.Errorf("deposit in the ball %g MeV of 1000", b.dep)
	}
}

// visibleLight runs n showers and returns the mean and standard error of
// the Cherenkov-weighted track length (cm).
func visibleLight(t testing.TB, p *Physics, pdg int, e float64, n int, seed uint64) (mean, se float64) {
	rng := rand.New(rand.NewPCG(seed, 99))
	var s1, s2 float64
	for range n {
		s := &tally{n: p.cfg.RefractiveIndex}
		if err := p.Shower(primary(pdg, e), everywhere{}, rng, s); err != nil {
			t.Fatal(err)
		}
		s1 += s.light
		s2 += s.light * s.light
	}
	mean = s1 / float64(n)
	return mean, math.Sqrt((s2/float64(n) - mean*mean) / float64(n))
}

func TestStepAndCutIndependence(t *testing.T) {
	// Cherenkov-weighted track length of 100 MeV electrons. Step limits:
	// the default (1 cm, 3%), fine (0.3 cm, 1%) and coarse (3 cm, 10%)
	// must agree within 1% + 4 standard errors (the mid-step energy loss
	// and the majorant method are exact to O(fraction^2); 1% allows for
	// the Highland log term, which is not additive over steps). Cuts: the
	// default (delta 0.257, brems 0.415 MeV) against 1 MeV for both must
	// agree within 2% + 4 standard errors: delta rays between 0.26 and
	// 1 MeV radiate a little themselves, about 1% of the light (estimate
	// from the Moller spectrum 0.085/W^2 per cm and their short visible
	// range), which the coarse cut puts into continuous loss.
	n := scaled(300)
	base := newPhysics(t, DefaultConfig())
	m0, s0 := visibleLight(t, base, phys.Electron, 100, n, 1)
	variants := []struct {
		name string
		f    func(*Config)
		tol  float64
	}{
		{"fine steps", func(c *Config) { c.MaxStep, c.MaxEnergyLossFraction = 0.3, 0.01 }, 0.01},
		{"coarse steps", func(c *Config) { c.MaxStep, c.MaxEnergyLossFraction = 3, 0.1 }, 0.01},
		{"1 MeV cuts", func(c *Config) { c.DeltaCut, c.BremsCut = 1, 1 }, 0.02},
	}
	for _, v := range variants {
		cfg := DefaultConfig()
		v.f(&cfg)
		m1, s1 := visibleLight(t, newPhysics(t, cfg), phys.Electron, 100, n, 2)
		lim := v.tol*m0 + 4*math.Hypot(s0, s1)
		if math.Abs(m1-m0) > lim {
			t.Errorf("%s: light %.3f +- %.3f cm, default %.3f +- %.3f (limit %.3f)", v.name, m1, s1, m0, s0, lim)
		}
		t.Logf("%s: %.3f +- %.3f vs %.3f +- %.3f", v.name, m1, s1, m0, s0)
	}
}

// discard is a sink that keeps nothing.
type discard struct{ n int }

func (d *discard) Segment(phys.Segment)                     { d.n++ }
func (d *discard) Secondary(phys.Particle)                  { d.n++ }
func (d *discard) Deposit(r3.Vector, float64, float64, int) { d.n++ }

func TestTrackDoesNotAllocate(t *testing.T) {
	p := newPhysics(t, DefaultConfig())
	rng := rand.New(rand.NewPCG(8, 9))
	sink := &discard{}
	for _, pdg := range []int{phys.Electron, phys.Positron, phys.Gamma} {
		part := primary(pdg, 500)
		allocs := testing.AllocsPerRun(50, func() {
			if err := p.Track(part, everywhere{}, rng, sink); err != nil {
				t.Fatal(err)
			}
		})
		if allocs != 0 {
			t.Errorf("Track of PDG %d allocates %g times per call", pdg, allocs)
		}
	}
}

func TestConcurrentShowersAreReproducible(t *testing.T) {
	// One Physics shared by goroutines: each shower depends only on its own
	// random stream, so results equal a sequential run with the same seeds.
	p := newPhysics(t, DefaultConfig())
	run := func(seed uint64) float64 {
		s := &tally{n: 1.34}
		if err := p.Shower(primary(phys.Gamma, 200), everywhere{}, rand.New(rand.NewPCG(seed, 1)), s); err != nil {
			t.Error(err)
		}
		return s.light
	}
	const n = 8
	var want [n]float64
	for i := range n {
		want[i] = run(uint64(i))
	}
	var got [n]float64
	done := make(chan struct{})
	for i := range n {
		go func() { got[i] = run(uint64(i)); done <- struct{}{} }()
	}
	for range n {
		<-done
	}
	if got != want {
		t.Errorf("concurrent results %v differ from sequential %v", got, want)
	}
}
