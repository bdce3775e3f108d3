package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"sync"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/examples/internal/parallel"
	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/fit/ring"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// options are the study's settings.
type options struct {
	detector string
	points   []point
	n        int
	wall     float64 // cm
	seed     uint64
}

// point is a particle at one momentum.
type point struct {
	name string
	pdg  int
	p    float64 // MeV/c
}

// maxEvents bounds -n.
const maxEvents = 1_000_000

// parsePoints reads "e-300,mu-500": a particle name (phys.ParsePDG, e-
// or mu-) and a momentum in MeV/c.
func parsePoints(s string) ([]point, error) {
	var out []point
	for _, f := range strings.Split(s, ",") {
		f = strings.TrimSpace(f)
		i := strings.LastIndex(f, "-")
		if i <= 0 || i == len(f)-1 {
			return nil, fmt.Errorf("-points: %q is not particle-momentum (e.g. e-500)", f)
		}
		name := f[:i]
		if !strings.HasSuffix(name, "-") {
			name += "-"
		}
		pdg, err := phys.ParsePDG(name)
		if err != nil || (pdg != phys.Electron && pdg != phys.MuonMinus) {
			return nil, fmt.Errorf("-points: %q: particle %q must be e- or mu-", f, f[:i])
		}
		p, err := strconv.ParseFloat(f[i+1:], 64)
		if err != nil || !(p > 0 && p <= 10000) {
			return nil, fmt.Errorf("-points: %q: momentum %q must be in (0, 10000] MeV/c", f, f[i+1:])
		}
		out = append(out, point{name: f, pdg: pdg, p: p})
	}
	return out, nil
}

// truth is what a fit is compared with.
type truth struct {
	pos, dir r3.Vector
	ekin     float64
}

// outcome is one event's fit.
type outcome struct {
	ok   bool // simulated and fitted
	tr   truth
	rec  ring.Reconstruction
	fail string // why the true hypothesis's fit is not usable
}

// sample is the outcomes of one point.
type sample struct {
	pt  point
	out []outcome
}

// run simulates and fits every point and returns the figures.
func run(ctx context.Context, w io.Writer, o options) (*resolution.Baseline, error) {
	if o.n < 2 || o.n > maxEvents {
		return nil, fmt.Errorf("-n = %d outside [2, %d]", o.n, maxEvents)
	}
	if !(o.wall >= 0) || math.IsInf(o.wall, 0) {
		return nil, fmt.Errorf("-wall = %g cm must be finite and non-negative", o.wall)
	}
	cfg, err := detflag.Config(o.detector, o.seed)
	if err != nil {
		return nil, err
	}
	cfg.Workers = 1
	s, err := sim.New(cfg)
	if err != nil {
		return nil, err
	}
	f, err := ring.New(ring.Config{Setup: s.Config().Setup})
	if err != nil {
		return nil, err
	}
	b := &resolution.Baseline{Format: resolution.BaselineFormat,
		Description: fmt.Sprintf("single-ring fitter (fit/ring) on detector %q: fully contained single particles, vertices uniform %g cm or more inside the sensor surface, isotropic directions; figures of the fit of the true hypothesis, identity by the zero cut", o.detector, o.wall)}
	fmt.Fprintf(w, "detector %s, %d events per point, vertices >= %g cm inside, seed %d\n", o.detector, o.n, o.wall, o.seed)
	fmt.Fprintf(w, "%-8s %5s %6s | %-13s %-13s %-15s %-13s | %-11s\n", "point", "fits", "failed", "vertex 68% cm", "dir 68% deg", "momentum 68% %", "bias along cm", "misID")
	var samples []sample
	for i, pt := range o.points {
		sm, err := simulatePoint(ctx, s, f, pt, o, o.seed+uint64(i))
		if err != nil {
			return nil, err
		}
		samples = append(samples, sm)
		p, line, err := figures(sm, o, s.Config().Setup.Name, o.seed+uint64(i))
		if err != nil {
			return nil, fmt.Errorf("point %s: %w", pt.name, err)
		}
		fmt.Fprintln(w, line)
		b.Points = append(b.Points, p)
	}
	printPulls(w, b)
	printBounds(w, b)
	if p, ok := calibratedPID(w, samples, o, s.Config().Setup.Name); ok {
		b.Points = append(b.Points, p)
	}
	return b, nil
}

// simulatePoint simulates and fits o.n events of pt in parallel.
func simulatePoint(ctx context.Context, s *sim.Simulator, f *ring.Fitter, pt point, o options, seed uint64) (sample, error) {
	sm := sample{pt: pt, out: make([]outcome, o.n)}
	var mu sync.Mutex
	var firstErr error
	err := parallel.Each(ctx, o.n, func() struct{} { return struct{}{} }, func(_ struct{}, k int) {
		rng := rand.New(rand.NewPCG(seed, uint64(k)))
		hits, tr, err := simulateContained(s, rng, pt, o.wall, seed, k)
		if err != nil {
			mu.Lock()
			if firstErr == nil {
				firstErr = err
			}
			mu.Unlock()
			return
		}
		oc := outcome{tr: tr}
		if hits == nil {
			oc.fail = "no contained triggered event in 50 tries"
			sm.out[k] = oc
			return
		}
		rec, err := f.Fit(hits, ring.Window{})
		if err != nil {
			oc.fail = err.Error()
			sm.out[k] = oc
			return
		}
		oc.ok, oc.rec = true, rec
		r := trueResult(&oc.rec, pt.pdg)
		if r.Status != fit.Converged {
			oc.fail = r.Status.String() + ": " + r.Reason
		}
		sm.out[k] = oc
	})
	if err == nil {
		err = firstErr
	}
	return sm, err
}

// trueResult is the fit of the true hypothesis.
func trueResult(r *ring.Reconstruction, pdg int) *ring.Result {
	if pdg == phys.MuonMinus {
		return &r.Muon
	}
	return &r.Electron
}

// simulateContained draws a vertex and a direction from rng until the
// particle stops inside the tank (electron showers always count as
// contained; a muon's straight range must end 50 cm or more inside) and
// returns the event's hits, or nil after 50 tries.
func simulateContained(s *sim.Simulator, rng *rand.Rand, pt point, minWall float64, seed uint64, k int) ([]pmt.Hit, truth, error) {
	det := s.Config().Detector
	vertices := gen.InFiducial(det.Tank(), minWall)
	mass := phys.ElectronMass
	if pt.pdg == phys.MuonMinus {
		mass = phys.MuonMass
	}
	for try := 0; try < 50; try++ {
		prim := phys.Particle{PDG: pt.pdg, Pos: vertices.Sample(rng), Dir: gen.Isotropic().Sample(rng),
			Ekin: phys.KineticFromMomentum(pt.p, mass)}
		ev, err := s.Event(seed<<20+uint64(k)<<6+uint64(try), []phys.Particle{prim})
		if err != nil {
			return nil, truth{}, err
		}
		if !ev.Truth.Triggered || len(ev.Hits) == 0 {
			continue
		}
		if prim.PDG == phys.MuonMinus {
			end := prim.Pos.Add(prim.Dir.Mul(ev.Truth.Tracks[0].Range))
			if det.DistanceToWall(end) < 50 {
				continue
			}
		}
		return ev.Hits, truth{pos: prim.Pos, dir: prim.Dir, ekin: prim.Ekin}, nil
	}
	return nil, truth{}, nil
}

// pullNames are the reported parameters whose pulls are measured.
var pullNames = []string{"x", "y", "z", "t", "angle1", "angle2", "momentum"}

// figures returns the point's figures and its report line.
func figures(sm sample, o options, detector string, seed uint64) (resolution.Point, string, error) {
	pt := sm.pt
	p := resolution.Point{Name: pt.name, Sample: resolution.SampleSpec{PDG: pt.pdg, Momentum: pt.p, Events: o.n, Seed: seed,
		Detector: detector, Selection: fmt.Sprintf("vertices uniform >= %g cm inside the sensor surface, isotropic, fully contained", o.wall)}}
	hyp := ring.Electron
	if pt.pdg == phys.MuonMinus {
		hyp = ring.Muon
	}
	var vtx, ang, mom, along []float64
	var crbV, crbA, crbP []float64
	pulls := map[string][]float64{}
	misID, failed, fitted := 0, 0, 0
	for i := range sm.out {
		oc := &sm.out[i]
		if !oc.ok {
			failed++
			continue
		}
		fitted++
		if (ring.PIDCut{}).PDG(&oc.rec) != pt.pdg {
			misID++
		}
		r := trueResult(&oc.rec, pt.pdg)
		if r.Status != fit.Converged {
			failed++
			continue
		}
		tt := oc.tr
		d := r.Track.Vertex.Sub(tt.pos)
		vtx = append(vtx, d.Norm())
		along = append(along, d.Dot(tt.dir))
		ang = append(ang, math.Acos(math.Min(1, r.Track.Dir.Dot(tt.dir)))*180/math.Pi)
		pTrue := phys.Momentum(tt.ekin, hyp.Mass())
		mom = append(mom, math.Abs(r.Momentum/pTrue-1))
		if !r.ErrorsValid {
			continue
		}
		e := r.Errors
		e1, e2 := phys.Basis(r.Track.Dir)
		pulls["x"] = append(pulls["x"], d.X/e.Vertex.X)
		pulls["y"] = append(pulls["y"], d.Y/e.Vertex.Y)
		pulls["z"] = append(pulls["z"], d.Z/e.Vertex.Z)
		pulls["t"] = append(pulls["t"], r.Track.Time/e.Time)
		pulls["angle1"] = append(pulls["angle1"], -tt.dir.Dot(e1)/e.Angle[0])
		pulls["angle2"] = append(pulls["angle2"], -tt.dir.Dot(e2)/e.Angle[1])
		pulls["momentum"] = append(pulls["momentum"], (r.Momentum-pTrue)/e.Momentum)
		c := r.CramerRao
		crbV = append(crbV, c.Vertex.Norm())
		crbA = append(crbA, math.Hypot(c.Angle[0], c.Angle[1])*180/math.Pi)
		crbP = append(crbP, c.Momentum/r.Momentum)
	}
	add := func(name, unit string, x []float64, q float64, worse resolution.Worse, scale float64) (resolution.Estimate, bool) {
		e, err := resolution.Quantile(x, q)
		if err != nil {
			return resolution.Estimate{}, false
		}
		e.Value *= scale
		e.Err *= scale
		p.Figures = append(p.Figures, resolution.EstimateFigure(name, unit, e, worse, 0))
		return e, true
	}
	v68, okV := add("vertex68", "cm", vtx, 0.68, resolution.Larger, 1)
	a68, okA := add("direction68", "deg", ang, 0.68, resolution.Larger, 1)
	m68, okM := add("momentum68", "%", mom, 0.68, resolution.Larger, 100)
	line := fmt.Sprintf("%-8s %5d %6d | ", pt.name, fitted, failed)
	for _, e := range []struct {
		ok bool
		e  resolution.Estimate
		f  string
	}{{okV, v68, "%5.1f ± %-5.1f "}, {okA, a68, "%5.2f ± %-5.2f "}, {okM, m68, "%5.2f ± %-7.2f "}} {
		if e.ok {
			line += fmt.Sprintf(e.f, e.e.Value, e.e.Err)
		} else {
			line += fmt.Sprintf("%-14s", "n/a")
		}
	}
	if b, err := resolution.Mean(along); err == nil {
		p.Figures = append(p.Figures, resolution.EstimateFigure("bias_along", "cm", b, resolution.Away, 0))
		line += fmt.Sprintf("%+6.1f ± %-5.1f ", b.Value, b.Err)
	} else {
		line += fmt.Sprintf("%-14s", "n/a")
	}
	for _, k := range pullNames {
		if g, err := resolution.GaussianCore(pulls[k], 2.5); err == nil {
			p.Figures = append(p.Figures, resolution.EstimateFigure("pull_"+k, "", g.Sigma, resolution.Away, 1))
			p.Figures = append(p.Figures, resolution.EstimateFigure("pull_"+k+"_mean", "", g.Mean, resolution.Away, 0))
		}
	}
	for _, c := range []struct {
		name, unit string
		x          []float64
		scale      float64
		achieved   resolution.Estimate
		ok         bool
	}{{"crb_vertex", "cm", crbV, 1, v68, okV}, {"crb_direction", "deg", crbA, 1, a68, okA}, {"crb_momentum", "%", crbP, 100, m68, okM}} {
		med, err := resolution.Quantile(c.x, 0.5)
		if err != nil || !(med.Value > 0) {
			continue
		}
		med.Value *= c.scale
		med.Err *= c.scale
		p.Figures = append(p.Figures, resolution.EstimateFigure(c.name, c.unit, med, resolution.Larger, 0))
		if c.ok {
			r := c.achieved.Value / med.Value
			re := r * math.Hypot(c.achieved.Err/c.achieved.Value, med.Err/med.Value)
			p.Figures = append(p.Figures, resolution.EstimateFigure(c.name+"_ratio", "", resolution.Estimate{Value: r, Err: re}, resolution.Larger, 0))
		}
	}
	mis := resolution.FractionFigure("misid", misID, max(fitted, 1), resolution.Larger)
	p.Figures = append(p.Figures, mis, resolution.FractionFigure("failed", failed, o.n, resolution.Larger))
	if ci, err := resolution.ClopperPearson(misID, max(fitted, 1), 0.6827); err == nil {
		line += "| " + ci.Percent()
	}
	return p, line, nil
}

// figure returns the named figure of p.
func figure(p resolution.Point, name string) (resolution.Figure, bool) {
	for _, f := range p.Figures {
		if f.Name == name {
			return f, true
		}
	}
	return resolution.Figure{}, false
}

// printPulls prints every point's pull widths (Gaussian core, 2.5 sigma).
func printPulls(w io.Writer, b *resolution.Baseline) {
	fmt.Fprintf(w, "\npull widths (Gaussian core; 1 for calibrated errors):\n%-8s", "point")
	for _, k := range pullNames {
		fmt.Fprintf(w, " %-12s", k)
	}
	fmt.Fprintln(w)
	for _, p := range b.Points {
		fmt.Fprintf(w, "%-8s", p.Name)
		for _, k := range pullNames {
			if f, ok := figure(p, "pull_"+k); ok {
				fmt.Fprintf(w, " %4.2f ± %-5.2f", f.Value, f.Err)
			} else {
				fmt.Fprintf(w, " %-12s", "n/a")
			}
		}
		fmt.Fprintln(w)
	}
}

// printBounds prints the median Cramer-Rao bounds and the ratios of the
// achieved 68% resolutions to them.
func printBounds(w io.Writer, b *resolution.Baseline) {
	fmt.Fprintf(w, "\nmedian Cramer-Rao bound (achieved 68%% / bound):\n%-8s %-22s %-22s %-22s\n", "point", "vertex cm", "direction deg", "momentum %")
	for _, p := range b.Points {
		fmt.Fprintf(w, "%-8s", p.Name)
		for _, k := range []string{"crb_vertex", "crb_direction", "crb_momentum"} {
			c, ok1 := figure(p, k)
			r, ok2 := figure(p, k+"_ratio")
			if ok1 && ok2 {
				fmt.Fprintf(w, " %6.2f (%4.1f ± %-4.1f)   ", c.Value, r.Value, r.Err)
			} else {
				fmt.Fprintf(w, " %-22s", "n/a")
			}
		}
		fmt.Fprintln(w)
	}
}

// calibratedPID calibrates a PIDCut on the even events of all points
// (both fits usable) and counts the mis-identification on the odd ones;
// ok is false when the calibration has too few points.
func calibratedPID(w io.Writer, samples []sample, o options, detector string) (resolution.Point, bool) {
	var eTrain, eTest, muTrain, muTest []ring.Reconstruction
	for _, sm := range samples {
		for k, oc := range sm.out {
			if !oc.ok || !oc.rec.Electron.Usable() || !oc.rec.Muon.Usable() {
				continue
			}
			switch {
			case sm.pt.pdg == phys.Electron && k%2 == 0:
				eTrain = append(eTrain, oc.rec)
			case sm.pt.pdg == phys.Electron:
				eTest = append(eTest, oc.rec)
			case k%2 == 0:
				muTrain = append(muTrain, oc.rec)
			default:
				muTest = append(muTest, oc.rec)
			}
		}
	}
	cut, err := ring.CalibratePID(eTrain, muTrain, 200)
	if err != nil {
		fmt.Fprintf(w, "\nno calibrated identity cut: %v\n", err)
		return resolution.Point{}, false
	}
	count := func(rs []ring.Reconstruction, pdg int) int {
		n := 0
		for i := range rs {
			if cut.PDG(&rs[i]) != pdg {
				n++
			}
		}
		return n
	}
	eBad, muBad := count(eTest, phys.Electron), count(muTest, phys.MuonMinus)
	p := resolution.Point{Name: "pid-calibrated", Sample: resolution.SampleSpec{Events: o.n, Seed: o.seed, Detector: detector,
		Selection: "all points; PIDCut calibrated (ring.CalibratePID, 200 MeV/c bins) on the even events, counted on the odd ones"}}
	p.Figures = append(p.Figures, resolution.FractionFigure("e_called_mu", eBad, max(len(eTest), 1), resolution.Larger),
		resolution.FractionFigure("mu_called_e", muBad, max(len(muTest), 1), resolution.Larger))
	ce, _ := resolution.ClopperPearson(eBad, max(len(eTest), 1), 0.6827)
	cm, _ := resolution.ClopperPearson(muBad, max(len(muTest), 1), 0.6827)
	fmt.Fprintf(w, "\nidentity cut calibrated on %d e + %d mu (LLR > %.1f %+.1f p/GeV): on the other half e called mu %s, mu called e %s\n",
		len(eTrain), len(muTrain), cut.Offset, cut.Slope, ce.Percent(), cm.Percent())
	return p, true
}

// printPower prints, for each 68% resolution, the power to detect a 15%
// worsening at the level (resolution.Power with the figure's relative
// error in both samples).
func printPower(w io.Writer, b *resolution.Baseline, level float64) {
	fmt.Fprintf(w, "\npower to detect a 15%% worsening at %g sigma:\n", level)
	for _, p := range b.Points {
		var parts []string
		for _, k := range []string{"vertex68", "direction68", "momentum68"} {
			if f, ok := figure(p, k); ok && f.Value > 0 {
				parts = append(parts, fmt.Sprintf("%s %.2f", k, resolution.Power(f.Err/f.Value, 0.15, level)))
			}
		}
		if len(parts) > 0 {
			fmt.Fprintf(w, "%-8s %s\n", p.Name, strings.Join(parts, ", "))
		}
	}
}
