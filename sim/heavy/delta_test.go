package heavy

import (
	"math"
	"sort"
	"testing"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
)

func TestDeltaSpectrum(t *testing.T) {
	// Sampled delta-ray energies against the spin-1/2 cross-section
	// (PDG Review, "Passage of particles through matter"), integrated per
	// bin by quadrature; chi-square test at alpha = 1e-4.
	p := newWater(t, Config{})
	rng := phystest.NewRNG(11, 12)
	for _, ekin := range []float64{300, 1e4} {
		k := p.kin(ekin)
		const cut, nb, n = 1.0, 30, 100000
		edges := make([]float64, nb+1)
		for i := range edges {
			edges[i] = cut * math.Pow(k.tmax/cut, float64(i)/nb)
		}
		counts := make([]int, nb)
		for i := 0; i < n; i++ {
			x := sampleDeltaEnergy(k, cut, rng)
			j := sort.SearchFloat64s(edges, x) - 1
			counts[j]++
		}
		total := p.deltaSigmaOf(k, cut)
		want := make([]float64, nb)
		for j := range want {
			want[j] = n * integrateLog(func(x float64) float64 { return deltaSpectrum(p, ekin, x) }, edges[j], edges[j+1]) / total
		}
		chi2, dof, err := resolution.ChiSquare(counts, want, 0, 0)
		if err != nil {
			t.Fatal(err)
		}
		if crit := resolution.ChiSquareCritical(dof, 1e-4); chi2 > crit {
			t.Errorf("T=%g: delta spectrum chi2 = %.1f above %.1f", ekin, chi2, crit)
		}
	}
}

func TestDeltaKinematics(t *testing.T) {
	// The delta-ray angle formula cos theta = (T/p_e)(p_max/T_max) (PDG
	// Review) must conserve momentum: with the muon's new momentum from
	// vector conservation, its magnitude equals sqrt((E-T)^2 - m^2) from
	// energy conservation (independent two-body relation).
	p := newWater(t, Config{})
	rng := phystest.NewRNG(13, 14)
	for _, ekin := range []float64{60, 200, 1000, 1e4, 1e6} {
		k := p.kin(ekin)
		dir := phys.Deflect(muonAlongZ(13, 0).Dir, 0.3, 1)
		for i := 0; i < 200; i++ {
			te, eDir, muDir := emitDelta(k, dir, 0.5, rng)
			pe := math.Sqrt(te * (te + 2*phys.ElectronMass))
			pmu := dir.Mul(k.p).Sub(eDir.Mul(pe))
			want := phys.Momentum(ekin-te, phys.MuonMass)
			if math.Abs(pmu.Norm()/want-1) > 1e-9 {
				t.Fatalf("T=%g, delta %g MeV: |p_mu'| = %.10g, energy conservation %.10g", ekin, te, pmu.Norm(), want)
			}
			if muDir.Sub(pmu.Normalize()).Norm() > 1e-12 {
				t.Fatal("muon direction not along its momentum")
			}
		}
	}
}

func TestSampleGammaMoments(t *testing.T) {
	// Gamma(a, 1) has mean a and variance a; the standard error of the
	// sample mean is sqrt(a/n) and of the sample variance
	// sqrt((mu4 - sigma^4)/n) with mu4 = 3a^2 + 6a. Five of them allowed.
	rng := phystest.NewRNG(15, 16)
	const n = 100000
	x := make([]float64, n)
	for _, a := range []float64{0.2, 1, 4.5, 300} {
		for i := range x {
			x[i] = sampleGamma(a, rng)
		}
		m, sd := meanSD(x)
		if math.Abs(m-a) > 5*math.Sqrt(a/n) {
			t.Errorf("Gamma(%g): mean %g", a, m)
		}
		if v := sd * sd; math.Abs(v-a) > 5*math.Sqrt((2*a*a+6*a)/n) {
			t.Errorf("Gamma(%g): variance %g", a, v)
		}
	}
}
