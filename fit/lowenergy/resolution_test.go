package lowenergy_test

import (
	"flag"
	"fmt"
	"math"
	"strings"
	"sync"
	"testing"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/sim/phys"
)

// update rewrites the resolution baseline:
//
//	go test ./fit/lowenergy -run TestResolution -update
var update = flag.Bool("update", false, "rewrite testdata/fit/resolution_demo.json from this run")

const baselinePath = "../../testdata/fit/resolution_demo.json"

// The regression sample: electrons at 5, 10, 20 and 50 MeV, uniform 1 m
// inside the demo tank's sensor surface (gen.InFiducial), isotropic
// (gen.Isotropic), run seed 7, 1000 events per energy: large enough that
// a 15% worsening of a 68% resolution is seen at 3 sigma with the power
// TestResolution logs for each point (resolution.Power).
const (
	regressionSeed   = 7
	regressionEvents = 1000
)

var regressionEnergies = []float64{5, 10, 20, 50}

var (
	sampleOnce sync.Once
	demoEvents map[float64][]fitted
)

func demoSample(t *testing.T) map[float64][]fitted {
	t.Helper()
	sampleOnce.Do(func() {
		cfg, f := demoFitter(t)
		demoEvents = map[float64][]fitted{}
		for k, e := range regressionEnergies {
			demoEvents[e] = study(t, cfg, f, e, 100, uint64(k)*regressionEvents, regressionEvents)
		}
	})
	if demoEvents == nil {
		t.Fatal("regression sample failed")
	}
	return demoEvents
}

// pullNames are the fitted quantities whose pull widths are figures.
var pullNames = [...]string{"x", "y", "z", "time", "angle1", "angle2", "ekin"}

// measure returns the baseline of the regression sample: per energy the
// 68% resolutions, biases, the pull widths of every reported uncertainty
// and the failure fractions, each with its standard error.
func measure(t *testing.T, s map[float64][]fitted) *resolution.Baseline {
	t.Helper()
	b := &resolution.Baseline{
		Format:      resolution.BaselineFormat,
		Description: "low-energy fitter (fit/lowenergy), demo tank (setup.Demo), electrons uniform >= 1 m inside the sensor surface, isotropic; figures of converged fits; pulls (fit - truth)/error as Gaussian cores (2 sigma); far = converged, not suspect and more than 3 m from the true vertex",
		Command:     "go test ./fit/lowenergy -run TestResolution -update",
	}
	for _, e := range regressionEnergies {
		evs := s[e]
		sum, conv := summarize(t, evs)
		var pl [len(pullNames)][]float64
		suspect, far := 0, 0
		for _, ev := range evs {
			if ev.res.Status != fit.Converged {
				continue
			}
			if ev.res.Suspect {
				suspect++
			} else if ev.res.Track.Vertex.Sub(ev.truth.Vertex).Norm() > 300 {
				far++
			}
			if !ev.res.ErrorsValid {
				continue
			}
			for k, p := range pulls(ev, e) {
				pl[k] = append(pl[k], p)
			}
		}
		figs := []resolution.Figure{
			resolution.EstimateFigure("vertex68", "cm", sum.Vertex68, resolution.Larger, 0),
			resolution.EstimateFigure("direction68", "deg", sum.Direction68, resolution.Larger, 0),
			resolution.EstimateFigure("energy_resolution", "", sum.EnergyResolution, resolution.Larger, 0),
			resolution.EstimateFigure("energy_bias", "", sum.EnergyBias, resolution.Away, 0),
			resolution.EstimateFigure("longitudinal_bias", "cm", sum.LongitudinalBias, resolution.Away, 0),
		}
		for k, name := range pullNames {
			g, err := resolution.GaussianCore(pl[k], 2)
			if err != nil {
				t.Fatal(err)
			}
			figs = append(figs, resolution.EstimateFigure("pull_"+name, "", g.Sigma, resolution.Away, 1))
		}
		figs = append(figs,
			resolution.FractionFigure("not_converged", len(evs)-conv, len(evs), resolution.Larger),
			resolution.FractionFigure("suspect", suspect, conv, resolution.Larger),
			resolution.FractionFigure("far_unflagged", far, conv-suspect, resolution.Larger))
		b.Points = append(b.Points, resolution.Point{
			Name: fmt.Sprintf("e-%gMeV", e),
			Sample: resolution.SampleSpec{PDG: phys.Electron, Ekin: e, Events: regressionEvents, Seed: regressionSeed,
				Detector: "setup.Demo", Selection: "gen.InFiducial(100 cm) + gen.Isotropic, event numbers from " + fmt.Sprint(uint64(len(b.Points))*regressionEvents) + ", triggered events fitted"},
			Figures: figs,
		})
	}
	return b
}

// TestResolution guards the demo-tank figures against the stored
// baseline with resolution.Compare: a figure fails when it is worse by
// more than 3 standard errors of the difference (one-sided; fractions by
// Fisher's exact test). It logs for each point the power to see a 15%
// worsening of each 68% resolution at 3 sigma (resolution.Power).
func TestResolution(t *testing.T) {
	cur := measure(t, demoSample(t))
	for _, p := range cur.Points {
		for _, f := range p.Figures {
			if f.Name == "vertex68" || f.Name == "direction68" || f.Name == "energy_resolution" {
				t.Logf("%s %s = %.4g ± %.2g: power to see a 15%% worsening at 3 sigma %.2f", p.Name, f.Name, f.Value, f.Err, resolution.Power(f.Err/f.Value, 0.15, 3))
			}
		}
	}
	if *update {
		if err := cur.Save(baselinePath); err != nil {
			t.Fatal(err)
		}
		t.Logf("wrote %s", baselinePath)
		return
	}
	base, err := resolution.LoadBaseline(baselinePath)
	if err != nil {
		t.Fatalf("%v (write it with go test ./fit/lowenergy -run TestResolution -update)", err)
	}
	c, err := resolution.Compare(base, cur, 3)
	if err != nil {
		t.Fatal(err)
	}
	for _, ch := range c.Worsened() {
		t.Errorf("%s %s worse than the baseline by %.1f sigma", ch.Point, ch.Figure, ch.Sigmas)
	}
}

// TestPulls checks that every reported uncertainty describes the spread:
// at each regression energy the Gaussian-core width (2 sigma) of (fit -
// truth) / uncertainty of the vertex coordinates, the time, the two
// direction angles (the true direction projected on the axes of
// phys.Basis of the fitted one) and the energy must lie in the band
// 0.9-1.1 of the reconstruction's issue, within 3 of its standard errors
// (large-sample normal theory, about 0.023 for 1000 events).
func TestPulls(t *testing.T) {
	b := measure(t, demoSample(t))
	for _, p := range b.Points {
		for _, f := range p.Figures {
			if !strings.HasPrefix(f.Name, "pull_") {
				continue
			}
			t.Logf("%s %-12s width %.3f ± %.3f", p.Name, f.Name, f.Value, f.Err)
			if notReached[p.Name+"/"+f.Name] {
				// Guarded against worsening by TestResolution only.
				t.Logf("%s %s: the 0.9-1.1 band is not reached yet (see notReached)", p.Name, f.Name)
				continue
			}
			if f.Value < 0.9-3*f.Err || f.Value > 1.1+3*f.Err {
				t.Errorf("%s %s width %.3f ± %.3f outside 0.9-1.1 by more than 3 standard errors", p.Name, f.Name, f.Value, f.Err)
			}
		}
	}
}

// notReached lists the pull widths known to miss the band, each with
// its reason, so that the gap stays visible: at 50 MeV the energy error
// (the calibrated Neff spread over the local slope at the fitted energy)
// is about 1.45 times the spread: the Neff distribution has a low tail
// and its calibrated core widths grow faster with energy than the
// Gaussian core of the fitted energies does.
var notReached = map[string]bool{"e-50MeV/pull_ekin": true}

// pulls returns (fit - truth) / uncertainty of one fit of an electron of
// kinetic energy e: x, y, z, time, the two angles, the energy.
func pulls(ev fitted, e float64) [7]float64 {
	r := &ev.res
	d := r.Track.Vertex.Sub(ev.truth.Vertex)
	e1, e2 := phys.Basis(r.Track.Dir)
	er := r.Errors
	return [7]float64{d.X / er.Vertex.X, d.Y / er.Vertex.Y, d.Z / er.Vertex.Z, (r.Track.Time - ev.time) / er.Time,
		ev.truth.Dir.Dot(e1) / er.Angle[0], ev.truth.Dir.Dot(e2) / er.Angle[1], (r.Track.Ekin - e) / er.Ekin}
}

// TestCramerRao reports the achieved vertex resolution against the
// per-event Cramer-Rao bound of the time likelihood: the Gaussian-core
// width of (fit - truth) / bound over the coordinates is the ratio of the
// achieved resolution to the bound. The bound holds for unbiased
// estimators under the model, so the ratio must not fall below 1 by more
// than statistics allow (4 standard errors of a width from n values,
// 1/sqrt(2n) relative, large-sample normal theory).
func TestCramerRao(t *testing.T) {
	s := demoSample(t)
	for _, e := range regressionEnergies {
		var ratio []float64
		for _, ev := range s[e] {
			if ev.res.Status != fit.Converged {
				continue
			}
			d := ev.res.Track.Vertex.Add(ev.res.Track.Dir.Mul(ev.res.Shift)).Sub(ev.truth.Vertex)
			c := ev.res.VertexCRB
			ratio = append(ratio, d.X/c.X, d.Y/c.Y, d.Z/c.Z)
		}
		g, err := resolution.GaussianCore(ratio, 2)
		if err != nil {
			t.Fatal(err)
		}
		n := float64(len(ratio))
		t.Logf("%4.0f MeV: achieved / Cramer-Rao bound %v", e, g.Sigma)
		if g.Sigma.Value < 1-4/math.Sqrt(2*n) {
			t.Errorf("%v MeV: the fit beats the Cramer-Rao bound: ratio %v", e, g.Sigma)
		}
	}
}
