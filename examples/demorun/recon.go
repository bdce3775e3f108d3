package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strings"
	"sync"

	"github.com/golang/geo/r3"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"github.com/conelight/conelight/examples/internal/parallel"
	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/display"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/fit/ring"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/phys"
)

// minSummary is the fewest fitted events resolution.Summarize accepts.
const minSummary = 5

// referenceWavelength (nm) sets the refractive index of the drawn rings.
const referenceWavelength = 400

// sample is one particle and energy of the run with its reconstruction.
type sample struct {
	name   string
	pdg    int
	energy float64
	events []*event.Event

	fitter string // "low-energy", "ring" or "" (no fit)
	// fitted and truth are the converged fits and their true primaries.
	fitted, truth []resolution.Sample
	tried         int
	// Pulls of the low-energy fit: vertex coordinates and energy.
	vertexPull, energyPull []float64
	// Pulls of the ring fit under the true hypothesis (ringPulls).
	ringVertexPull, ringEnergyPull []float64
	// Identity from the ring fit: events identified, and correctly.
	identified, correct int
	// exiting counts the converged ring fits of tracks that leave the
	// tank (ring.Result.Exiting): their energies are lower bounds, so
	// they are left out of the resolutions.
	exiting int
	// The first converged event and its fit, for the pictures.
	example      *event.Event
	exampleTrack track
}

// track is a fitted track in the form the pictures need.
type track struct {
	vertex, dir r3.Vector
	time        float64
	cos         float64 // cosine of the Cherenkov angle
	label       string
}

func isElectromagnetic(pdg int) bool {
	return pdg == phys.Electron || pdg == phys.Positron || pdg == phys.Gamma
}

// reconstruct fits every sample, prints the resolution table and writes
// the figures.
func reconstruct(ctx context.Context, stdout, stderr io.Writer, o options, cfg sim.Config, samples []*sample) error {
	low, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup})
	if err != nil {
		return err
	}
	// Electromagnetic samples up to the top of the low-energy fitter's
	// calibration go to it; below its bottom nothing fits better.
	_, lowEnergyMax := low.EkinRange()
	var rf *ring.Fitter
	if o.ringFit > 0 {
		if rf, err = ring.New(ring.Config{Setup: cfg.Setup}); err != nil {
			return err
		}
	}
	n := cfg.Water.Index(referenceWavelength)
	for _, sm := range samples {
		switch {
		case isElectromagnetic(sm.pdg) && sm.energy <= lowEnergyMax:
			sm.fitter = "low-energy"
			if err := fitLow(ctx, low, sm, n); err != nil {
				return err
			}
		case rf != nil && inRingRange(rf, sm):
			sm.fitter = "ring"
			if err := fitRing(ctx, stderr, o, rf, sm, n); err != nil {
				return err
			}
		}
	}
	printTable(stdout, samples)
	if o.noFigures {
		return nil
	}
	files, err := writeFigures(o, low, cfg, samples)
	if err != nil {
		return err
	}
	if len(files) == 0 {
		fmt.Fprintln(stdout, "\nno figures: no sample was reconstructed")
		return nil
	}
	fmt.Fprintf(stdout, "\nfigures: %s\n", strings.Join(files, " "))
	return nil
}

func hypothesisOf(pdg int) ring.Hypothesis {
	if isElectromagnetic(pdg) {
		return ring.Electron
	}
	return ring.Muon
}

func inRingRange(rf *ring.Fitter, sm *sample) bool {
	lo, hi := rf.EkinRange(hypothesisOf(sm.pdg))
	return sm.energy >= lo && sm.energy <= hi
}

func truthOf(ev *event.Event) resolution.Sample {
	p := ev.Truth.Primaries[0]
	return resolution.Sample{Vertex: p.Pos, Dir: p.Dir, Energy: p.Ekin}
}

func fitLow(ctx context.Context, f *lowenergy.Fitter, sm *sample, n float64) error {
	res := make([]lowenergy.Result, len(sm.events))
	errs := make([]error, len(sm.events))
	if err := parallel.Each(ctx, len(sm.events), func() struct{} { return struct{}{} }, func(_ struct{}, i int) {
		res[i], errs[i] = f.Fit(sm.events[i].Hits)
	}); err != nil {
		return err
	}
	sm.tried = len(sm.events)
	for i, r := range res {
		if errs[i] != nil {
			return fmt.Errorf("%s %g MeV event %d: %w", sm.name, sm.energy, sm.events[i].Number, errs[i])
		}
		if r.Status != fit.Converged {
			continue
		}
		tr := truthOf(sm.events[i])
		sm.fitted = append(sm.fitted, resolution.Sample{Vertex: r.Track.Vertex, Dir: r.Track.Dir, Energy: r.Track.Ekin})
		sm.truth = append(sm.truth, tr)
		d := r.Track.Vertex.Sub(tr.Vertex)
		for _, c := range [][2]float64{{d.X, r.Errors.Vertex.X}, {d.Y, r.Errors.Vertex.Y}, {d.Z, r.Errors.Vertex.Z}} {
			if c[1] > 0 {
				sm.vertexPull = append(sm.vertexPull, c[0]/c[1])
			}
		}
		if r.Errors.Ekin > 0 {
			sm.energyPull = append(sm.energyPull, (r.Track.Ekin-tr.Energy)/r.Errors.Ekin)
		}
		if sm.example == nil {
			sm.example = sm.events[i]
			sm.exampleTrack = track{vertex: r.Track.Vertex, dir: r.Track.Dir, time: r.Track.Time, cos: 1 / n, label: "low-energy fit"}
		}
	}
	return nil
}

func fitRing(ctx context.Context, stderr io.Writer, o options, rf *ring.Fitter, sm *sample, n float64) error {
	k := min(o.ringFit, len(sm.events))
	recs := make([]ring.Reconstruction, k)
	errs := make([]error, k)
	var mu sync.Mutex
	done := 0
	label := fmt.Sprintf("ring fit %s %g", sm.name, sm.energy)
	if !o.quiet {
		fmt.Fprintf(stderr, "\r%-20s 0/%d events ", label, k)
	}
	if err := parallel.Each(ctx, k, func() struct{} { return struct{}{} }, func(_ struct{}, i int) {
		recs[i], errs[i] = rf.Fit(sm.events[i].Hits, ring.Window{})
		mu.Lock()
		done++
		if !o.quiet {
			fmt.Fprintf(stderr, "\r%-20s %d/%d events ", label, done, k)
		}
		mu.Unlock()
	}); err != nil {
		return err
	}
	if !o.quiet {
		fmt.Fprintln(stderr)
	}
	sm.tried = k
	want := hypothesisOf(sm.pdg)
	for i := range recs {
		if errs[i] != nil {
			continue // an event the ring fit cannot use (e.g. no light in the window)
		}
		rec := &recs[i]
		if pdg := (ring.PIDCut{}).PDG(rec); pdg != 0 {
			sm.identified++
			if pdg == want.PDG() {
				sm.correct++
			}
		}
		// Resolutions under the true hypothesis.
		r := &rec.Electron
		if want == ring.Muon {
			r = &rec.Muon
		}
		if r.Status != fit.Converged {
			continue
		}
		if r.Exiting() {
			sm.exiting++
			continue
		}
		tr := truthOf(sm.events[i])
		sm.fitted = append(sm.fitted, resolution.Sample{Vertex: r.Track.Vertex, Dir: r.Track.Dir, Energy: r.Track.Ekin})
		sm.truth = append(sm.truth, tr)
		if v, e, ok := ringPulls(r, tr); ok {
			sm.ringVertexPull = append(sm.ringVertexPull, v[:]...)
			sm.ringEnergyPull = append(sm.ringEnergyPull, e)
		}
		if sm.example == nil {
			beta := phys.Beta(r.Track.Ekin, want.Mass())
			sm.example = sm.events[i]
			sm.exampleTrack = track{vertex: r.Track.Vertex, dir: r.Track.Dir, time: r.Track.Time,
				cos: math.Min(1/(n*beta), 0.999), label: "ring fit (" + want.String() + ")"}
		}
	}
	return nil
}

// ringPulls returns the vertex (x, y, z) and kinetic-energy pulls of a
// ring fit against the truth, when the fit holds valid uncertainties (the
// fitter computes them for the hypothesis with the better likelihood
// only). It is the one place that reads the ring fitter's uncertainties.
func ringPulls(r *ring.Result, tr resolution.Sample) (vertex [3]float64, energy float64, ok bool) {
	e := r.Errors
	if !r.ErrorsValid || !(e.Vertex.X > 0 && e.Vertex.Y > 0 && e.Vertex.Z > 0 && e.Ekin > 0) {
		return vertex, 0, false
	}
	d := r.Track.Vertex.Sub(tr.Vertex)
	return [3]float64{d.X / e.Vertex.X, d.Y / e.Vertex.Y, d.Z / e.Vertex.Z}, (r.Track.Ekin - tr.Energy) / e.Ekin, true
}

func est(e resolution.Estimate, scale float64) string {
	return fmt.Sprintf("%.1f ± %.1f", scale*e.Value, scale*e.Err)
}

// interval writes a quantile with its asymmetric 1-sigma bounds: with
// few events the bounds are far from symmetric, and a symmetric error
// larger than the value would reach below zero.
func interval(q resolution.Interval) string {
	return fmt.Sprintf("%.1f +%.1f/-%.1f", q.Value, q.Hi-q.Value, q.Value-q.Lo)
}

func printTable(w io.Writer, samples []*sample) {
	fmt.Fprintf(w, "\nreconstruction (resolutions of converged fits; identity from the two-hypothesis ring fit)\n")
	fmt.Fprintf(w, "%-6s %8s %-10s %9s  %-17s %-17s %-13s %-13s %s\n",
		"part.", "E (MeV)", "fitter", "conv/fit", "vertex68(cm)", "dir68(deg)", "E res. (%)", "E bias (%)", "identified correctly")
	for _, sm := range samples {
		if sm.fitter == "" {
			fmt.Fprintf(w, "%-6s %8g %-10s  (below the ring fitter's range; not reconstructed)\n", sm.name, sm.energy, "-")
			continue
		}
		cols := []string{"-", "-", "-", "-"}
		if len(sm.fitted) >= minSummary {
			if s, err := resolution.Summarize(sm.fitted, sm.truth); err == nil {
				cols = []string{interval(s.Vertex68Interval), interval(s.Direction68Interval), est(s.EnergyResolution, 100), est(s.EnergyBias, 100)}
			}
		}
		id := "-"
		if sm.fitter == "ring" && sm.identified > 0 {
			if b, err := resolution.Proportion(sm.correct, sm.identified); err == nil {
				id = b.Percent()
			}
		}
		fmt.Fprintf(w, "%-6s %8g %-10s %4d/%-4d  %-17s %-17s %-13s %-13s %s\n",
			sm.name, sm.energy, sm.fitter, len(sm.fitted), sm.tried, cols[0], cols[1], cols[2], cols[3], id)
	}
	fmt.Fprintf(w, "vertex68, dir68: 68%% quantiles of the distance to the true vertex and the angle to the true direction,\n"+
		"  with the order statistics at ranks n p -/+ sqrt(n p (1-p)) as 1-sigma bounds; E res., E bias: width and mean\n"+
		"  of the Gaussian core of (E_fit - E_true)/E_true; identified correctly: central 68.3%% CL Clopper-Pearson\n"+
		"  interval, or the 90%% CL one-sided limit when all or none of the identified events are\n")
	for _, sm := range samples {
		if sm.exiting > 0 {
			fmt.Fprintf(w, "%s %g MeV: %d of %d ring fits leave the tank; their energies are lower bounds, left out of the resolutions\n",
				sm.name, sm.energy, sm.exiting, sm.tried)
		}
	}
}

// writeFigures writes the pictures of the run to the output folder.
func writeFigures(o options, low *lowenergy.Fitter, cfg sim.Config, samples []*sample) ([]string, error) {
	var files []string
	save := func(name string, f display.Figure, w, h vg.Length) error {
		for _, ext := range []string{"png", "svg"} {
			path := filepath.Join(o.out, name+"."+ext)
			if err := display.Save(path, f, w, h); err != nil {
				return err
			}
			files = append(files, path)
		}
		return nil
	}
	// The event pictures: the brightest sample's first fitted event.
	var ex *sample
	for _, sm := range samples {
		if sm.example != nil && (ex == nil || len(sm.example.Hits) > len(ex.example.Hits)) {
			ex = sm
		}
	}
	if ex != nil {
		t := ex.exampleTrack
		tr := &display.Track{Vertex: t.vertex, Dir: t.dir, CosCherenkov: t.cos, Label: t.label}
		if !cfg.Detector.Contains(tr.Vertex) {
			tr = nil
		}
		title := fmt.Sprintf("event %d: %s %g MeV in the demo tank", ex.example.Number, ex.name, ex.energy)
		ed, err := display.NewEventDisplay(display.EventConfig{Detector: cfg.Detector, Hits: ex.example.Hits, Track: tr, Title: title})
		if err != nil {
			return nil, err
		}
		if err := save("event", ed, 8*vg.Inch, 7.5*vg.Inch); err != nil {
			return nil, err
		}
		cp, err := display.NewChargeProfilePlot(display.ProfileConfig{Detector: cfg.Detector, Hits: ex.example.Hits, Vertex: t.vertex, Dir: t.dir,
			CosCherenkov: t.cos, Title: title + ", " + t.label})
		if err != nil {
			return nil, err
		}
		if err := save("charge-angle", cp, 6*vg.Inch, 4*vg.Inch); err != nil {
			return nil, err
		}
	}
	// The residuals are those of a point source: drawn for the point
	// (low-energy) fit when there is one, else for the track start of the
	// ring fit, whose later light arrives early (negative residuals).
	rex := ex
	for _, sm := range samples {
		if sm.fitter == "low-energy" && sm.example != nil {
			rex = sm
			break
		}
	}
	if rex != nil {
		t := rex.exampleTrack
		plo, phi := low.PromptWindow()
		rp, err := display.NewResidualPlot(display.ResidualConfig{Detector: cfg.Detector, Hits: rex.example.Hits, Vertex: t.vertex, Time: t.time,
			GroupVelocity: low.GroupVelocity(), PromptLo: plo, PromptHi: phi,
			Title: fmt.Sprintf("event %d: %s %g MeV, %s", rex.example.Number, rex.name, rex.energy, t.label)})
		if err != nil {
			return nil, err
		}
		if err := save("residuals", rp, 6*vg.Inch, 4*vg.Inch); err != nil {
			return nil, err
		}
	}
	if err := resolutionFigure(samples, save); err != nil {
		return nil, err
	}
	if err := pullFigure(samples, save); err != nil {
		return nil, err
	}
	if err := misIDFigure(samples, save); err != nil {
		return nil, err
	}
	return files, nil
}

type saver func(name string, f display.Figure, w, h vg.Length) error

// resolutionFigure plots resolution and bias against energy, one series
// per particle and fitter.
func resolutionFigure(samples []*sample, save saver) error {
	type key struct{ name, fitter string }
	var keys []key
	series := map[key][4]display.Series{}
	for _, sm := range samples {
		if len(sm.fitted) < minSummary {
			continue
		}
		s, err := resolution.Summarize(sm.fitted, sm.truth)
		if err != nil {
			return err
		}
		k := key{sm.name, sm.fitter}
		cur, ok := series[k]
		if !ok {
			keys = append(keys, k)
		}
		for i, e := range []resolution.Estimate{s.Vertex68, s.Direction68, s.EnergyResolution, s.EnergyBias} {
			if i >= 2 {
				e.Value, e.Err = 100*e.Value, 100*e.Err
			}
			cur[i].Name = k.name + ", " + k.fitter + " fit"
			cur[i].Points = append(cur[i].Points, display.PointOf(sm.energy, e))
		}
		series[k] = cur
	}
	if len(keys) == 0 {
		return nil
	}
	panels := []struct{ title, caption, label string }{
		{"vertex resolution", "68% quantile of the distance to the true vertex", "vertex 68% (cm)"},
		{"direction resolution", "68% quantile of the angle to the true direction", "direction 68% (deg)"},
		{"energy resolution", "σ of the Gaussian core of ΔE/E, ΔE = E_fit - E_true", "σ(ΔE/E) (%)"},
		{"energy bias", "mean of the Gaussian core of ΔE/E, ΔE = E_fit - E_true", "mean ΔE/E (%)"},
	}
	var plots []*plot.Plot
	for i, pn := range panels {
		var ss []display.Series
		for _, k := range keys {
			ss = append(ss, series[k][i])
		}
		p, err := display.NewErrorPlot(display.ErrorPlotConfig{Title: pn.title + ", converged fits, demo tank", Caption: pn.caption, XLabel: "kinetic energy (MeV)", YLabel: pn.label, Series: ss,
			LogX: true, YFromZero: i < 3, ZeroLine: i == 3})
		if err != nil {
			return err
		}
		plots = append(plots, p)
	}
	return save("resolution", display.Grid{Rows: 2, Cols: 2, Plots: plots}, 10*vg.Inch, 8*vg.Inch)
}

// pullFigure plots the vertex and energy pulls of each fitter that has
// enough of them: a row for the low-energy fit, a row for the ring fit.
func pullFigure(samples []*sample, save saver) error {
	var vp, ep, rvp, rep []float64
	for _, sm := range samples {
		vp = append(vp, sm.vertexPull...)
		ep = append(ep, sm.energyPull...)
		rvp = append(rvp, sm.ringVertexPull...)
		rep = append(rep, sm.ringEnergyPull...)
	}
	const xlabel = "(fit - true) / fit uncertainty"
	var plots []*plot.Plot
	for _, f := range []struct {
		fitter           string
		vertex, energy   []float64
		vertexT, energyT string
	}{
		{"low-energy fit", vp, ep, "vertex x, y, z", "kinetic energy"},
		{"ring fit (true hypothesis)", rvp, rep, "track start x, y, z", "kinetic energy"},
	} {
		if len(f.vertex) < minSummary || len(f.energy) < minSummary {
			continue
		}
		a, err := display.NewPullPlot(display.PullConfig{Title: f.fitter + ": " + f.vertexT, XLabel: xlabel, Pulls: f.vertex})
		if err != nil {
			return err
		}
		b, err := display.NewPullPlot(display.PullConfig{Title: f.fitter + ": " + f.energyT, XLabel: xlabel, Pulls: f.energy})
		if err != nil {
			return err
		}
		plots = append(plots, a, b)
	}
	if len(plots) == 0 {
		return nil
	}
	rows := len(plots) / 2
	return save("pulls", display.Grid{Rows: rows, Cols: 2, Plots: plots}, 10*vg.Inch, vg.Length(rows)*4*vg.Inch)
}

// misIDFigure plots the fraction of ring-fitted events identified as the
// other particle against the true momentum: central Clopper-Pearson
// intervals, and one-sided limits where none (or all) are mis-identified.
func misIDFigure(samples []*sample, save saver) error {
	var ss []display.Series
	idx := map[string]int{}
	for _, sm := range samples {
		if sm.fitter != "ring" || sm.identified == 0 {
			continue
		}
		b, err := resolution.Proportion(sm.identified-sm.correct, sm.identified)
		if err != nil {
			return err
		}
		i, ok := idx[sm.name]
		if !ok {
			i = len(ss)
			idx[sm.name] = i
			ss = append(ss, display.Series{Name: "true " + sm.name})
		}
		sp, err := phys.Lookup(sm.pdg)
		if err != nil {
			return err
		}
		p := phys.Momentum(sm.energy, sp.Mass)
		ss[i].Points = append(ss[i].Points, display.PointOfProportion(p, b, 100))
	}
	if len(ss) == 0 {
		return nil
	}
	p, err := display.NewErrorPlot(display.ErrorPlotConfig{Title: "ring fit: e/mu mis-identification",
		Caption: "bars: 68.3% CL Clopper-Pearson; arrows: 90% CL limits", XLabel: "true momentum (MeV/c)",
		YLabel: "mis-identified (%)", Series: ss, YFromZero: true})
	if err != nil {
		return err
	}
	return save("misid", p, 6*vg.Inch, 4*vg.Inch)
}
