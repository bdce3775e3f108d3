package ring

import (
	"flag"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

var update = flag.Bool("update", false, "rewrite the regression baseline testdata/ring/demo_baseline.json")

const baselinePath = "../../testdata/ring/demo_baseline.json"

// demoPoints are the regression points in the demo tank; demoEvents
// events each, vertices at least demoWall cm inside the sensor surface.
var demoPoints = []point{
	{"e-250", phys.Electron, 250},
	{"e-600", phys.Electron, 600},
	{"e-1200", phys.Electron, 1200},
	{"mu-300", phys.MuonMinus, 300},
	{"mu-600", phys.MuonMinus, 600},
	{"mu-1000", phys.MuonMinus, 1000},
}

const (
	demoEvents = 16
	demoWall   = 150.0
	qeEvents   = 12
)

// reproduceTol is the relative difference within which a figure counts
// as reproduced: the run is deterministic (fixed seeds, one random
// stream per event), so only the last digits of floating-point sums may
// move between platforms.
const reproduceTol = 1e-9

// TestDemoRegression simulates the demo tank at fixed seeds, fits each
// event with both hypotheses and requires every figure of the baseline
// testdata/ring/demo_baseline.json (a resolution.Baseline: per point the
// 68% quantiles of the vertex, direction and momentum errors with their
// order-statistic errors, the mis-identified and failed fractions k/n, the
// quasi-elastic neutrino energy resolution, and the pooled Gaussian-core
// pull widths) to be reproduced exactly. Any change of the reconstruction
// that moves a figure fails it; rewrite the baseline with -update and
// give the reason in the commit. The statistical comparison, with samples
// large enough to detect a 15% worsening, is examples/ringstudy
// -baseline: at 16 events a point the 68% quantiles carry 15-40% errors,
// and resolution.Power of a 15% worsening at 3 sigma is below 2% (the test
// logs resolution.Compare's table for reference).
func TestDemoRegression(t *testing.T) {
	if testing.Short() {
		t.Skip("regression study skipped in -short mode")
	}
	now := demoBaseline(t)
	if *update {
		if err := now.Save(baselinePath); err != nil {
			t.Fatal(err)
		}
		return
	}
	base, err := resolution.LoadBaseline(baselinePath)
	if err != nil {
		t.Fatal(err)
	}
	c, err := resolution.Compare(base, now, 3)
	if err != nil {
		t.Fatalf("%v (run go test ./fit/ring -run TestDemoRegression -update after an intended change)", err)
	}
	t.Logf("comparison with the baseline (statistical, for reference):\n%s", c)
	for _, ch := range c.Changes {
		o, n := ch.Old, ch.New
		if o.K != n.K || o.N != n.N || math.Abs(n.Value-o.Value) > reproduceTol*math.Max(math.Abs(o.Value), 1e-12) ||
			math.Abs(n.Err-o.Err) > reproduceTol*math.Max(o.Err, 1e-12) {
			t.Errorf("%s %s = %s, baseline %s: not reproduced (go test ./fit/ring -run TestDemoRegression -update after an intended change, with the reason in the commit)",
				ch.Point, ch.Figure, figureString(n), figureString(o))
		}
	}
}

func figureString(f resolution.Figure) string {
	if f.N > 0 {
		return fmt.Sprintf("%d/%d", f.K, f.N)
	}
	return fmt.Sprintf("%.6g ± %.3g", f.Value, f.Err)
}

// demoBaseline measures the regression figures.
func demoBaseline(t *testing.T) *resolution.Baseline {
	d := demoTank(t)
	b := &resolution.Baseline{Format: resolution.BaselineFormat,
		Description: "fit/ring regression baseline, demo tank (sim.DemoConfig(7)): single particles at fixed momenta, vertices uniform >= 150 cm inside the sensor surface, isotropic, fully contained; figures of the fit of the true hypothesis, identity by the zero cut; pulls pooled over the particle points",
		Command:     "go test ./fit/ring -run TestDemoRegression -update"}
	spec := func(pdg int, p float64, n int, seed uint64, sel string) resolution.SampleSpec {
		return resolution.SampleSpec{PDG: pdg, Momentum: p, Events: n, Seed: seed, Detector: "demo", Selection: sel}
	}
	const sel = "vertices uniform >= 150 cm inside the sensor surface, isotropic, fully contained"
	pulls := map[string][]float64{}
	for i, pt := range demoPoints {
		seed := uint64(1000 + i)
		s := study(t, d.sim, d.fit, pt, demoEvents, demoWall, seed, nil)
		for k, v := range s.pulls {
			pulls[k] = append(pulls[k], v...)
		}
		p := resolution.Point{Name: pt.name, Sample: spec(pt.pdg, pt.p, demoEvents, seed, sel)}
		p.Figures = append(p.Figures, quantileFigures(t, pt.name, s)...)
		p.Figures = append(p.Figures, resolution.FractionFigure("misid", s.misID, s.n, resolution.Larger),
			resolution.FractionFigure("failed", s.failed, s.n, resolution.Larger))
		b.Points = append(b.Points, p)
		t.Log(summary(pt.name, s))
	}
	for _, q := range []struct {
		name string
		nu   int
		pdg  int
	}{{"qe-numu-700", phys.MuonNeu, phys.MuonMinus}, {"qe-nue-700", phys.ElectronNeu, phys.Electron}} {
		qe, err := gen.NewQE(gen.QEConfig{Neutrino: q.nu, Etot: gen.FixedEnergy(700), Beam: r3.Vector{X: 1},
			Vertex: gen.InFiducial(d.cfg.Detector.Tank(), demoWall)})
		if err != nil {
			t.Fatal(err)
		}
		seed := 2000 + uint64(q.nu)
		s := study(t, d.sim, d.fit, point{q.name, q.pdg, 0}, qeEvents, demoWall, seed, qe)
		p := resolution.Point{Name: q.name, Sample: spec(q.nu, 0, qeEvents, seed, "quasi-elastic, 700 MeV neutrinos along x, vertices uniform >= 150 cm inside")}
		e, err := resolution.Quantile(s.enu, 0.68)
		if err != nil {
			t.Fatalf("%s: %v", q.name, err)
		}
		p.Figures = append(p.Figures, resolution.EstimateFigure("enu68", "%", scaled(e, 100), resolution.Larger, 0),
			resolution.FractionFigure("misid", s.misID, s.n, resolution.Larger))
		b.Points = append(b.Points, p)
		t.Log(summary(q.name, s) + fmt.Sprintf(" E_nu 68%% %.1f ± %.1f%%", 100*e.Value, 100*e.Err))
	}
	p := resolution.Point{Name: "pulls", Sample: spec(0, 0, demoEvents, 1000, "the particle points pooled")}
	for _, k := range []string{"x", "y", "z", "t", "angle", "energy"} {
		g, err := resolution.GaussianCore(pulls[k], 2.5)
		if err != nil {
			t.Fatalf("pull %s: %v", k, err)
		}
		p.Figures = append(p.Figures, resolution.EstimateFigure(k, "", g.Sigma, resolution.Away, 1))
		t.Logf("pull %-6s width %.2f ± %.2f mean %+.2f ± %.2f (n %d)", k, g.Sigma.Value, g.Sigma.Err, g.Mean.Value, g.Mean.Err, len(pulls[k]))
	}
	b.Points = append(b.Points, p)
	return b
}

func scaled(e resolution.Estimate, f float64) resolution.Estimate {
	return resolution.Estimate{Value: f * e.Value, Err: f * e.Err}
}

// quantileFigures are the 68% quantiles of a point's vertex (cm),
// direction (degrees) and momentum (%) errors.
func quantileFigures(t *testing.T, name string, s sample) []resolution.Figure {
	t.Helper()
	var out []resolution.Figure
	for _, q := range []struct {
		name, unit string
		x          []float64
		f          float64
	}{{"vertex68", "cm", s.vertex, 1}, {"direction68", "deg", s.angle, 1}, {"momentum68", "%", s.momentum, 100}} {
		e, err := resolution.Quantile(q.x, 0.68)
		if err != nil {
			t.Fatalf("%s %s: %v", name, q.name, err)
		}
		out = append(out, resolution.EstimateFigure(q.name, q.unit, scaled(e, q.f), resolution.Larger, 0))
	}
	return out
}

// q68 is the 68% quantile of xs, NaN when it has fewer than two values.
func q68(xs []float64) float64 {
	e, err := resolution.Quantile(xs, 0.68)
	if err != nil {
		return math.NaN()
	}
	return e.Value
}

func summary(name string, s sample) string {
	var r []string
	for k, v := range s.reasons {
		r = append(r, fmt.Sprintf("%s: %d", k, v))
	}
	return fmt.Sprintf("%-12s n %2d failed %d misID %d | vertex 68%% %6.1f cm  direction 68%% %5.2f deg  momentum 68%% %5.3f | %.2f s/event %s",
		name, s.n, s.failed, s.misID, q68(s.vertex), q68(s.angle), q68(s.momentum), s.cpu.Seconds()/float64(s.n), strings.Join(r, "; "))
}
