package gen

import (
	"math"
	"math/rand/v2"
	"strings"
	"sync"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/phys"
)

func mustQE(t *testing.T, cfg QEConfig) *QE {
	t.Helper()
	if cfg.Vertex == (VertexDist{}) {
		cfg.Vertex = AtPoint(r3.Vector{})
	}
	if cfg.Beam == (r3.Vector{}) {
		cfg.Beam = r3.Vector{X: 1, Y: 2, Z: 2} // not along an axis
	}
	q, err := NewQE(cfg)
	if err != nil {
		t.Fatal(err)
	}
	return q
}

// qeEvent is one generated event with its lepton four-momentum.
type qeEvent struct {
	lep  phys.Particle
	lepP fourVec
	nucP fourVec
	info Info
}

func generateQE(t *testing.T, q *QE, n int, seed uint64) []qeEvent {
	t.Helper()
	rng := rand.New(rand.NewPCG(seed, 77))
	out := make([]qeEvent, 0, n)
	var dst []phys.Particle
	for i := range n {
		var info Info
		var err error
		dst, info, err = q.Generate(uint64(i), rng, dst)
		if err != nil {
			t.Fatal(err)
		}
		if len(dst) != 1 {
			t.Fatalf("%d primaries, want the lepton only", len(dst))
		}
		l := dst[0]
		sp, _ := phys.Lookup(l.PDG)
		fn := info.FinalNucleon
		fsp, _ := phys.Lookup(fn.PDG)
		out = append(out, qeEvent{
			lep:  l,
			lepP: fourVec{l.Ekin + sp.Mass, l.Dir.Mul(phys.Momentum(l.Ekin, sp.Mass))},
			nucP: fourVec{fn.Ekin + fsp.Mass, fn.Dir.Mul(phys.Momentum(fn.Ekin, fsp.Mass))},
			info: info,
		})
	}
	return out
}

// TestQEFreeKinematics: on free nucleons at rest, energy and momentum are
// conserved (k + P = k_l + P', 1e-9 relative), Q2 from the lepton,
// 2 E (E_l - p_l cos theta) - m_l^2, is the sampled Q2, and the
// quasi-elastic energy formula with E_b = 0 recovers E_nu (1e-9).
func TestQEFreeKinematics(t *testing.T) {
	for _, c := range []struct {
		nu     int
		target Target
		e      Spectrum
	}{
		{phys.AntiMuonNeu, FreeNucleon, FixedEnergy(800)},
		{phys.MuonNeu, FreeNucleon, UniformEnergy(300, 5000)},
		{phys.ElectronNeu, FreeNucleon, FixedEnergy(40)},
		{phys.AntiElecNeu, Water, UniformEnergy(20, 2000)},
	} {
		q := mustQE(t, QEConfig{Neutrino: c.nu, Etot: c.e, Target: c.target})
		nFree := 0
		for _, ev := range generateQE(t, q, 1500, 1) {
			in := ev.info
			if in.Reaction != CCQE || in.Neutrino != c.nu || in.NeutrinoDir != q.beam {
				t.Fatalf("info %+v", in)
			}
			if in.Target == Oxygen16Code {
				continue
			}
			nFree++
			if in.FermiMomentum != (r3.Vector{}) || in.BindingEnergy != 0 || in.Target != q.ch.initial {
				t.Fatalf("free event with info %+v", in)
			}
			e := in.NeutrinoEtot
			tot := fourVec{e + q.ch.model.mi, q.beam.Mul(e)}
			fin := ev.lepP.add(ev.nucP)
			if d := fin.add(fourVec{-tot.e, tot.p.Mul(-1)}); math.Abs(d.e) > 1e-9*tot.e || d.p.Norm() > 1e-9*tot.e {
				t.Fatalf("%d at %g MeV: 4-momentum not conserved by %v", c.nu, e, d)
			}
			ml := q.ch.model.lepMass
			cos := ev.lep.Dir.Dot(q.beam)
			q2 := 2*e*(ev.lepP.e-ev.lepP.p.Norm()*cos) - ml*ml
			if math.Abs(q2-in.Q2) > 1e-9*2*e*ev.lepP.e {
				t.Fatalf("Q2 from the lepton %g, sampled %g", q2, in.Q2)
			}
			eqe, err := phys.QuasiElasticEnergyOf(ev.lep.PDG, ev.lep.Ekin, cos, 0)
			if err != nil || math.Abs(eqe/e-1) > 1e-9 {
				t.Fatalf("QuasiElasticEnergy %g (%v), true %g", eqe, err, e)
			}
		}
		if nFree == 0 {
			t.Errorf("%d on %v: no free-nucleon event", c.nu, c.target)
		}
	}
}

// TestQEQ2Distribution compares the sampled Q2 of free-nucleon events with
// bin probabilities from a numerical integration of d sigma/dQ2 (chi-square).
func TestQEQ2Distribution(t *testing.T) {
	for _, c := range []struct {
		nu int
		e  float64
	}{{phys.AntiMuonNeu, 1000}, {phys.MuonNeu, 3000}, {phys.ElectronNeu, 300}} {
		q := mustQE(t, QEConfig{Neutrino: c.nu, Etot: FixedEnergy(c.e), Target: FreeNucleon})
		lo, hi, _ := q.ch.q2Range(c.e)
		// Bins in x = 1 - (1 + Q2/M_A^2)^-1 follow the fall-off, equal steps in x.
		const nb = 25
		xOf := func(q2 float64) float64 { return 1 - 1/(1+(q2-lo)/q.ch.model.ma2) }
		xHi := xOf(hi)
		edge := func(i int) float64 { // inverse of xOf at x = xHi i/nb
			x := xHi * float64(i) / nb
			return lo + q.ch.model.ma2*(1/(1-x)-1)
		}
		probs := make([]float64, nb)
		total := q.ch.totalFree(c.e)
		for i := range probs {
			probs[i] = integratePanels(func(q2 float64) float64 { return q.ch.model.dSigma(c.e, q2) }, edge(i), edge(i+1)) / total
		}
		counts := make([]int, nb)
		for _, ev := range generateQE(t, q, 20000, 2) {
			i := int(xOf(ev.info.Q2) / xHi * nb)
			counts[min(i, nb-1)]++
		}
		chiSquare(t, "Q2 of "+q.String(), counts, probs)
	}
}

// TestQEFluxWeighted: with a flat flux on free protons, the interaction
// energies follow sigma(E) (bin integrals of FreeCrossSection; chi-square).
func TestQEFluxWeighted(t *testing.T) {
	lo, hi := 200.0, 3000.0
	q := mustQE(t, QEConfig{Neutrino: phys.AntiMuonNeu, Etot: UniformEnergy(lo, hi), FluxWeighted: true, Target: FreeNucleon})
	const nb = 14
	w := (hi - lo) / nb
	probs := make([]float64, nb)
	sum := 0.0
	for i := range probs {
		probs[i] = integratePanels(q.ch.totalFree, lo+float64(i)*w, lo+float64(i+1)*w)
		sum += probs[i]
	}
	for i := range probs {
		probs[i] /= sum
	}
	counts := make([]int, nb)
	for _, ev := range generateQE(t, q, 10000, 3) {
		counts[min(int((ev.info.NeutrinoEtot-lo)/w), nb-1)]++
	}
	chiSquare(t, "flux-weighted energies", counts, probs)
}

// TestQEOxygen: bound nucleons conserve energy and momentum with the
// initial nucleon (sqrt(M^2 + p^2) - E_b, p) (1e-9); Fermi momenta lie in
// the Fermi sphere and final nucleons outside it (Pauli blocking); the
// quasi-elastic energy (with E_b) is smeared by Fermi motion but centred.
// Tolerance on the mean of E_QE/E - 1: first-order Fermi-motion terms
// average out over the isotropic sphere, leaving second-order ones,
// bounded by (k_F/M)^2, plus the mean Fermi kinetic energy 3 k_F^2/(10 M)
// over E, plus 5 standard errors.
func TestQEOxygen(t *testing.T) {
	for _, c := range []struct {
		nu int
		e  float64
	}{{phys.MuonNeu, 1000}, {phys.AntiElecNeu, 600}} {
		q := mustQE(t, QEConfig{Neutrino: c.nu, Etot: FixedEnergy(c.e), Target: Oxygen})
		kF, eb, mi := q.gas.FermiMomentum, q.gas.BindingEnergy, q.ch.model.mi
		evs := generateQE(t, q, 4000, 4)
		var sum, sum2 float64
		for _, ev := range evs {
			in := ev.info
			if in.Target != Oxygen16Code || in.BindingEnergy != eb {
				t.Fatalf("info %+v", in)
			}
			pF := in.FermiMomentum
			if pF.Norm() > kF {
				t.Fatalf("Fermi momentum %g above k_F", pF.Norm())
			}
			if pf := ev.nucP.p.Norm(); pf <= kF {
				t.Fatalf("final nucleon %g MeV/c not Pauli-blocked", pf)
			}
			tot := fourVec{c.e + math.Sqrt(mi*mi+pF.Norm2()) - eb, q.beam.Mul(c.e).Add(pF)}
			d := ev.lepP.add(ev.nucP).add(fourVec{-tot.e, tot.p.Mul(-1)})
			if math.Abs(d.e) > 1e-9*tot.e || d.p.Norm() > 1e-9*tot.e {
				t.Fatalf("4-momentum not conserved by %v", d)
			}
			eqe, err := phys.QuasiElasticEnergyOf(ev.lep.PDG, ev.lep.Ekin, ev.lep.Dir.Dot(q.beam), eb)
			if err != nil {
				continue // Fermi motion can push a lepton out of the formula's range
			}
			r := eqe/c.e - 1
			sum += r
			sum2 += r * r
		}
		n := float64(len(evs))
		mean := sum / n
		rms := math.Sqrt(sum2/n - mean*mean)
		tol := (kF/mi)*(kF/mi) + 0.3*kF*kF/(mi*c.e) + 5*rms/math.Sqrt(n)
		if math.Abs(mean) > tol {
			t.Errorf("%d at %g MeV: mean E_QE/E - 1 = %.4f, tolerance %.4f", c.nu, c.e, mean, tol)
		}
		// Fermi motion must smear: the rms is of order k_F/M (0.24); free
		// events have none. Demand more than a tenth of it.
		if rms < 0.1*kF/mi {
			t.Errorf("%d at %g MeV: rms of E_QE/E = %.4f, no Fermi smearing", c.nu, c.e, rms)
		}
		t.Logf("%d at %g MeV: E_QE/E - 1 = %.4f +- %.4f (rms), tolerance %.4f", c.nu, c.e, mean, rms, tol)
	}
}

// TestPauliBlocking: Pauli blocking removes the events whose final nucleon
// falls inside the Fermi sphere. The blocked sample is, exactly, the
// unblocked-proposal sample conditioned on |p_f| > k_F, so the fraction of
// events at low Q2 predicted from an independent run without blocking must
// match the blocked run's (binomial, 5 sigma), and be well below the
// unblocked fraction (suppression).
func TestPauliBlocking(t *testing.T) {
	q := mustQE(t, QEConfig{Neutrino: phys.MuonNeu, Etot: FixedEnergy(800), Target: Oxygen})
	free := *q
	free.pauli = false
	const q2Low = 0.1e6 // MeV^2
	const n = 6000
	var lowAll, kept, lowKept int
	for _, ev := range generateQE(t, &free, n, 5) {
		low := ev.info.Q2 < q2Low
		if low {
			lowAll++
		}
		if ev.nucP.p.Norm() > q.gas.FermiMomentum {
			kept++
			if low {
				lowKept++
			}
		}
	}
	lowBlocked := 0
	for _, ev := range generateQE(t, q, n, 6) {
		if ev.info.Q2 < q2Low {
			lowBlocked++
		}
	}
	pPred := float64(lowKept) / float64(kept)
	pGot := float64(lowBlocked) / n
	sigma := math.Sqrt(pPred*(1-pPred)/float64(kept) + pGot*(1-pGot)/n)
	if math.Abs(pGot-pPred) > 5*sigma {
		t.Errorf("low-Q2 fraction with blocking %.4f, predicted %.4f +- %.4f", pGot, pPred, sigma)
	}
	pAll := float64(lowAll) / n
	if !(pGot < pAll-5*math.Sqrt(pAll*(1-pAll)/n)) {
		t.Errorf("no low-Q2 suppression: %.4f with blocking, %.4f without", pGot, pAll)
	}
	t.Logf("fraction with Q2 < 0.1 GeV^2: %.4f unblocked, %.4f blocked (predicted %.4f)", pAll, pGot, pPred)
}

// TestQEBound checks the rejection bound against random proposals for all
// flavours, targets and energies from near threshold to 20 GeV: the
// weight must stay below the bound (Generate reports an error otherwise).
func TestQEBound(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	worst := 0.0
	for _, nu := range []int{phys.ElectronNeu, phys.AntiElecNeu, phys.MuonNeu, phys.AntiMuonNeu} {
		for _, tg := range []Target{Water, Oxygen, FreeNucleon} {
			for _, e := range []float64{150, 250, 400, 700, 1200, 3000, 20000} {
				q := mustQE(t, QEConfig{Neutrino: nu, Etot: FixedEnergy(e), Target: tg})
				b := q.fixedBound
				for range 3000 {
					free := q.freeShare == 1 || (q.freeShare > 0 && rng.Float64() < q.freeShare)
					var pF r3.Vector
					if !free {
						pF = fermiSphere(q.gas.FermiMomentum, rng)
					}
					w, _, _, _, _ := q.rate(e, q.initial(free, pF), 2*rng.Float64()-1)
					worst = math.Max(worst, w/b)
				}
			}
		}
	}
	if worst >= 1 {
		t.Errorf("proposal weight reached %.4f of the bound", worst)
	}
	t.Logf("largest weight/bound %.4f", worst)
}

func TestQEValidation(t *testing.T) {
	ok := QEConfig{Neutrino: phys.MuonNeu, Etot: FixedEnergy(1000), Beam: r3.Vector{Z: 1}, Vertex: AtPoint(r3.Vector{})}
	for _, c := range []struct {
		mod  func(*QEConfig)
		want string
	}{
		{func(c *QEConfig) { c.Neutrino = phys.Electron }, "QEConfig.Neutrino = 11"},
		{func(c *QEConfig) { c.AxialMass = -1 }, "AxialMass = -1"},
		{func(c *QEConfig) { c.Etot = Spectrum{} }, "QEConfig.Etot: not set"},
		{func(c *QEConfig) { c.Etot = FixedEnergy(100) }, "below the threshold"},
		{func(c *QEConfig) { c.Etot = UniformEnergy(0, 50); c.FluxWeighted = true }, "wholly below the threshold"},
		{func(c *QEConfig) { c.Beam = r3.Vector{} }, "QEConfig.Beam"},
		{func(c *QEConfig) { c.Beam = r3.Vector{X: math.NaN()} }, "QEConfig.Beam"},
		{func(c *QEConfig) { c.Vertex = VertexDist{} }, "QEConfig.Vertex: not set"},
		{func(c *QEConfig) { c.Time = math.Inf(1) }, "QEConfig.Time = +Inf"},
		{func(c *QEConfig) { c.Target = 7 }, "QEConfig.Target = 7"},
		{func(c *QEConfig) { c.Nucleus = FermiGas{FermiMomentum: -5} }, "FermiMomentum = -5"},
		{func(c *QEConfig) { c.Nucleus = FermiGas{FermiMomentum: 200, BindingEnergy: math.NaN()} }, "BindingEnergy = NaN"},
	} {
		cfg := ok
		c.mod(&cfg)
		_, err := NewQE(cfg)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("error %v, want one containing %q", err, c.want)
		}
	}
	if _, err := NewQE(ok); err != nil {
		t.Error(err)
	}
}

// TestQEDeterministic: the same rng stream gives the same event, from any
// goroutine; spectrum mode (bound per event) and water for antineutrinos.
func TestQEDeterministic(t *testing.T) {
	q := mustQE(t, QEConfig{Neutrino: phys.AntiMuonNeu, Etot: PowerLaw(1.5, 300, 5000), Target: Water,
		Vertex: InFiducial(geom.DemoTank(), 100)})
	want := make([]qeEvent, 8)
	for i := range want {
		want[i] = generateQE(t, q, 1, uint64(i))[0]
	}
	var wg sync.WaitGroup
	for g := range 4 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range want {
				j := (i + g) % len(want)
				rng := rand.New(rand.NewPCG(uint64(j), 77))
				p, info, err := q.Generate(uint64(j), rng, nil)
				if err != nil || p[0] != want[j].lep || info != want[j].info {
					t.Errorf("event %d differs on goroutine %d (%v)", j, g, err)
				}
			}
		}()
	}
	wg.Wait()
	if s := q.String(); !strings.Contains(s, "anti-nu_mu on water") || !strings.Contains(s, "M_A = 1026 MeV") {
		t.Errorf("String() = %q", s)
	}
}
