package lowenergy_test

import (
	"os"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/resolution"
)

// TestLargeTankTargets measures the resolution for 10 MeV electrons
// uniform 2 m inside the sensor surface of the large reference tank
// (targets of the reconstruction's issue: vertex 68% <= 50 cm, direction
// 68% <= 25 deg, energy resolution <= 15%). It is a study, not a guard:
// run it with
//
//	CONELIGHT_LARGE=1 go test ./fit/lowenergy -run TestLargeTankTargets -v
//
// It checks only that nearly all triggered events converge; the figures
// are logged.
func TestLargeTankTargets(t *testing.T) {
	if os.Getenv("CONELIGHT_LARGE") == "" {
		t.Skip("set CONELIGHT_LARGE=1 to run the large-tank study")
	}
	cfg, f := largeFitter(t, 21)
	evs := study(t, cfg, f, 10, 200, 0, 1000)
	sum, conv := summarize(t, evs)
	var ratio, px, pe []float64
	hits, prompt := 0, 0
	for _, ev := range evs {
		if ev.res.Status != fit.Converged {
			continue
		}
		hits += ev.res.Selected
		prompt += ev.res.Prompt
		d := ev.res.Track.Vertex.Add(ev.res.Track.Dir.Mul(ev.res.Shift)).Sub(ev.truth.Vertex)
		c := ev.res.VertexCRB
		ratio = append(ratio, d.X/c.X, d.Y/c.Y, d.Z/c.Z)
		e := ev.res.Track.Vertex.Sub(ev.truth.Vertex)
		px = append(px, e.X/ev.res.Errors.Vertex.X, e.Y/ev.res.Errors.Vertex.Y, e.Z/ev.res.Errors.Vertex.Z)
		pe = append(pe, (ev.res.Track.Ekin-10)/ev.res.Errors.Ekin)
	}
	gr, _ := resolution.GaussianCore(ratio, 2)
	gx, _ := resolution.GaussianCore(px, 2)
	ge, _ := resolution.GaussianCore(pe, 2)
	t.Logf("large tank, 10 MeV: %d/%d converged; %.1f selected, %.1f prompt hits per event", conv, len(evs), float64(hits)/float64(conv), float64(prompt)/float64(conv))
	t.Logf("vertex 68%% %v cm, direction 68%% %v deg, energy resolution %v, energy bias %v", sum.Vertex68, sum.Direction68, sum.EnergyResolution, sum.EnergyBias)
	t.Logf("achieved / Cramer-Rao %v; pull widths: vertex %v, energy %v", gr.Sigma, gx.Sigma, ge.Sigma)
	if float64(conv) < 0.95*float64(len(evs)) {
		t.Errorf("only %d of %d events converged", conv, len(evs))
	}
}
