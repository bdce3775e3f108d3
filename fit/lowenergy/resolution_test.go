package lowenergy_test

import (
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
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

// The regression sample: electrons at 5, 10 and 20 MeV, uniform 1 m
// inside the demo tank's sensor surface, isotropic, run seed 7.
const (
	regressionSeed   = 7
	regressionEvents = 150
)

var regressionEnergies = []float64{5, 10, 20}

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

// baselineEntry is one energy of the stored baseline.
type baselineEntry struct {
	Ekin             float64 `json:"ekin_mev"`
	Triggered        int     `json:"triggered"`
	Converged        int     `json:"converged"`
	Vertex68         float64 `json:"vertex68_cm"`
	Vertex68Err      float64 `json:"vertex68_err_cm"`
	Direction68      float64 `json:"direction68_deg"`
	Direction68Err   float64 `json:"direction68_err_deg"`
	EnergyRes        float64 `json:"energy_resolution"`
	EnergyResErr     float64 `json:"energy_resolution_err"`
	EnergyBias       float64 `json:"energy_bias"`
	EnergyBiasErr    float64 `json:"energy_bias_err"`
	LongitudinalBias float64 `json:"longitudinal_bias_cm"`
}

type baseline struct {
	Comment string          `json:"comment"`
	Seed    int             `json:"seed"`
	Events  int             `json:"events_per_energy"`
	Entries []baselineEntry `json:"energies"`
}

// TestResolution guards the demo-tank resolution against a stored
// baseline. A figure fails when it is worse than the baseline by more
// than 3 standard errors of the difference of two independent samples
// of this size, sqrt(2) times the current standard error (one-sided; the
// errors come from order statistics for the 68% quantiles and from normal
// theory for the Gaussian core, see package resolution).
func TestResolution(t *testing.T) {
	s := demoSample(t)
	var cur baseline
	cur.Comment = "fit resolution, demo tank, electrons 1 m inside the sensor surface; written by go test ./fit/lowenergy -run TestResolution -update"
	cur.Seed, cur.Events = regressionSeed, regressionEvents
	for _, e := range regressionEnergies {
		sum, conv := summarize(t, s[e])
		cur.Entries = append(cur.Entries, baselineEntry{
			Ekin: e, Triggered: len(s[e]), Converged: conv,
			Vertex68: sum.Vertex68.Value, Vertex68Err: sum.Vertex68.Err,
			Direction68: sum.Direction68.Value, Direction68Err: sum.Direction68.Err,
			EnergyRes: sum.EnergyResolution.Value, EnergyResErr: sum.EnergyResolution.Err,
			EnergyBias: sum.EnergyBias.Value, EnergyBiasErr: sum.EnergyBias.Err,
			LongitudinalBias: sum.LongitudinalBias.Value,
		})
		t.Logf("%4.0f MeV: %d/%d converged, vertex 68%% %v cm, direction 68%% %v deg, energy resolution %v, bias %v, longitudinal bias %v cm",
			e, conv, len(s[e]), sum.Vertex68, sum.Direction68, sum.EnergyResolution, sum.EnergyBias, sum.LongitudinalBias)
	}
	if *update {
		b, err := json.MarshalIndent(cur, "", "  ")
		if err != nil {
			t.Fatal(err)
		}
		if err := writeAtomic(baselinePath, append(b, '\n')); err != nil {
			t.Fatal(err)
		}
		t.Logf("wrote %s", baselinePath)
		return
	}
	raw, err := os.ReadFile(baselinePath)
	if err != nil {
		t.Fatalf("%v (write it with go test ./fit/lowenergy -run TestResolution -update)", err)
	}
	var base baseline
	if err := json.Unmarshal(raw, &base); err != nil {
		t.Fatal(err)
	}
	if len(base.Entries) != len(cur.Entries) {
		t.Fatalf("baseline has %d energies, run has %d", len(base.Entries), len(cur.Entries))
	}
	const k = 3 * math.Sqrt2
	for i, c := range cur.Entries {
		b := base.Entries[i]
		worse := func(name string, now, was, se float64) {
			if now > was+k*se {
				t.Errorf("%v MeV: %s %.4g worse than baseline %.4g by more than %.2g (3 sigma of the difference)", c.Ekin, name, now, was, k*se)
			}
		}
		worse("vertex 68%", c.Vertex68, b.Vertex68, c.Vertex68Err)
		worse("direction 68%", c.Direction68, b.Direction68, c.Direction68Err)
		worse("energy resolution", c.EnergyRes, b.EnergyRes, c.EnergyResErr)
		worse("|energy bias|", math.Abs(c.EnergyBias), math.Abs(b.EnergyBias), c.EnergyBiasErr)
		// Converged fraction: binomial standard error.
		fc, fb := float64(c.Converged)/float64(c.Triggered), float64(b.Converged)/float64(b.Triggered)
		se := math.Sqrt(math.Max(fb*(1-fb), 1/float64(c.Triggered)) / float64(c.Triggered))
		worse("failed fraction", 1-fc, 1-fb, se)
	}
}

// TestPulls checks that every reported uncertainty describes the spread:
// the Gaussian-core width (2 sigma) of (fit - truth) / uncertainty,
// pooled over the regression energies, for the vertex coordinates, the
// time, the two direction angles (the true direction projected on the
// axes of phys.Basis of the fitted one) and the energy, must be 1 within
// 3 of its standard errors (large-sample normal theory, about 0.035 for
// the 450 events here: the band 0.9-1.1 of the reconstruction's issue).
func TestPulls(t *testing.T) {
	s := demoSample(t)
	names := [...]string{"x", "y", "z", "time", "angle 1", "angle 2", "energy"}
	var pooled [len(names)][]float64
	for _, e := range regressionEnergies {
		for _, ev := range s[e] {
			if ev.res.Status != fit.Converged || !ev.res.ErrorsValid {
				continue
			}
			for k, p := range pulls(ev, e) {
				pooled[k] = append(pooled[k], p)
			}
		}
	}
	for k, name := range names {
		g, err := resolution.GaussianCore(pooled[k], 2)
		if err != nil {
			t.Fatal(err)
		}
		t.Logf("%-8s pull: mean %v width %v (%d fits)", name, g.Mean, g.Sigma, len(pooled[k]))
		if math.Abs(g.Sigma.Value-1) > 3*g.Sigma.Err {
			t.Errorf("%s pull width %v: not 1 within 3 standard errors", name, g.Sigma)
		}
	}
}

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

// writeAtomic writes b to path through a temporary file and a rename.
func writeAtomic(path string, b []byte) error {
	f, err := os.CreateTemp(filepath.Dir(path), ".baseline-*")
	if err != nil {
		return err
	}
	if err := f.Chmod(0o644); err != nil {
		f.Close()
		os.Remove(f.Name())
		return err
	}
	if _, err := f.Write(b); err != nil {
		f.Close()
		os.Remove(f.Name())
		return err
	}
	if err := f.Close(); err != nil {
		os.Remove(f.Name())
		return err
	}
	if err := os.Rename(f.Name(), path); err != nil {
		os.Remove(f.Name())
		return fmt.Errorf("baseline: %w", err)
	}
	return nil
}
