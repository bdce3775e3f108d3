package cherenkov

import (
	"math"
	"testing"

	"github.com/conelight/conelight/sim/phys"
)

// kineticAtBeta solves phys.Beta(T, m) = beta for T by bisection: an
// independent route to the threshold energy through the phys kinematics.
func kineticAtBeta(beta, m float64) float64 {
	lo, hi := 0.0, 100*m
	for range 200 {
		mid := (lo + hi) / 2
		if phys.Beta(mid, m) < beta {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

func TestThresholds(t *testing.T) {
	const n = 1.33
	b, err := ThresholdBeta(n)
	if err != nil || b != 1/n {
		t.Fatalf("ThresholdBeta(%g) = %g, %v", n, b, err)
	}
	te, _ := ThresholdKinetic(phys.ElectronMass, n)
	if want := kineticAtBeta(1/n, phys.ElectronMass); math.Abs(te/want-1) > 1e-9 {
		t.Errorf("electron threshold %g MeV, bisection %g", te, want)
	}
	// Electrons emit above about 0.26 MeV kinetic in water (DESIGN.md;
	// common practice).
	if math.Abs(te-0.26) > 0.01 {
		t.Errorf("electron threshold %g MeV, want about 0.26", te)
	}
	pmu, _ := ThresholdMomentum(phys.MuonMass, n)
	if want := phys.Momentum(kineticAtBeta(1/n, phys.MuonMass), phys.MuonMass); math.Abs(pmu/want-1) > 1e-9 {
		t.Errorf("muon threshold momentum %g MeV/c, from bisection %g", pmu, want)
	}
	// Muons emit above about 120 MeV/c in water (common practice).
	if math.Abs(pmu-120) > 2 {
		t.Errorf("muon threshold momentum %g MeV/c, want about 120", pmu)
	}
	for _, bad := range [][2]float64{{1, 1}, {1, 0.9}, {1, math.NaN()}, {1, math.Inf(1)}, {-1, 1.33}, {math.NaN(), 1.33}} {
		if _, err := ThresholdKinetic(bad[0], bad[1]); err == nil {
			t.Errorf("ThresholdKinetic(%g, %g) gave no error", bad[0], bad[1])
		}
		if _, err := ThresholdMomentum(bad[0], bad[1]); err == nil {
			t.Errorf("ThresholdMomentum(%g, %g) gave no error", bad[0], bad[1])
		}
	}
	if _, err := ThresholdBeta(0.5); err == nil {
		t.Error("ThresholdBeta(0.5) gave no error")
	}
}
