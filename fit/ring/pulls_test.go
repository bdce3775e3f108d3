package ring

import (
	"fmt"
	"math"
	"testing"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/sim/phys"
)

// pullParams are the reported parameters whose pulls are checked: vertex
// x, y, z, time, the two direction angles (pooled, two per event) and the
// kinetic energy (its pull is the momentum's).
var pullParams = []string{"x", "y", "z", "t", "angle", "energy"}

// pullTolerance is the number of standard errors of a Gaussian-core width
// by which it may lie outside 0.9-1.1.
const pullTolerance = 3

// notCalibrated are the pulls whose widths are not yet within 0.9-1.1,
// with what they were when this list was written (demo tank, this test's
// sample) and why. They must stay below wideLimit, so that they cannot
// grow unnoticed, and a width that comes within 0.9-1.1 fails the test
// until it is taken off the list.
var notCalibrated = map[string]string{
	"e/x":       "1.66 ± 0.20: the transverse vertex lacks an intrinsic term (the shower's lateral start)",
	"e/y":       "1.49 ± 0.18: as x",
	"e/energy":  "2.00 ± 0.24, mean -0.9: the energy error lacks the fluctuation of the detected fraction of a shower's light",
	"mu/x":      "1.40 ± 0.19: as for electrons",
	"mu/y":      "1.79 ± 0.23: as for electrons",
	"mu/z":      "1.63 ± 0.21: as for electrons",
	"mu/angle":  "0.70 ± 0.06: the axis of a muon's first third, about which the tables count, turns more with multiple scattering than the fitted direction does",
	"mu/energy": "1.53 ± 0.19: as for electrons",
}

// wideLimit bounds the pull widths of notCalibrated.
const wideLimit = 2.5

// TestPullWidths fits electrons and muons at 300, 600 and 1000 MeV/c,
// vertices uniform at least 150 cm inside the sensor surface and
// isotropic directions (gen.InFiducial, gen.Isotropic), and requires the
// Gaussian-core width (resolution.GaussianCore, 2.5 sigma) of the pulls of
// every reported parameter, pooled over the three momenta of a species,
// to lie within 0.9-1.1 widened by pullTolerance standard errors of the
// width (sigma/sqrt(2n), n the core size), except those of notCalibrated.
// Sample: pullEvents (12) events per point in the demo tank, 36 per
// species (two angles per event); the large tank's pulls are measured by
// examples/ringstudy.
func TestPullWidths(t *testing.T) {
	if testing.Short() {
		t.Skip("pull study skipped in -short mode")
	}
	d := demoTank(t)
	const pullEvents = 12
	for si, sp := range []struct {
		name string
		pdg  int
	}{{"e", phys.Electron}, {"mu", phys.MuonMinus}} {
		pulls := map[string][]float64{}
		for pi, p := range []float64{300, 600, 1000} {
			pt := point{fmt.Sprintf("%s-%g", sp.name, p), sp.pdg, p}
			s := study(t, d.sim, d.fit, pt, pullEvents, demoWall, uint64(5000+10*si+pi), nil)
			for k, v := range s.pulls {
				pulls[k] = append(pulls[k], v...)
			}
		}
		for _, k := range pullParams {
			g, err := resolution.GaussianCore(pulls[k], 2.5)
			if err != nil {
				t.Errorf("%s pull %s: %v", sp.name, k, err)
				continue
			}
			w := g.Sigma
			t.Logf("%-2s pull %-6s width %.2f ± %.2f, mean %+.2f ± %.2f (n %d)", sp.name, k, w.Value, w.Err, g.Mean.Value, g.Mean.Err, len(pulls[k]))
			lo, hi := 0.9-pullTolerance*w.Err, 1.1+pullTolerance*w.Err
			inside := w.Value >= lo && w.Value <= hi
			if why, ok := notCalibrated[sp.name+"/"+k]; ok {
				switch {
				case !(w.Value < wideLimit):
					t.Errorf("%s pull %s width %.2f ± %.2f beyond %g (not calibrated: %s)", sp.name, k, w.Value, w.Err, wideLimit, why)
				case w.Value >= 0.9 && w.Value <= 1.1:
					t.Errorf("%s pull %s width %.2f ± %.2f is now within 0.9-1.1: take it off notCalibrated", sp.name, k, w.Value, w.Err)
				}
				continue
			}
			if !inside || math.IsNaN(w.Value) {
				t.Errorf("%s pull %s width %.2f ± %.2f outside [%.2f, %.2f]", sp.name, k, w.Value, w.Err, lo, hi)
			}
		}
	}
}
