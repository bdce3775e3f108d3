package main

import (
	"context"
	"fmt"
	"github.com/conelight/conelight/examples/internal/parallel"
	"io"
	"math"
	"path/filepath"
	"strings"
	"sync"

	"github.com/golang/geo/r3"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/display"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/fit/ring"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
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
	low, err := lowenergy.New(lowenergy.Config{Setup: setup.Setup{Detector: cfg.Detector, Sensor: cfg.Sensor, Water: cfg.Water, Liner: cfg.Liner}})
	if err != nil {
		return err
	}
	// Electromagnetic samples up to the top of the low-energy fitter's
	// calibration go to it; below its bottom nothing fits better.
	_, lowEnergyMax := low.EkinRange()
	var rf *ring.Fitter
	if o.ringFit > 0 {
		if rf, err = ring.New(ring.Config{Detector: cfg.Detector, Sensor: cfg.Sensor, Water: cfg.Water, Liner: cfg.Liner, SkipUncertainties: true}); err != nil {
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
	lo, hi := rf.EnergyRange(hypothesisOf(sm.pdg))
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
	if err := parallel.Each(ctx, k, rf.NewWorkspace, func(w *ring.Workspace, i int) {
		recs[i], errs[i] = w.Fit(sm.events[i].Hits, ring.Window{})
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
		if !r.Converged {
			continue
		}
		if r.Exiting() {
			sm.exiting++
			continue
		}
		tr := truthOf(sm.events[i])
		sm.fitted = append(sm.fitted, resolution.Sample{Vertex: r.Track.Vertex, Dir: r.Track.Dir, Energy: r.Track.Ekin})
		sm.truth = append(sm.truth, tr)
		if sm.example == nil {
			beta := phys.Beta(r.Track.Ekin, want.Mass())
			sm.example = sm.events[i]
			sm.exampleTrack = track{vertex: r.Track.Vertex, dir: r.Track.Dir, time: r.Track.Time,
				cos: math.Min(1/(n*beta), 0.999), label: "ring fit (" + want.String() + ")"}
		}
	}
	return nil
}

func est(e resolution.Estimate, scale float64) string {
	return fmt.Sprintf("%.1f ± %.1f", scale*e.Value, scale*e.Err)
}

func printTable(w io.Writer, samples []*sample) {
	fmt.Fprintf(w, "\nreconstruction (resolutions of converged fits; identity from the two-hypothesis ring fit)\n")
	fmt.Fprintf(w, "%-6s %8s %-10s %9s  %-13s %-13s %-13s %-13s %s\n",
		"part.", "E (MeV)", "fitter", "conv/fit", "vertex68(cm)", "dir68(deg)", "E res. (%)", "E bias (%)", "identified correctly")
	for _, sm := range samples {
		if sm.fitter == "" {
			fmt.Fprintf(w, "%-6s %8g %-10s  (below the ring fitter's range; not reconstructed)\n", sm.name, sm.energy, "-")
			continue
		}
		cols := []string{"-", "-", "-", "-"}
		if len(sm.fitted) >= minSummary {
			if s, err := resolution.Summarize(sm.fitted, sm.truth); err == nil {
				cols = []string{est(s.Vertex68, 1), est(s.Direction68, 1), est(s.EnergyResolution, 100), est(s.EnergyBias, 100)}
			}
		}
		id := "-"
		if sm.fitter == "ring" && sm.identified > 0 {
			f, _ := display.Fraction(sm.correct, sm.identified)
			id = fmt.Sprintf("%d/%d = %.0f ± %.0f%%", sm.correct, sm.identified, 100*f.Value, 100*f.Err)
		}
		fmt.Fprintf(w, "%-6s %8g %-10s %4d/%-4d  %-13s %-13s %-13s %-13s %s\n",
			sm.name, sm.energy, sm.fitter, len(sm.fitted), sm.tried, cols[0], cols[1], cols[2], cols[3], id)
	}
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
	labels := []string{"vertex resolution, 68% (cm)", "direction resolution, 68% (deg)", "energy resolution (%)", "energy bias (%)"}
	var plots []*plot.Plot
	for i, l := range labels {
		var ss []display.Series
		for _, k := range keys {
			ss = append(ss, series[k][i])
		}
		p, err := display.NewErrorPlot(display.ErrorPlotConfig{Title: "demo tank", XLabel: "kinetic energy (MeV)", YLabel: l, Series: ss,
			LogX: true, YFromZero: i < 3, ZeroLine: i == 3})
		if err != nil {
			return err
		}
		plots = append(plots, p)
	}
	return save("resolution", display.Grid{Rows: 2, Cols: 2, Plots: plots}, 10*vg.Inch, 8*vg.Inch)
}

// pullFigure plots the low-energy fit's vertex and energy pulls.
func pullFigure(samples []*sample, save saver) error {
	var vp, ep []float64
	for _, sm := range samples {
		vp = append(vp, sm.vertexPull...)
		ep = append(ep, sm.energyPull...)
	}
	if len(vp) < minSummary || len(ep) < minSummary {
		return nil
	}
	a, err := display.NewPullPlot(display.PullConfig{Title: "low-energy fit: vertex x, y, z", XLabel: "(fit - true) / fit uncertainty", Pulls: vp})
	if err != nil {
		return err
	}
	b, err := display.NewPullPlot(display.PullConfig{Title: "low-energy fit: energy", XLabel: "(fit - true) / fit uncertainty", Pulls: ep})
	if err != nil {
		return err
	}
	return save("pulls", display.Grid{Rows: 1, Cols: 2, Plots: []*plot.Plot{a, b}}, 10*vg.Inch, 4*vg.Inch)
}

// misIDFigure plots the fraction of ring-fitted events identified as the
// other particle against the true momentum.
func misIDFigure(samples []*sample, save saver) error {
	var ss []display.Series
	idx := map[string]int{}
	for _, sm := range samples {
		if sm.fitter != "ring" || sm.identified == 0 {
			continue
		}
		f, err := display.Fraction(sm.identified-sm.correct, sm.identified)
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
		ss[i].Points = append(ss[i].Points, display.Point{X: p, Y: 100 * f.Value, Err: 100 * f.Err})
	}
	if len(ss) == 0 {
		return nil
	}
	p, err := display.NewErrorPlot(display.ErrorPlotConfig{Title: "ring fit: e/mu mis-identification", XLabel: "true momentum (MeV/c)",
		YLabel: "mis-identified (%)", Series: ss, YFromZero: true})
	if err != nil {
		return err
	}
	return save("misid", p, 6*vg.Inch, 4*vg.Inch)
}
