package muon

import (
	"math"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
)

func TestMichelEndpoint(t *testing.T) {
	// W = (m_mu^2 + m_e^2)/(2 m_mu) = 52.83 MeV with PDG masses.
	if math.Abs(MichelEndpoint-52.83) > 0.005 {
		t.Errorf("Michel endpoint %g MeV, want 52.83", MichelEndpoint)
	}
}

func TestMichelSpectrum(t *testing.T) {
	// Sampled x against the Michel spectrum x^2 (3 - 2x) (V-A, rho = 3/4),
	// cumulative G(x) = 2x^3 - x^4 normalized on [m_e/W, 1]; chi-square at
	// alpha = 1e-4 with the critical value from gonum distuv.ChiSquared.
	rng := phystest.NewRNG(21, 22)
	const nb, n = 40, 200000
	counts := make([]int, nb)
	for i := 0; i < n; i++ {
		x := SampleMichel(rng)
		counts[min(int(x*nb), nb-1)]++
	}
	g := func(x float64) float64 { return 2*x*x*x - x*x*x*x }
	x0 := phys.ElectronMass / MichelEndpoint
	norm := 1 - g(x0)
	want := make([]float64, nb)
	for j := range want {
		lo := math.Max(float64(j)/nb, x0)
		want[j] = n * (g(float64(j+1)/nb) - g(lo)) / norm
	}
	chi2, dof, err := resolution.ChiSquare(counts, want, 0, 0)
	if err != nil {
		t.Fatal(err)
	}
	if crit := resolution.ChiSquareCritical(dof, 1e-4); chi2 > crit {
		t.Errorf("Michel chi2 = %.1f above %.1f", chi2, crit)
	}
}

func TestBoostedDecayInvariant(t *testing.T) {
	// The laboratory electron boosted back into the muon rest frame must
	// have the rest-frame energy drawn with the same random numbers
	// (Lorentz invariance, independent inverse boost).
	p := newWater(t, Config{})
	for _, ekin := range []float64{10, 300, 5000} {
		k := p.Kinematics(ekin)
		dir := r3.Vector{X: 0.6, Y: 0, Z: 0.8}
		eLab, dLab := MichelElectron(k, dir, phystest.NewRNG(23, 24))
		eRest, _ := MichelElectron(p.Kinematics(0), dir, phystest.NewRNG(23, 24))
		const me = phys.ElectronMass
		etot := eLab + me
		pLab := math.Sqrt(etot*etot - me*me)
		gamma, bg := k.Etot()/phys.MuonMass, k.Momentum()/phys.MuonMass
		eStar := gamma*etot - bg*pLab*dLab.Dot(dir)
		if math.Abs(eStar-(eRest+me)) > 1e-9*eStar {
			t.Errorf("T=%g: rest-frame energy %g after inverse boost, drawn %g", ekin, eStar, eRest+me)
		}
	}
}

func TestCaptureFractionValue(t *testing.T) {
	// 1 - Q tau_O/tau_free with tau_O = 1795.4 ns (Suzuki, Measday and
	// Roalsvig, Phys. Rev. C 35 (1987) 2212), Q = 0.998 (Huff factor, from
	// memory), tau_free = 2196.98 ns (PDG): 18.4%.
	if math.Abs(CaptureFraction-0.184) > 0.001 {
		t.Errorf("capture fraction %g, want 0.184", CaptureFraction)
	}
}

func TestDecayAtRest(t *testing.T) {
	// Muons at rest: mean time to decay against the PDG mean life
	// 2196.98 ns (mu+) and the oxygen total mean life 1795.4 ns (mu-,
	// Suzuki et al. 1987); an exponential's sample mean has standard error
	// tau/sqrt(n). Capture fraction within 5 binomial standard errors.
	p := newWater(t, Config{})
	const n = 20000
	for _, c := range []struct {
		pdg  int
		tau  float64
		ePDG int
	}{{phys.MuonPlus, phys.MuonLifetime, phys.Positron}, {phys.MuonMinus, OxygenLifetime, phys.Electron}} {
		rng := phystest.NewRNG(25, uint64(c.pdg+100))
		var sum float64
		var captured int
		var sink countSink
		for i := 0; i < n; i++ {
			part := muonAlongZ(c.pdg, 0)
			part.Time = 7
			tr, err := p.Track(part, ball{R: 10}, rng, &sink)
			if err != nil {
				t.Fatal(err)
			}
			sum += tr.DecayTime - tr.EndTime
			switch tr.Fate {
			case phys.StoppedCaptured:
				captured++
				if tr.Decay.PDG != 0 {
					t.Fatal("captured muon has a decay product")
				}
			case phys.StoppedDecayed:
				if tr.Decay.PDG != c.ePDG || tr.Decay.Time != tr.DecayTime || tr.Decay.Parent != 1 {
					t.Fatalf("decay product %+v", tr.Decay)
				}
			default:
				t.Fatalf("fate %v for a muon at rest", tr.Fate)
			}
			if tr.EndTime != 7 || tr.TrackLength != 0 {
				t.Fatalf("muon at rest moved: %+v", tr)
			}
		}
		if sink.Segments != 0 || sink.Deposits != 0 {
			t.Errorf("muon at rest reported %d segments, %d deposits", sink.Segments, sink.Deposits)
		}
		if mean := sum / n; math.Abs(mean-c.tau) > 5*c.tau/math.Sqrt(n) {
			t.Errorf("PDG %d: mean decay time %.1f ns, want %.1f", c.pdg, mean, c.tau)
		}
		f, want := float64(captured)/n, 0.0
		if c.pdg == phys.MuonMinus {
			want = CaptureFraction
		}
		if math.Abs(f-want) > 5*math.Sqrt(want*(1-want)/n) {
			t.Errorf("PDG %d: capture fraction %.4f, want %.4f", c.pdg, f, want)
		}
	}
}

func TestDecayInFlightElectron(t *testing.T) {
	// A 1 GeV muon's boosted decay electron has mean energy gamma <E*>
	// with <E*> = 0.7 W for the Michel spectrum (the isotropic rest-frame
	// momentum averages to zero along the boost); standard error from the
	// sample. The decay length of the transport is checked in sim/heavy.
	p := newWater(t, Config{})
	rng := phystest.NewRNG(27, 28)
	const n = 4000
	k := p.Kinematics(1000)
	energies := make([]float64, n)
	for i := range energies {
		e, _ := MichelElectron(k, r3.Vector{Z: 1}, rng)
		energies[i] = e + phys.ElectronMass
	}
	wantE := k.Etot() / phys.MuonMass * 0.7 * MichelEndpoint
	if m, sd := meanSD(energies); math.Abs(m-wantE) > 5*sd/math.Sqrt(n) {
		t.Errorf("mean decay-electron energy %.2f MeV, want %.2f", m, wantE)
	}
}

func TestDecayInFlight(t *testing.T) {
	// Muons of 300 MeV decaying in flight in a large sphere: the decay
	// product is an electron (mu-) at the end point and time of the track.
	p := newWater(t, Config{})
	rng := phystest.NewRNG(29, 30)
	var seen int
	for i := 0; i < 3000 && seen < 5; i++ {
		tr, err := p.Track(muonAlongZ(phys.MuonMinus, 300), ball{R: 1e4}, rng, &countSink{})
		if err != nil {
			t.Fatal(err)
		}
		if tr.Fate != phys.DecayedInFlight {
			continue
		}
		seen++
		if tr.Decay.PDG != phys.Electron || tr.Decay.Pos != tr.EndPos || tr.Decay.Time != tr.EndTime || tr.DecayTime != tr.EndTime {
			t.Fatalf("decay in flight %+v", tr)
		}
	}
	if seen == 0 {
		t.Error("no decay in flight among 3000 muons of 300 MeV")
	}
}
