package ring

import (
	"os"
	"strconv"
	"strings"
	"testing"

	"github.com/conelight/conelight/sim/phys"
)

// TestLargeTankTargets is the study of the large reference tank: fully
// contained single-ring events at least 200 cm from the wall, electrons
// and muons at 300, 500, 700 and 1000 MeV/c. It takes minutes, so it runs only
// when CONELIGHT_RING_LARGE is set to the number of events per point:
//
//	CONELIGHT_RING_LARGE=100 go test ./fit/ring -run TestLargeTankTargets -v -timeout 2h
//
// CONELIGHT_RING_LARGE_POINTS (e.g. "e-500,mu-500") restricts it to some
// points. It reports the 68% quantiles, the median Cramer-Rao bounds, the
// mis-identification rates with the zero cut and with a cut calibrated
// (CalibratePID) on the even events and counted on the odd ones, and the
// speed, and asserts nothing beyond the absence of NaN in converged fits:
// the targets are goals to report against, not regression baselines.
func TestLargeTankTargets(t *testing.T) {
	n := studyEvents(t, "CONELIGHT_RING_LARGE", "the large-tank study")
	cfg := largeConfig(t, 11)
	cfg.Workers = 0
	s, f := simAndFitter(t, cfg, false)
	pulls := map[string][]float64{}
	var eID, muID []pidPoint
	only := os.Getenv("CONELIGHT_RING_LARGE_POINTS") // e.g. "e-500,mu-500"
	for i, pt := range []point{
		{"e-300", phys.Electron, 300}, {"e-500", phys.Electron, 500}, {"e-700", phys.Electron, 700}, {"e-1000", phys.Electron, 1000},
		{"mu-300", phys.MuonMinus, 300}, {"mu-500", phys.MuonMinus, 500}, {"mu-700", phys.MuonMinus, 700}, {"mu-1000", phys.MuonMinus, 1000},
	} {
		if only != "" && !strings.Contains(","+only+",", ","+pt.name+",") {
			continue
		}
		smp := study(t, s, f, pt, n, 200, uint64(3000+i), nil)
		t.Log(summary(pt.name, smp))
		for k, v := range smp.pulls {
			pulls[k] = append(pulls[k], v...)
		}
		if pt.pdg == phys.Electron {
			eID = append(eID, smp.pid...)
		} else {
			muID = append(muID, smp.pid...)
		}
		t.Logf("%-8s LLR 1%% %+.0f, 50%% %+.0f, 99%% %+.0f (n %d); Cramer-Rao bound (median) vertex %.1f cm, direction %.2f deg, momentum %.3f",
			pt.name, llrQuantile(smp.pid, 0.01), llrQuantile(smp.pid, 0.5), llrQuantile(smp.pid, 0.99), len(smp.pid),
			quantile(smp.crbVertex, 0.5), quantile(smp.crbAngle, 0.5), quantile(smp.crbMomentum, 0.5))
	}
	for _, k := range []string{"x", "y", "z", "t", "angle", "energy"} {
		t.Logf("pull %-6s width %.2f median %+.2f (n %d)", k, width(pulls[k]), quantile(pulls[k], 0.5), len(pulls[k]))
	}
	// Identity: a cut line calibrated on the even events, the mis-ID
	// counted on the odd ones.
	var eTrain, eTest, muTrain, muTest []Reconstruction
	for _, p := range eID {
		if p.k%2 == 0 {
			eTrain = append(eTrain, p.rec)
		} else {
			eTest = append(eTest, p.rec)
		}
	}
	for _, p := range muID {
		if p.k%2 == 0 {
			muTrain = append(muTrain, p.rec)
		} else {
			muTest = append(muTest, p.rec)
		}
	}
	cuts := []struct {
		name string
		cut  PIDCut
	}{{"zero cut", PIDCut{}}}
	if cut, err := CalibratePID(eTrain, muTrain, 200); err != nil {
		// too few points for the electrons' and the muons' mean fitted
		// momenta to share bins
		t.Logf("no calibrated cut: %v", err)
	} else {
		t.Logf("PIDCut calibrated on %d e + %d mu events: %+v", len(eTrain), len(muTrain), cut)
		cuts = append(cuts, struct {
			name string
			cut  PIDCut
		}{"calibrated", cut})
	}
	for _, c := range cuts {
		eBad, muBad := misIDCount(eTest, c.cut, phys.Electron), misIDCount(muTest, c.cut, phys.MuonMinus)
		t.Logf("%-10s on the other half: e called mu %d of %d, mu called e %d of %d", c.name, eBad, len(eTest), muBad, len(muTest))
	}
}

// studyEvents returns the number of events per point that the
// environment variable name asks a study for, and skips the test when it
// is not set.
func studyEvents(t *testing.T, name, what string) int {
	t.Helper()
	v := os.Getenv(name)
	if v == "" {
		t.Skipf("set %s=<events per point> to run %s", name, what)
	}
	n, err := strconv.Atoi(v)
	if err != nil || n <= 0 {
		t.Fatalf("%s = %q must be a positive integer", name, v)
	}
	return n
}

// llrQuantile is the q quantile of the likelihood ratios of ps.
func llrQuantile(ps []pidPoint, q float64) float64 {
	xs := make([]float64, len(ps))
	for i, p := range ps {
		xs[i] = p.rec.LLR
	}
	return quantile(xs, q)
}

// misIDCount counts the events of rs the cut does not call pdg.
func misIDCount(rs []Reconstruction, c PIDCut, pdg int) int {
	n := 0
	for i := range rs {
		if c.PDG(&rs[i]) != pdg {
			n++
		}
	}
	return n
}
