package hadron

import (
	"math"
	"math/rand/v2"
	"sort"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/heavy"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
)

// The test volumes and sinks are those of phystest.
type (
	ball       = phystest.Ball
	slab       = phystest.Slab
	recordSink = phystest.RecordSink
)

func newPhysics(t testing.TB, cfg heavy.Config) *Physics {
	t.Helper()
	p, err := New(material.Water(), cfg)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func newRNG(a, b uint64) *rand.Rand { return rand.New(rand.NewPCG(a, b)) }

func along(pdg int, ekin float64) phys.Particle {
	return phys.Particle{PDG: pdg, Dir: r3.Vector{Z: 1}, Ekin: ekin, Track: 1}
}

func TestPionRangeScaledFromMuon(t *testing.T) {
	// The Bethe formula depends on the particle only through beta gamma
	// (up to the small m_e/M term of W_max and the muon's radiative
	// losses), so R/M is a function of beta gamma alone (PDG Review,
	// "Passage of particles through matter"): the pion's CSDA range at the
	// muon's beta gamma is the muon's times m_pi/m_mu. Muon CSDA ranges in
	// liquid water from the muon table made with the PDG's water
	// parameters (PUMAS table dedx/muon/water_liquid.txt of
	// niess/pumas-materials, looked up): 31.23, 129.1 and 473.2 g/cm2 at
	// 100, 300 and 1000 MeV. That table uses I = 79.7 eV, conelight 75.0
	// eV (see material.Water), which shortens ranges by about 1%. Within
	// 2%.
	p := newPhysics(t, heavy.Config{})
	for _, c := range []struct{ tMu, rMu float64 }{{100, 31.23}, {300, 129.1}, {1000, 473.2}} {
		tPi := c.tMu * phys.PionMass / phys.MuonMass
		r, err := p.Pion(false).CSDARange(tPi)
		if err != nil {
			t.Fatal(err)
		}
		want := c.rMu * phys.PionMass / phys.MuonMass
		if math.Abs(r/want-1) > 0.02 {
			t.Errorf("pion CSDA range at %.1f MeV: %.2f g/cm2, scaled muon table %.2f", tPi, r, want)
		}
	}
}

func TestProtonRangePSTAR(t *testing.T) {
	// NIST PSTAR, liquid water, CSDA range (g/cm2), looked up: 10 MeV
	// 0.1230, 20 MeV 0.4260, 50 MeV 2.227, 100 MeV 7.718, 200 MeV 25.96,
	// 500 MeV 117.0, 1 GeV 325.4, 2 GeV 805.4. Within 2% (the issue's
	// target from 10 MeV to 2 GeV).
	p := newPhysics(t, heavy.Config{})
	for _, c := range []struct{ t, r float64 }{
		{10, 0.1230}, {20, 0.4260}, {50, 2.227}, {100, 7.718}, {200, 25.96}, {500, 117.0}, {1000, 325.4}, {2000, 805.4},
	} {
		r, err := p.Proton().CSDARange(c.t)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r/c.r-1) > 0.02 {
			t.Errorf("proton CSDA range at %g MeV: %.4g g/cm2, PSTAR %.4g", c.t, r, c.r)
		}
	}
}

func TestPiPlusDecayAtRest(t *testing.T) {
	// A pi+ at rest decays to mu+ nu: two-body kinematics with PDG masses
	// give p = (m_pi^2 - m_mu^2)/(2 m_pi) = 29.79 MeV/c and T_mu = 4.12
	// MeV; mean time to decay the PDG mean life 26.033 ns (standard error
	// tau/sqrt(n), 5 allowed).
	p := newPhysics(t, heavy.Config{})
	rng := newRNG(1, 2)
	const n = 20000
	pmu := (phys.PionMass*phys.PionMass - phys.MuonMass*phys.MuonMass) / (2 * phys.PionMass)
	tmu := math.Hypot(pmu, phys.MuonMass) - phys.MuonMass
	if math.Abs(tmu-4.12) > 0.005 {
		t.Fatalf("two-body muon energy %g, want 4.12 MeV", tmu)
	}
	var sum float64
	var electrons int
	for i := 0; i < n; i++ {
		var s recordSink
		tr, err := p.TrackPion(along(phys.PionPlusCode, 0), ball{R: 10}, rng, &s)
		if err != nil {
			t.Fatal(err)
		}
		if tr.Fate != phys.StoppedDecayed || len(s.Secs) != 1 {
			t.Fatalf("pi+ at rest: fate %v, %d products", tr.Fate, len(s.Secs))
		}
		mu := s.Secs[0]
		switch mu.PDG {
		case phys.MuonPlus:
			if math.Abs(mu.Ekin-tmu) > 1e-9 {
				t.Fatalf("muon from decay at rest %.9g MeV, want %.9g", mu.Ekin, tmu)
			}
		case phys.Positron:
			electrons++
		default:
			t.Fatalf("decay product %+v", mu)
		}
		sum += tr.DecayTime
	}
	if m := sum / n; math.Abs(m-phys.PionLifetime) > 5*phys.PionLifetime/math.Sqrt(n) {
		t.Errorf("mean decay time %.3f ns, PDG %.3f", m, phys.PionLifetime)
	}
	if electrons > 15 { // Poisson mean 2.5 for the PDG 1.23e-4
		t.Errorf("%d pi -> e nu decays in %d, PDG branching 1.23e-4", electrons, n)
	}
}

func TestPiMinusCapturedAtRest(t *testing.T) {
	// A stopped pi- is absorbed by oxygen: no decay, two neutrons sharing
	// m_pi less two removal energies and the Fermi motion (model values
	// of this package): their summed kinetic energy is near 139.6 - 54 +
	// 2 <T_F> ~ 110 MeV; checked to lie in 60-140 MeV.
	p := newPhysics(t, heavy.Config{})
	rng := newRNG(3, 4)
	for i := 0; i < 200; i++ {
		var s recordSink
		tr, err := p.TrackPion(along(phys.PionMinusCode, 0), ball{R: 10}, rng, &s)
		if err != nil {
			t.Fatal(err)
		}
		if tr.Fate != phys.StoppedCaptured || tr.Channel != Absorption || len(s.Secs) != 2 {
			t.Fatalf("pi- at rest: fate %v, channel %v, %d products", tr.Fate, tr.Channel, len(s.Secs))
		}
		sum := 0.0
		for _, q := range s.Secs {
			if q.PDG != phys.NeutronCode {
				t.Fatalf("product %+v", q)
			}
			sum += q.Ekin
		}
		if sum < 60 || sum > 140 {
			t.Errorf("neutrons share %.1f MeV", sum)
		}
	}
}

func TestFreePiProtonPeak(t *testing.T) {
	// PDG Review, pi+ p total cross-section: about 200 mb at the Delta
	// peak near T = 190 MeV (from memory); pi- p about a third of it. The
	// model within 10%.
	el, _ := piProton(190, false)
	if math.Abs(el/200-1) > 0.1 {
		t.Errorf("pi+ p at 190 MeV: %.0f mb, PDG ~200", el)
	}
	elm, cxm := piProton(190, true)
	if r := (elm + cxm) / el; r < 0.3 || r > 0.45 {
		t.Errorf("pi- p / pi+ p at 190 MeV = %.2f, want ~1/3", r)
	}
}

func TestPionInteractionLengthAndChannels(t *testing.T) {
	// Pions through a 2 cm slab (energy loss ~4 MeV): the fraction that
	// interacts against 1 - exp(-Sigma x) with Sigma at the mid-slab
	// energy, and the channels of the interactions on oxygen against the
	// fractions of the pi-16O table (after Ashery et al., Phys. Rev. C 23
	// (1981) 2173, values from memory): binomial, 5 standard errors plus
	// 2% of the value for the energy change across the slab.
	p := newPhysics(t, heavy.Config{NoScattering: true})
	const n, thick = 40000, 2.0
	for i, ekin := range []float64{100, 165, 245} {
		rng := newRNG(5, uint64(i))
		var interacted int
		var onO [numChannels]int
		var nO int
		for j := 0; j < n; j++ {
			var s recordSink
			tr, err := p.TrackPion(along(phys.PionPlusCode, ekin), slab{Thick: thick}, rng, &s)
			if err != nil {
				t.Fatal(err)
			}
			if tr.Fate != phys.Interacted && tr.Fate != phys.Absorbed {
				continue
			}
			if (tr.Fate == phys.Absorbed) != (tr.Channel == Absorption) {
				t.Fatalf("fate %v for channel %v", tr.Fate, tr.Channel)
			}
			interacted++
			if tr.Target == 8 {
				onO[tr.Channel]++
				nO++
			}
			checkProducts(t, tr.Channel, s.Secs)
		}
		sPiO, _ := p.Pion(false).StoppingPower(ekin)
		mid := ekin - sPiO*thick/2
		sig := p.pionSigma(mid, false)
		want := 1 - math.Exp(-sig*thick)
		got := float64(interacted) / n
		if math.Abs(got-want) > 5*math.Sqrt(want*(1-want)/n)+0.02*want {
			t.Errorf("T=%g: interaction probability over %g cm %.4f, want %.4f (lambda %.1f cm)", ekin, thick, got, want, 1/sig)
		}
		o := PionOxygen(mid)
		tot := o[Elastic] + o[QuasiElastic] + o[ChargeExchange] + o[Absorption]
		for _, c := range []Channel{Absorption, ChargeExchange, QuasiElastic} {
			f := float64(onO[c]) / float64(nO)
			w := o[c] / tot
			if math.Abs(f-w) > 5*math.Sqrt(w*(1-w)/float64(nO))+0.02*w {
				t.Errorf("T=%g: %v fraction on oxygen %.3f, table %.3f", ekin, c, f, w)
			}
		}
	}
}

// checkProducts checks the particle content of one interaction.
func checkProducts(t *testing.T, c Channel, secs []phys.Particle) {
	t.Helper()
	var pions, pi0, nucleons int
	for _, s := range secs {
		switch s.PDG {
		case phys.PionPlusCode, phys.PionMinusCode:
			pions++
		case phys.NeutralPionCode:
			pi0++
		case phys.ProtonCode, phys.NeutronCode:
			nucleons++
		}
	}
	switch c {
	case Absorption:
		if pions+pi0 != 0 || nucleons != 2 {
			t.Fatalf("absorption made %d pions, %d pi0, %d nucleons", pions, pi0, nucleons)
		}
	case ChargeExchange:
		if pi0 != 1 || pions != 0 {
			t.Fatalf("charge exchange made %d pions, %d pi0", pions, pi0)
		}
	case QuasiElastic, Elastic:
		if pions != 1 || pi0 != 0 {
			t.Fatalf("%v made %d pions, %d pi0", c, pions, pi0)
		}
	}
}

func TestPionInteractionLengthHighEnergy(t *testing.T) {
	// PDG atomic and nuclear properties, water: pion interaction length
	// about 115 g/cm2 (from memory; the soft-tissue page gives 114.9
	// g/cm2). The model's inelastic (non-elastic) length at 5 GeV within
	// 10%.
	p := newPhysics(t, heavy.Config{})
	x := p.PionCrossSections(5000, false)
	inel := x[QuasiElastic] + x[ChargeExchange] + x[Absorption]
	if l := 1 / inel; math.Abs(l/115-1) > 0.1 {
		t.Errorf("pion inelastic length %.1f cm, PDG ~115", l)
	}
}

func TestPiZeroDecay(t *testing.T) {
	// pi0 -> gamma gamma of a 500 MeV pi0: the photon energy fraction is
	// uniform on [(1-beta)/2, (1+beta)/2] (isotropic two-body decay,
	// analytic), KS test at alpha = 1e-4; each pair has invariant mass
	// m_pi0 (2 E1 E2 (1 - cos theta) = m^2, which fixes the opening angle
	// for each energy sharing). The Dalitz fraction against the PDG 1.174%
	// (5 binomial standard errors); Dalitz products have the pi0's energy.
	rng := newRNG(7, 8)
	const n, ekin = 40000, 500.0
	e := ekin + phys.PionZeroMass
	beta := phys.Beta(ekin, phys.PionZeroMass)
	var xs []float64
	var dalitz int
	for i := 0; i < n; i++ {
		var s recordSink
		_, dz := DecayPiZero(along(phys.NeutralPionCode, ekin), rng, &s)
		sum := 0.0
		for _, q := range s.Secs {
			sum += q.Ekin
			if q.PDG == phys.Electron || q.PDG == phys.Positron {
				sum += phys.ElectronMass
			}
		}
		if math.Abs(sum-e) > 1e-6*e {
			t.Fatalf("products carry %.6f MeV, pi0 %.6f", sum, e)
		}
		if dz {
			dalitz++
			continue
		}
		a, b := s.Secs[0], s.Secs[1]
		m2 := 2 * a.Ekin * b.Ekin * (1 - a.Dir.Dot(b.Dir))
		if math.Abs(math.Sqrt(m2)/phys.PionZeroMass-1) > 1e-6 {
			t.Fatalf("photon pair mass %.6f", math.Sqrt(m2))
		}
		xs = append(xs, a.Ekin/e)
	}
	sort.Float64s(xs)
	lo := (1 - beta) / 2
	cdf := func(x float64) float64 { return math.Min(1, math.Max(0, (x-lo)/beta)) }
	var d float64
	for i, x := range xs {
		d = math.Max(d, math.Max(math.Abs(float64(i+1)/float64(len(xs))-cdf(x)), math.Abs(float64(i)/float64(len(xs))-cdf(x))))
	}
	// KS critical value at alpha = 1e-4: sqrt(-ln(alpha/2)/2)/sqrt(n).
	if crit := math.Sqrt(-math.Log(0.5e-4)/2) / math.Sqrt(float64(len(xs))); d > crit {
		t.Errorf("photon energy sharing: KS D = %.4f above %.4f", d, crit)
	}
	f := float64(dalitz) / n
	if math.Abs(f-DalitzFraction) > 5*math.Sqrt(DalitzFraction*(1-DalitzFraction)/n) {
		t.Errorf("Dalitz fraction %.4f, PDG %.4f", f, DalitzFraction)
	}
}

func TestPiZeroOpeningAngle(t *testing.T) {
	// The minimum opening angle of the two photons of a pi0 of energy E
	// is 2 asin(m/E) (symmetric decay, analytic two-body result); no pair
	// may fall below it. The opening angle grows with the asymmetry
	// |x - 1/2| of the energy sharing, uniform on [0, beta/2], so its
	// median is at |x - 1/2| = beta/4: cos theta = 1 - m^2/(2E^2 x(1-x)).
	// Checked to 5 standard errors of a median.
	rng := newRNG(9, 10)
	const n, ekin = 20000, 300.0
	e := ekin + phys.PionZeroMass
	beta := phys.Beta(ekin, phys.PionZeroMass)
	m := phys.PionZeroMass
	thMin := 2 * math.Asin(m/e)
	var th []float64
	for len(th) < n {
		var s recordSink
		if _, dz := DecayPiZero(along(phys.NeutralPionCode, ekin), rng, &s); dz {
			continue
		}
		a := math.Acos(s.Secs[0].Dir.Dot(s.Secs[1].Dir))
		if a < thMin*(1-1e-9) {
			t.Fatalf("opening angle %g below the minimum %g", a, thMin)
		}
		th = append(th, a)
	}
	sort.Float64s(th)
	med := th[n/2]
	// The median of theta is at the median of |x - 1/2|, beta/4.
	x := 0.5 + beta/4
	want := math.Acos(1 - m*m/(2*e*e*x*(1-x)))
	// Standard error of a median: 1/(2 f sqrt(n)); f from the sample.
	f := 0.1 / (th[n/2+n/20] - th[n/2-n/20])
	if se := 1 / (2 * f * math.Sqrt(n)); math.Abs(med-want) > 5*se {
		t.Errorf("median opening angle %.5f rad, analytic %.5f (se %.5f)", med, want, se)
	}
}

func TestPionCherenkovThreshold(t *testing.T) {
	// Segments are reported only above beta = 1/n: for a pion at the
	// configured index n = 1.33 the threshold momentum is
	// m_pi/sqrt(n^2 - 1) = 159.2 MeV/c (the ~159 MeV/c of water). A pion
	// started at 150 MeV/c makes no segment; one at 250 MeV/c makes
	// segments that start above the threshold speed.
	const n = 1.33
	p := newPhysics(t, heavy.Config{ThresholdIndex: n, NoScattering: true})
	thr := phys.PionMass / math.Sqrt(n*n-1)
	if math.Abs(thr-159.2) > 0.1 {
		t.Fatalf("threshold %g MeV/c", thr)
	}
	rng := newRNG(11, 12)
	for _, c := range []struct {
		mom   float64
		light bool
	}{{150, false}, {250, true}} {
		var s recordSink
		_, err := p.TrackPion(along(phys.PionPlusCode, phys.KineticFromMomentum(c.mom, phys.PionMass)), ball{R: 1e4}, rng, &s)
		if err != nil {
			t.Fatal(err)
		}
		if (len(s.Segs) > 0) != c.light {
			t.Errorf("%g MeV/c: %d segments", c.mom, len(s.Segs))
		}
		for _, g := range s.Segs {
			if g.Track == 1 && g.Beta0 <= 1/n {
				t.Errorf("segment starting at beta %g below 1/n", g.Beta0)
			}
		}
	}
}

func TestInteractionEnergyBalance(t *testing.T) {
	// Energy conservation of the nuclear model: the products of a
	// quasi-elastic or charge-exchange collision carry the pion's total
	// energy plus the struck nucleon's bound energy, sqrt(m^2 + p_F^2) -
	// 27 MeV; so their kinetic energies (with the de-excitation gamma)
	// add up to T_pi - 27 MeV + T_Fermi + (m_pi - m_out) + (m_target -
	// m_nucleon_out), T_Fermi between 0 and 26.6 MeV (k_F = 225 MeV/c).
	// Absorption: T_pi + m_pi - 54 MeV + two Fermi energies.
	p := newPhysics(t, heavy.Config{})
	rng := newRNG(13, 14)
	const tpi = 200.0
	tfMax := math.Hypot(fermiMomentum, phys.ProtonMass) - phys.ProtonMass
	for i := 0; i < 3000; i++ {
		var tr Truth
		pi := phys.OnShell(phys.PionMass, tpi, r3.Vector{Z: 1})
		out := p.pionInteraction(pi, i%2 == 1, &tr, rng, nil)
		if tr.Target != 8 || tr.Channel == Elastic {
			continue
		}
		var sumE float64
		for _, q := range out {
			sumE += q.p.E
		}
		lo := tpi + phys.PionMass + phys.NeutronMass - removalEnergy - 1
		if tr.Channel == Absorption {
			lo = tpi + phys.PionMass + phys.ProtonMass + phys.NeutronMass - 2*removalEnergy - 1
		}
		hi := lo + 2 + 2*tfMax + 2 // +2 for the n-p mass difference and the gamma's share
		if tr.Channel != Absorption {
			hi = lo + 2 + tfMax + 7
		}
		if sumE < lo || sumE > hi {
			t.Fatalf("%v: products carry %.2f MeV, expected %.2f-%.2f", tr.Channel, sumE, lo, hi)
		}
	}
}

func TestProtonNuclearInteractionProbability(t *testing.T) {
	// Protons of 200 MeV stopping in water: the fraction with a
	// non-elastic nuclear interaction (on oxygen) against the integral of
	// the model cross-section along the CSDA path, 1 - exp(-int n_O
	// sigma_R dE/S) (5 binomial standard errors plus 3% for straggling
	// and the trapezoid steps), and against the rule of about 1% of the
	// protons lost per cm of range in water (ICRU Report 63, nuclear data
	// for proton therapy; from memory): 1 - exp(-0.01 R) = 23% for the
	// 26 cm of a 200 MeV proton, within 4 percentage points.
	p := newPhysics(t, heavy.Config{})
	rng := newRNG(15, 16)
	const n, t0 = 4000, 200.0
	var onO int
	for i := 0; i < n; i++ {
		var s recordSink
		tr, err := p.TrackProton(along(phys.ProtonCode, t0), ball{R: 1e4}, rng, &s)
		if err != nil {
			t.Fatal(err)
		}
		if tr.Fate == phys.Interacted && tr.Target == 8 {
			onO++
		}
	}
	// The integral, by the midpoint rule in T over 1 MeV steps. Elastic
	// p-p scatters (above 50 MeV) end the track too: a proton scattered on
	// hydrogen is a new track and is not counted here, so its later
	// oxygen interactions are missed; their share (a few per cent of
	// 20%) is inside the tolerance.
	var depth float64
	for x := 1.5; x < t0; x++ {
		s, _ := p.Proton().StoppingPower(x)
		depth += p.nO * ProtonOxygenReaction(x) * millibarn / s
	}
	// Probability of reaching an oxygen interaction before a p-p scatter.
	var depthH float64
	for x := 50.5; x < t0; x++ {
		s, _ := p.Proton().StoppingPower(x)
		depthH += p.nH * ProtonProtonElastic(x) * millibarn / s
	}
	want := 1 - math.Exp(-depth)
	f := float64(onO) / n
	if math.Abs(f-want) > 5*math.Sqrt(want*(1-want)/n)+0.03*want+(1-math.Exp(-depthH))*want {
		t.Errorf("200 MeV protons: %.3f interact on oxygen, model integral %.3f", f, want)
	}
	r, _ := p.Proton().CSDARange(t0)
	if rule := 1 - math.Exp(-0.01*r); math.Abs(want-rule) > 0.04 {
		t.Errorf("model non-elastic probability %.3f, 1%%/cm rule %.3f", want, rule)
	}
	t.Logf("200 MeV protons: %.3f on oxygen (n = %d), integral %.3f", f, n, want)
}
