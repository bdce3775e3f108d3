package transport

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

func newPhysics(t testing.TB) *Physics {
	t.Helper()
	p, err := New(material.Water(), em.DefaultConfig(), muon.DefaultConfig())
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// recorder keeps what the tracker reports.
type recorder struct {
	segs    []phys.Segment
	secs    []phys.Particle
	deposit float64
}

func (r *recorder) Segment(s phys.Segment)                   { r.segs = append(r.segs, s) }
func (r *recorder) Secondary(p phys.Particle)                { r.secs = append(r.secs, p) }
func (r *recorder) Deposit(_ r3.Vector, _, e float64, _ int) { r.deposit += e }

func TestTrackBookkeeping(t *testing.T) {
	tr, err := NewTracker(newPhysics(t))
	if err != nil {
		t.Fatal(err)
	}
	vol := geom.DemoTank()
	up := r3.Vector{Z: 1}
	prims := []phys.Particle{
		{PDG: phys.Electron, Dir: up, Ekin: 50},
		{PDG: phys.MuonPlus, Pos: r3.Vector{X: 100}, Dir: r3.Vector{X: -1}, Ekin: 300},
		{PDG: phys.Gamma, Pos: r3.Vector{Y: 100}, Dir: up, Ekin: 20},
		{PDG: phys.ElectronNeu, Dir: up, Ekin: 500},
	}
	rng := rand.New(rand.NewPCG(1, 2))
	var rec recorder
	out, err := tr.Run(prims, vol, rng, &rec)
	if err != nil {
		t.Fatal(err)
	}
	if len(out) != len(prims) {
		t.Fatalf("%d primary records for %d primaries", len(out), len(prims))
	}
	// Every secondary has a fresh number and descends from a known track;
	// the per-primary descendant counts add up.
	seen := map[int]bool{1: true, 2: true, 3: true, 4: true}
	var desc [4]int
	for _, s := range rec.secs {
		if seen[s.Track] {
			t.Fatalf("track number %d used twice", s.Track)
		}
		if !seen[s.Parent] {
			t.Fatalf("secondary %d has unknown parent %d", s.Track, s.Parent)
		}
		seen[s.Track] = true
		p := tr.PrimaryOf(s.Track)
		if p != tr.PrimaryOf(s.Parent) {
			t.Fatalf("secondary %d attributed to primary %d, its parent to %d", s.Track, p, tr.PrimaryOf(s.Parent))
		}
		desc[p]++
	}
	var segs [4]int
	for _, s := range rec.segs {
		if !seen[s.Track] {
			t.Fatalf("segment of unknown track %d", s.Track)
		}
		segs[tr.PrimaryOf(s.Track)]++
	}
	for i, o := range out {
		if o.Descendants != desc[i] || o.Segments != segs[i] {
			t.Errorf("primary %d: record %d descendants %d segments, counted %d and %d", i, o.Descendants, o.Segments, desc[i], segs[i])
		}
	}
	if !out[3].Skipped || out[3].Segments != 0 || tr.Skipped() != 1 {
		t.Errorf("neutrino not skipped: %+v", out[3])
	}
	// The 300 MeV mu+ stops in the tank and decays (PDG: mu+ always
	// decays); its positron is among its descendants.
	if out[1].Fate != phys.StoppedDecayed || out[1].Decay.PDG != phys.Positron {
		t.Errorf("mu+ fate %v, decay %+v", out[1].Fate, out[1].Decay)
	}
	if out[0].TrackLength <= 0 || out[0].Range <= 0 || out[0].Range > out[0].TrackLength+1e-9 {
		t.Errorf("electron track length %g, range %g", out[0].TrackLength, out[0].Range)
	}
	// A second run reuses the tracker from a clean state.
	out2, err := tr.Run(prims[:1], vol, rng, &recorder{})
	if err != nil || len(out2) != 1 || out2[0].Particle.PDG != phys.Electron {
		t.Fatalf("second run: %v %+v", err, out2)
	}
}

func TestBadParticles(t *testing.T) {
	tr, err := NewTracker(newPhysics(t))
	if err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(3, 4))
	vol := geom.DemoTank()
	for _, c := range []struct {
		p    phys.Particle
		want string
	}{
		{phys.Particle{PDG: 99, Dir: r3.Vector{Z: 1}, Ekin: 1}, "99"},
		{phys.Particle{PDG: phys.Electron, Dir: r3.Vector{Z: 1}, Ekin: -1}, "-1"},
		{phys.Particle{PDG: phys.MuonMinus, Dir: r3.Vector{Z: 1}, Ekin: math.NaN()}, "NaN"},
		{phys.Particle{PDG: phys.MuonMinus, Pos: r3.Vector{X: 1e6}, Dir: r3.Vector{Z: 1}, Ekin: 10}, "volume"},
	} {
		_, err := tr.Run([]phys.Particle{c.p}, vol, rng, &recorder{})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("particle %+v: error %v, want it to mention %q", c.p, err, c.want)
		}
	}
	if _, err := NewTracker(nil); err == nil {
		t.Error("NewTracker(nil) accepted")
	}
}

// frankTamm is the Frank-Tamm yield per cm for unit charge at speed beta
// with the water's dispersion, by direct midpoint quadrature over the
// band (independent of the emitter's tables):
// dN/dx = 2 pi alpha int (1 - 1/(beta n)^2) / lambda^2 dlambda.
func frankTamm(w *optics.Water, lo, hi, beta float64) float64 {
	const steps = 4000
	h := (hi - lo) / steps
	var sum float64
	for i := 0; i < steps; i++ {
		l := lo + (float64(i)+0.5)*h
		n := w.Index(l)
		if f := 1 - 1/(beta*beta*n*n); f > 0 {
			sum += f / (l * l)
		}
	}
	return 2 * math.Pi * phys.FineStructure * sum * h * 1e7 // 1/nm -> 1/cm
}

func TestMuonLightFollowsFrankTamm(t *testing.T) {
	// A 1 GeV mu- emits on its own track the Frank-Tamm number of photons
	// per cm (Frank-Tamm formula with the IAPWS dispersion of the water),
	// and its light stops at the Cherenkov threshold: no own segment
	// starts below beta = 1/n_max, the last one ends at or below it.
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	const lo, hi = 300.0, 600.0
	emit, err := cherenkov.NewEmitter(w, lo, hi, 1)
	if err != nil {
		t.Fatal(err)
	}
	// Segments are reported down to the threshold of the band's largest
	// index, as the event simulator configures it.
	muCfg := muon.DefaultConfig()
	muCfg.ThresholdIndex = 1 / emit.Threshold()
	p, err := New(material.Water(), em.DefaultConfig(), muCfg)
	if err != nil {
		t.Fatal(err)
	}
	tr, err := NewTracker(p)
	if err != nil {
		t.Fatal(err)
	}
	vol := geom.LargeTank()
	rng := rand.New(rand.NewPCG(5, 6))
	var rec recorder
	mu := phys.Particle{PDG: phys.MuonMinus, Pos: r3.Vector{Z: -1000}, Dir: r3.Vector{Z: 1}, Ekin: 1000}
	if _, err := tr.Run([]phys.Particle{mu}, vol, rng, &rec); err != nil {
		t.Fatal(err)
	}
	var photons []cherenkov.Photon
	var counted, expected float64
	betaMin := 1.0
	last := phys.Segment{}
	nmax := emit.Threshold()
	for _, s := range rec.segs {
		if s.Track != 1 {
			continue
		}
		if s.Beta0 < nmax {
			t.Fatalf("own segment starts below threshold: beta %g < %g", s.Beta0, nmax)
		}
		last = s
		betaMin = math.Min(betaMin, s.Beta1)
		photons, err = emit.Emit(s, rng, photons[:0])
		if err != nil {
			t.Fatal(err)
		}
		counted += float64(len(photons))
		expected += s.Length() * frankTamm(w, lo, hi, (s.Beta0+s.Beta1)/2)
	}
	if last.Beta1 > nmax+1e-3 {
		t.Errorf("last own segment ends at beta %g, threshold %g", last.Beta1, nmax)
	}
	// Poisson count; the mid-point beta of each segment differs from the
	// exact average of the yield by far less than 1e-3 for 1% steps.
	if d := math.Abs(counted - expected); d > 5*math.Sqrt(expected)+1e-3*expected {
		t.Errorf("own-track photons %g, Frank-Tamm expects %g", counted, expected)
	}
	if expected < 1e5 {
		t.Errorf("only %g photons expected from a 1 GeV muon", expected)
	}
}

func TestMuonVisibleLengthVsRange(t *testing.T) {
	// A stopping muon shines from its start until it falls below the
	// Cherenkov threshold, so its visible track length is the CSDA range
	// at its start energy minus the CSDA range at the threshold energy
	// (ranges from the muon tables checked against Groom, Mokhov and
	// Striganov 2001 in sim/muon). Range straggling of a few percent
	// (Bohr) makes the mean of n muons scatter by sigma/sqrt(n).
	const n1 = 1.34
	muCfg := muon.DefaultConfig()
	muCfg.ThresholdIndex = n1
	p, err := New(material.Water(), em.DefaultConfig(), muCfg)
	if err != nil {
		t.Fatal(err)
	}
	tr, err := NewTracker(p)
	if err != nil {
		t.Fatal(err)
	}
	tth, err := cherenkov.ThresholdKinetic(phys.MuonMass, n1)
	if err != nil {
		t.Fatal(err)
	}
	const ekin = 500.0
	r0, _ := p.Muon.CSDARange(ekin)
	r1, _ := p.Muon.CSDARange(tth)
	want := (r0 - r1) / material.Water().Density
	rng := rand.New(rand.NewPCG(7, 8))
	vol := geom.LargeTank()
	const n = 40
	lengths := make([]float64, n)
	for i := range lengths {
		var rec recorder
		out, err := tr.Run([]phys.Particle{{PDG: phys.MuonPlus, Dir: r3.Vector{X: 1}, Ekin: ekin}}, vol, rng, &rec)
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range rec.segs {
			if s.Track == 1 {
				lengths[i] += s.Length()
			}
		}
		if lengths[i] > out[0].TrackLength+1e-9 {
			t.Fatalf("visible length %g above the track length %g", lengths[i], out[0].TrackLength)
		}
	}
	var mean, sd float64
	for _, l := range lengths {
		mean += l / n
	}
	for _, l := range lengths {
		sd += (l - mean) * (l - mean) / (n - 1)
	}
	sd = math.Sqrt(sd)
	// Segment lengths are chords of multiply-scattered steps, shorter than
	// the path by a fraction of order theta0^2 per step (< 1e-3 here).
	if math.Abs(mean-want) > 5*sd/math.Sqrt(n)+2e-3*want {
		t.Errorf("visible track length %.2f +- %.2f cm, CSDA expects %.2f cm", mean, sd/math.Sqrt(n), want)
	}
}

// meanLight sums the expected Cherenkov photons of every segment.
type meanLight struct {
	em    *cherenkov.Emitter
	total float64
}

func (m *meanLight) Segment(s phys.Segment) {
	n, _ := m.em.MeanPhotons(s)
	m.total += n
}
func (m *meanLight) Secondary(phys.Particle)                  {}
func (m *meanLight) Deposit(r3.Vector, float64, float64, int) {}

func TestMuonLightStepAndCutIndependence(t *testing.T) {
	// The expected Cherenkov light of a 1 GeV muon and all its descendants
	// must not depend on the step limits, and only slightly on the delta-ray
	// cut: delta rays between 0.3 and 1 MeV shine for a few mm at most, a
	// fraction of a percent of the muon's own light (stated tolerance 1.5%;
	// step limits 1%), each plus 4 standard errors of the difference of
	// means.
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	emit, err := cherenkov.NewEmitter(w, 300, 600, 1)
	if err != nil {
		t.Fatal(err)
	}
	light := func(cfg muon.Config, seed uint64) (mean, se float64) {
		p, err := New(material.Water(), em.DefaultConfig(), cfg)
		if err != nil {
			t.Fatal(err)
		}
		tr, err := NewTracker(p)
		if err != nil {
			t.Fatal(err)
		}
		rng := rand.New(rand.NewPCG(seed, 9))
		const n = 16
		vals := make([]float64, n)
		for i := range vals {
			sink := &meanLight{em: emit}
			if _, err := tr.Run([]phys.Particle{{PDG: phys.MuonMinus, Dir: r3.Vector{Z: 1}, Pos: r3.Vector{Z: -1200}, Ekin: 1000}}, geom.LargeTank(), rng, sink); err != nil {
				t.Fatal(err)
			}
			vals[i] = sink.total
			mean += sink.total / n
		}
		var v float64
		for _, x := range vals {
			v += (x - mean) * (x - mean) / (n - 1)
		}
		return mean, math.Sqrt(v / n)
	}
	base := muon.DefaultConfig()
	fine := base
	fine.MaxFracLoss, fine.MaxStep = 0.003, 1
	lowCut := base
	lowCut.DeltaCut = 0.3
	m0, s0 := light(base, 1)
	for _, c := range []struct {
		name string
		cfg  muon.Config
		tol  float64
	}{{"fine steps", fine, 0.01}, {"delta cut 0.3 MeV", lowCut, 0.015}} {
		m, s := light(c.cfg, 2)
		if d := math.Abs(m/m0 - 1); d > c.tol+4*math.Hypot(s/m, s0/m0) {
			t.Errorf("%s: light %.0f +- %.0f, default %.0f +- %.0f (%.2f%%)", c.name, m, s, m0, s0, 100*(m/m0-1))
		}
	}
}

func TestDecayChains(t *testing.T) {
	// The stack follows what the hadron and neutron codes make: a pi+ at
	// rest gives a mu+ (4.12 MeV) that stops and gives a positron; a pi0
	// gives two photons (or a Dalitz pair and a photon) that shower; a
	// thermal neutron is captured and its 2.2 MeV gamma (or 4.1 MeV on
	// oxygen) is followed. Fates and descendants of the primaries.
	tr, err := NewTracker(newPhysics(t))
	if err != nil {
		t.Fatal(err)
	}
	vol := geom.DemoTank()
	up := r3.Vector{Z: 1}
	rng := rand.New(rand.NewPCG(71, 72))
	for _, c := range []struct {
		p     phys.Particle
		fate  phys.Fate
		codes []int // codes that must appear among the descendants
	}{
		{phys.Particle{PDG: phys.PionPlusCode, Dir: up}, phys.StoppedDecayed, []int{phys.MuonPlus, phys.Positron}},
		{phys.Particle{PDG: phys.NeutralPionCode, Dir: up, Ekin: 100}, phys.DecayedInFlight, []int{phys.Gamma, phys.Electron}},
		{phys.Particle{PDG: phys.NeutronCode, Dir: up, Ekin: 0}, phys.Captured, []int{phys.Gamma, phys.Electron}},
	} {
		var rec recorder
		out, err := tr.Run([]phys.Particle{c.p}, vol, rng, &rec)
		if err != nil {
			t.Fatal(err)
		}
		if out[0].Fate != c.fate {
			t.Errorf("PDG %d: fate %v, want %v", c.p.PDG, out[0].Fate, c.fate)
		}
		seen := map[int]bool{}
		for _, s := range rec.secs {
			seen[s.PDG] = true
		}
		for _, code := range c.codes {
			if !seen[code] {
				t.Errorf("PDG %d: no descendant of PDG %d among %d", c.p.PDG, code, len(rec.secs))
			}
		}
		if out[0].Descendants != len(rec.secs) {
			t.Errorf("PDG %d: %d descendants counted, %d reported", c.p.PDG, out[0].Descendants, len(rec.secs))
		}
	}
}
