// Command coverage is the coverage study: how the low-energy reconstruction's
// resolutions (vertex 68%, direction 68%, energy resolution, each with its
// statistical error) change with the photocathode coverage and the sensor
// class in the demo tank, and along a second axis, the sensors'
// transit-time spread (and, on request, the water's attenuation length).
// It prints the table and writes the plots (PNG and SVG) to a folder.
//
//	go run ./examples/coverage
//	go run ./examples/coverage -energy 20 -n 400 -coverage 0.1,0.2,0.3,0.4 -sensors medium,large
//	go run ./examples/coverage -attenuation 1500,3000,6000 -tts ""
//	go run ./examples/coverage -particle mu- -energy 400 -n 40 -sensors medium -tts ""
//
// Electrons, positrons and photons up to the top of the low-energy
// fitter's calibration (lowenergy.Fitter.EkinRange, 100 MeV for the
// built-in tables) are reconstructed with it (fit/lowenergy); other particles and energies with the
// single-ring fitter (fit/ring), which fits both the electron and the muon
// hypothesis and so also gives the e/mu mis-identification (about a second
// per event: keep -n small); -fitter chooses explicitly.
//
// The README's figures are made with
//
//	go run ./examples/coverage -out docs -formats png
//
// Every point simulates the same primaries (the gun draws from the event's
// own random stream, sim.EventStream), so the points differ by the detector
// alone. The fit's embedded tables are those of the demo tank (medium
// sensors at 30%); its residual table is intrinsic and convolved with each
// sensor's transit-time spread, so other classes and coverages need none.
// Only converged fits enter the resolutions; the table gives their number.
package main

import (
	"cmp"
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"os/signal"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/examples/internal/parallel"
	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/display"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/fit/ring"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

type options struct {
	particle    string
	energy      float64
	n           int
	seed        uint64
	out         string
	coverages   []float64
	sensors     []string
	tts         []float64 // scale factors of the reference sensor's TTS
	attenuation []float64 // cm at attenuationWavelength
	formats     []string
	quiet       bool
	fitter      string // auto, low or ring
	detector    string // -detector (detflag): the tank, water, liner and trigger; empty means the demo tank
}

// The reference point of the second study axes: the class and coverage the
// fit's embedded tables were made with.
const (
	refSensor             = "medium"
	refCoverage           = 0.3
	attenuationWavelength = 400.0 // nm
	referenceWavelength   = 400.0 // nm, sets the refractive index of the drawn ring
	fiducial              = 100.0 // cm from the wall, as the fit's resolution baseline
)

var models = map[string]func() pmt.Model{"large": pmt.Large, "medium": pmt.Medium, "small": pmt.Small}

// pdg returns the PDG code of o.particle (checked by validate).
func (o *options) pdg() int { p, _ := phys.ParsePDG(o.particle); return p }

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "coverage",
	Does:    "Measures how the reconstruction's resolutions (vertex, direction, energy 68%, each with its statistical error) change with photocathode coverage, sensor class, transit-time spread and water attenuation in the demo tank.",
	Reads:   "nothing (simulates its own events)",
	Writes:  "the table on standard output; plots (PNG, SVG) into -out",
	Example: "go run ./examples/coverage -energy 20 -n 400 -coverage 0.1,0.2,0.3,0.4 -sensors medium,large",
}

func main() {
	var o options
	flag.StringVar(&o.particle, "particle", "e-", "particle: e-, e+, gamma, mu-, mu+")
	flag.Float64Var(&o.energy, "energy", 10, "kinetic energy, MeV")
	flag.IntVar(&o.n, "n", 200, "events per point")
	flag.Uint64Var(&o.seed, "seed", 1, "run seed (the same primaries at every point)")
	flag.StringVar(&o.out, "out", "coverage-out", "output folder")
	cov := flag.String("coverage", "0.1,0.2,0.3,0.4", "comma-separated photocathode coverages")
	sens := flag.String("sensors", "large,medium,small", "comma-separated sensor classes: large, medium, small")
	tts := flag.String("tts", "0.5,1,2,4", "comma-separated scale factors of the medium sensor's transit-time spread at 30% coverage (empty: skip)")
	att := flag.String("attenuation", "", "comma-separated water attenuation lengths (cm at 400 nm) at medium 30% (empty: skip)")
	formats := flag.String("formats", "png,svg", "figure formats: png, svg")
	flag.BoolVar(&o.quiet, "quiet", false, "no progress on stderr")
	flag.StringVar(&o.detector, "detector", detflag.Default, detflag.Usage+"; its tank, water, liner and trigger are kept, its sensors replaced at each point")
	flag.StringVar(&o.fitter, "fitter", "auto", "reconstruction: low (low-energy fit), ring (single-ring fit with e/mu identity, about a second per event), auto (low for e-, e+, gamma up to the top of the low-energy fitter's calibrated range, ring otherwise)")
	cli.Parse(usage)
	var err error
	if o.coverages, err = parseList("-coverage", *cov); err != nil {
		fail(err)
	}
	if o.tts, err = parseList("-tts", *tts); err != nil {
		fail(err)
	}
	if o.attenuation, err = parseList("-attenuation", *att); err != nil {
		fail(err)
	}
	o.sensors = splitList(*sens)
	o.formats = splitList(*formats)
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	if _, err := run(ctx, os.Stdout, os.Stderr, o); err != nil {
		fail(err)
	}
}

func fail(err error) {
	fmt.Fprintln(os.Stderr, "coverage:", err)
	os.Exit(1)
}

func splitList(s string) []string {
	var out []string
	for _, f := range strings.Split(s, ",") {
		if f = strings.TrimSpace(f); f != "" {
			out = append(out, f)
		}
	}
	return out
}

// parseList parses comma-separated positive numbers; an empty string is
// an empty list.
func parseList(flagName, s string) ([]float64, error) {
	var out []float64
	for _, f := range splitList(s) {
		v, err := strconv.ParseFloat(f, 64)
		if err != nil || !(v > 0) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%s: %q is not a positive number", flagName, f)
		}
		out = append(out, v)
	}
	return out, nil
}

// setup is one detector configuration of the study.
type setup struct {
	sensor      string
	coverage    float64
	ttsScale    float64
	attenuation float64 // cm, 0: pure water
}

// point is the measurement at one setup.
type point struct {
	setup
	reached float64 // coverage the layout reached
	sensors int
	tts     float64 // ns
	// pureWater says the point's water is pure water at 20 C; waterAtt is
	// its attenuation length (cm) at attenuationWavelength.
	pureWater bool
	waterAtt  float64
	events    int // simulated
	triggered int
	fitted    int // converged fits
	sum       resolution.Summary
	// identified counts the ring-fitted events given an identity and
	// misID those given the wrong one.
	identified, misID int
	// example is the first converged event, for the event display, and
	// det the detector of the point.
	example *example
	det     *geom.Detector
}

type example struct {
	ev     *event.Event
	track  display.Track
	energy float64 // fitted, MeV
}

func isElectromagnetic(pdg int) bool {
	return pdg == phys.Electron || pdg == phys.Positron || pdg == phys.Gamma
}

// useRing reports whether the study reconstructs with the single-ring
// fitter; low is the low-energy fitter of the detector (nil with -fitter
// ring), which "auto" uses for electromagnetic particles up to the top of
// its calibrated range.
func (o *options) useRing(low *lowenergy.Fitter) bool {
	if o.fitter == "ring" {
		return true
	}
	_, lowEnergyMax := low.EkinRange()
	return o.fitter == "auto" && !(isElectromagnetic(o.pdg()) && o.energy <= lowEnergyMax)
}

func (o *options) validate() error {
	if o.n < 2 {
		return fmt.Errorf("-n = %d must be at least 2", o.n)
	}
	if !(o.energy > 0) || math.IsInf(o.energy, 0) {
		return fmt.Errorf("-energy = %g must be positive and finite", o.energy)
	}
	if _, err := phys.ParsePDG(o.particle); err != nil {
		return fmt.Errorf("-particle: %w", err)
	}
	for _, s := range o.sensors {
		if _, ok := models[s]; !ok {
			return fmt.Errorf("-sensors: unknown class %q (want large, medium or small)", s)
		}
	}
	for _, c := range o.coverages {
		if c >= 1 {
			return fmt.Errorf("-coverage: %g must be below 1", c)
		}
	}
	for _, f := range o.formats {
		if f != "png" && f != "svg" {
			return fmt.Errorf("-formats: %q is not png or svg", f)
		}
	}
	switch o.fitter {
	case "":
		o.fitter = "auto"
	case "auto", "low", "ring":
	default:
		return fmt.Errorf("-fitter: %q is not auto, low or ring", o.fitter)
	}
	if len(o.coverages) == 0 || len(o.sensors) == 0 {
		return fmt.Errorf("-coverage and -sensors need at least one value each")
	}
	return nil
}

// run does the study and writes the figures; it returns the points in
// the order of the table.
func run(ctx context.Context, stdout, stderr io.Writer, o options) ([]point, error) {
	if err := o.validate(); err != nil {
		return nil, err
	}
	if err := os.MkdirAll(o.out, 0o755); err != nil {
		return nil, err
	}
	var setups []setup
	for _, s := range o.sensors {
		for _, c := range o.coverages {
			setups = append(setups, setup{sensor: s, coverage: c, ttsScale: 1})
		}
	}
	for _, f := range o.tts {
		if f != 1 { // TTS x1 is the reference point of the coverage scan, or is added below
			setups = append(setups, setup{sensor: refSensor, coverage: refCoverage, ttsScale: f})
		}
	}
	if hasRef := slices.Contains(o.sensors, refSensor) && slices.Contains(o.coverages, refCoverage); !hasRef && (len(o.tts) > 0 || len(o.attenuation) > 0) {
		setups = append(setups, setup{sensor: refSensor, coverage: refCoverage, ttsScale: 1})
	}
	for _, a := range o.attenuation {
		setups = append(setups, setup{sensor: refSensor, coverage: refCoverage, ttsScale: 1, attenuation: a})
	}
	fmt.Fprintf(stdout, "coverage study: %s %g MeV, %d events per point, vertices %g cm or more inside the wall, seed %d\n\n",
		o.particle, o.energy, o.n, fiducial, o.seed)
	fmt.Fprintf(stdout, "%-7s %6s %7s %8s %7s %8s %7s  %-13s %-13s %-14s %-14s %s\n",
		"sensor", "cover.", "sensors", "TTS(ns)", "att(m)", "trig.", "fitted", "vertex68(cm)", "dir68(deg)", "E res. (%)", "E bias (%)", "mis-ID (%)")
	var pts []point
	for i, su := range setups {
		if !o.quiet {
			fmt.Fprintf(stderr, "\rpoint %d/%d: %s at %.0f%%, TTS x%g   ", i+1, len(setups), su.sensor, 100*su.coverage, su.ttsScale)
		}
		p, err := measure(ctx, o, su)
		if !o.quiet {
			fmt.Fprintf(stderr, "\r%60s\r", "")
		}
		if err != nil {
			return nil, fmt.Errorf("%s at coverage %g: %w", su.sensor, su.coverage, err)
		}
		pts = append(pts, p)
		att := "pure"
		if su.attenuation > 0 || !p.pureWater {
			att = fmt.Sprintf("%.0f", p.waterAtt/100)
		}
		misID := "-"
		if b, ok := misIDOf(p); ok {
			misID = b.Percent()
		}
		fmt.Fprintf(stdout, "%-7s %6.3f %7d %8.2f %7s %8d %7d  %-13s %-13s %-14s %-14s %s\n",
			su.sensor, p.reached, p.sensors, p.tts, att, p.triggered, p.fitted,
			est(p.sum.Vertex68, 1), est(p.sum.Direction68, 1), est(p.sum.EnergyResolution, 100), est(p.sum.EnergyBias, 100), misID)
	}
	if !o.quiet {
		fmt.Fprintln(stderr)
	}
	files, err := writeFigures(o, pts)
	if err != nil {
		return nil, err
	}
	fmt.Fprintf(stdout, "\nfigures: %s\n", strings.Join(files, " "))
	return pts, nil
}

func est(e resolution.Estimate, scale float64) string {
	if e.Err == 0 && e.Value == 0 {
		return "-"
	}
	return fmt.Sprintf("%.1f ± %.1f", scale*e.Value, scale*e.Err)
}

// measure simulates and fits the events of one setup.
func measure(ctx context.Context, o options, su setup) (point, error) {
	model := models[su.sensor]()
	model.TTS *= su.ttsScale
	cfg, err := detflag.Config(o.detector, o.seed)
	if err != nil {
		return point{}, err
	}
	det, err := geom.Layout(cfg.Detector.Tank(), model.CathodeDiameter, su.coverage)
	if err != nil {
		return point{}, err
	}
	// A new layout: the description's dead-sensor indices mean nothing in it.
	cfg.Detector, cfg.Sensor, cfg.Dead = det, model, nil
	if su.attenuation > 0 {
		wc := cfg.Water.Config()
		wc.AbsorptionScale = optics.DefaultWaterConfig().AbsorptionScale
		wc.AttenuationLength, wc.AttenuationWavelength = su.attenuation, attenuationWavelength
		if cfg.Water, err = optics.NewWater(wc); err != nil {
			return point{}, err
		}
	}
	s, err := sim.New(cfg)
	if err != nil {
		return point{}, err
	}
	g, err := gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{{PDG: o.pdg(), Ekin: gen.FixedEnergy(o.energy), Direction: gen.Isotropic()}},
		Vertex:    gen.InFiducial(det.Tank(), fiducial),
	})
	if err != nil {
		return point{}, err
	}
	var evs []*event.Event
	if err := s.Run(ctx, g, sim.RunOptions{Count: uint64(o.n)}, func(e *event.Event) error {
		evs = append(evs, e)
		return nil
	}); err != nil {
		return point{}, err
	}
	p := point{setup: su, reached: det.Coverage(), sensors: det.NumSensors(), tts: model.TTS, events: o.n, triggered: len(evs), det: det,
		pureWater: cfg.Water.Config() == optics.DefaultWaterConfig(),
		waterAtt:  1 / (1/cfg.Water.AbsorptionLength(attenuationWavelength) + 1/cfg.Water.ScatteringLength(attenuationWavelength))}
	var fits, truth []resolution.Sample
	add := func(ev *event.Event, tr display.Track, energy float64) {
		pr := ev.Truth.Primaries[0]
		fits = append(fits, resolution.Sample{Vertex: tr.Vertex, Dir: tr.Dir, Energy: energy})
		truth = append(truth, resolution.Sample{Vertex: pr.Pos, Dir: pr.Dir, Energy: pr.Ekin})
		if p.example == nil {
			p.example = &example{ev: ev, track: tr, energy: energy}
		}
	}
	n := s.Config().Water.Index(referenceWavelength)
	var low *lowenergy.Fitter
	if o.fitter != "ring" {
		c := s.Config()
		if low, err = lowenergy.New(lowenergy.Config{Setup: c.Setup}); err != nil {
			return point{}, err
		}
	}
	if o.useRing(low) {
		err = fitRing(ctx, o, s.Config(), evs, &p, n, add)
	} else {
		err = fitLow(ctx, low, evs, n, add)
	}
	if err != nil {
		return point{}, err
	}
	p.fitted = len(fits)
	if len(fits) >= 5 { // the fewest resolution.Summarize accepts
		if p.sum, err = resolution.Summarize(fits, truth); err != nil {
			return point{}, err
		}
	}
	return p, nil
}

// fitLow reconstructs the events with the low-energy fitter and passes
// the converged ones to add.
func fitLow(ctx context.Context, f *lowenergy.Fitter, evs []*event.Event, n float64, add func(*event.Event, display.Track, float64)) error {
	results := make([]lowenergy.Result, len(evs))
	errs := make([]error, len(evs))
	if err := parallel.Each(ctx, len(evs), func() struct{} { return struct{}{} }, func(_ struct{}, i int) {
		results[i], errs[i] = f.Fit(evs[i].Hits)
	}); err != nil {
		return err
	}
	for i, r := range results {
		if errs[i] != nil {
			return fmt.Errorf("event %d: %w", evs[i].Number, errs[i])
		}
		if r.Status == fit.Converged {
			add(evs[i], display.Track{Vertex: r.Track.Vertex, Dir: r.Track.Dir, CosCherenkov: 1 / n, Label: "low-energy fit"}, r.Track.Ekin)
		}
	}
	return nil
}

// fitRing reconstructs the events with the single-ring fitter under both
// hypotheses, counts the identities (ring.PIDCut{}) and passes the
// converged fits of the true hypothesis to add. Energies outside the
// fitter's tables are an error.
func fitRing(ctx context.Context, o options, cfg sim.Config, evs []*event.Event, p *point, n float64, add func(*event.Event, display.Track, float64)) error {
	want := ring.Muon
	if isElectromagnetic(o.pdg()) {
		want = ring.Electron
	}
	rf, err := ring.New(ring.Config{Setup: cfg.Setup, SkipUncertainties: true})
	if err != nil {
		return err
	}
	if lo, hi := rf.EkinRange(want); o.energy < lo || o.energy > hi {
		return fmt.Errorf("-energy = %g MeV is outside the ring fitter's %s tables (%g to %g MeV)", o.energy, want, lo, hi)
	}
	recs := make([]ring.Reconstruction, len(evs))
	errs := make([]error, len(evs))
	if err := parallel.Each(ctx, len(evs), func() struct{} { return struct{}{} }, func(_ struct{}, i int) {
		recs[i], errs[i] = rf.Fit(evs[i].Hits, ring.Window{})
	}); err != nil {
		return err
	}
	for i := range recs {
		if errs[i] != nil {
			continue // an event the ring fit cannot use (e.g. no light in the window)
		}
		if id := (ring.PIDCut{}).PDG(&recs[i]); id != 0 {
			p.identified++
			if id != want.PDG() {
				p.misID++
			}
		}
		r := &recs[i].Electron
		if want == ring.Muon {
			r = &recs[i].Muon
		}
		if r.Status == fit.Converged {
			cos := math.Min(1/(n*phys.Beta(r.Track.Ekin, want.Mass())), 0.999)
			add(evs[i], display.Track{Vertex: r.Track.Vertex, Dir: r.Track.Dir, CosCherenkov: cos, Label: "ring fit (" + want.String() + ")"}, r.Track.Ekin)
		}
	}
	return nil
}

// misIDOf returns the mis-identified fraction of p, if it was measured:
// the central Clopper-Pearson interval, or the one-sided limit when none
// (or all) are mis-identified (resolution.Proportion).
func misIDOf(p point) (resolution.Binomial, bool) {
	if p.identified == 0 {
		return resolution.Binomial{}, false
	}
	b, err := resolution.Proportion(p.misID, p.identified)
	return b, err == nil
}

// quantity is one resolution column of the study plots: the point of a
// measurement at x, if it was measured.
type quantity struct {
	title, label, caption string
	point                 func(p point, x float64) (display.Point, bool)
}

func summaryOf(scale float64, f func(resolution.Summary) resolution.Estimate) func(point, float64) (display.Point, bool) {
	return func(p point, x float64) (display.Point, bool) {
		e := f(p.sum)
		return display.Point{X: x, Y: scale * e.Value, Err: scale * e.Err}, p.fitted >= 5
	}
}

var quantities = []quantity{
	{"vertex resolution", "vertex 68% (cm)", "68% quantile of the distance to the true vertex", summaryOf(1, func(s resolution.Summary) resolution.Estimate { return s.Vertex68 })},
	{"direction resolution", "direction 68% (deg)", "68% quantile of the angle to the true direction", summaryOf(1, func(s resolution.Summary) resolution.Estimate { return s.Direction68 })},
	{"energy resolution", "σ(ΔE/E) (%)", "σ of the Gaussian core of (E_fit - E_true)/E_true", summaryOf(100, func(s resolution.Summary) resolution.Estimate { return s.EnergyResolution })},
	{"e/mu mis-identification, ring fit", "mis-identified (%)", "bars: 68.3% CL Clopper-Pearson, arrows: 90% CL limits", func(p point, x float64) (display.Point, bool) {
		b, ok := misIDOf(p)
		return display.PointOfProportion(x, b, 100), ok
	}},
}

// studyRow is one row of plots: the three resolutions against x for each
// group of points (one series per group).
func studyRow(title, xlabel string, groups []string, pts [][]point, x func(point) float64) ([]*plot.Plot, error) {
	var row []*plot.Plot
	for _, q := range quantities {
		var series []display.Series
		n := 0
		for g, name := range groups {
			s := display.Series{Name: name}
			for _, p := range pts[g] {
				pt, ok := q.point(p, x(p))
				if !ok {
					continue
				}
				n++
				s.Points = append(s.Points, pt)
			}
			series = append(series, s)
		}
		if n == 0 {
			continue
		}
		pl, err := display.NewErrorPlot(display.ErrorPlotConfig{Title: q.title + ", " + title, Caption: q.caption, XLabel: xlabel, YLabel: q.label, Series: series, YFromZero: true})
		if err != nil {
			return nil, err
		}
		row = append(row, pl)
	}
	return row, nil
}

// writeFigures writes the coverage figure, the second-axis figure(s) and
// the event display of the reference point.
func writeFigures(o options, pts []point) ([]string, error) {
	var files []string
	save := func(name string, f display.Figure, w, h vg.Length) error {
		for _, ext := range o.formats {
			path := filepath.Join(o.out, name+"."+ext)
			if err := display.Save(path, f, w, h); err != nil {
				return err
			}
			files = append(files, path)
		}
		return nil
	}
	title := fmt.Sprintf("%s %g MeV, demo tank", o.particle, o.energy)
	var groups []string
	var byClass [][]point
	for _, s := range o.sensors {
		var g []point
		for _, p := range pts {
			if p.sensor == s && p.ttsScale == 1 && p.attenuation == 0 {
				g = append(g, p)
			}
		}
		m := models[s]()
		groups = append(groups, fmt.Sprintf("%s (%.0f cm)", m.Name, m.CathodeDiameter))
		byClass = append(byClass, g)
	}
	row, err := studyRow(title, "photocathode coverage", groups, byClass, func(p point) float64 { return p.reached })
	if err != nil {
		return nil, err
	}
	if err := save("coverage", display.Grid{Rows: 1, Cols: len(row), Plots: row}, vg.Length(len(row))*13*vg.Inch/3, 4.5*vg.Inch); err != nil {
		return nil, err
	}
	axes := []struct {
		name, xlabel string
		values       int
		pick         func(point) bool
		x            func(point) float64
	}{
		{"tts", "transit-time spread σ (ns)", len(o.tts), func(p point) bool { return p.attenuation == 0 }, func(p point) float64 { return p.tts }},
		{"attenuation", "water attenuation length at 400 nm (m)", len(o.attenuation), func(p point) bool { return p.ttsScale == 1 && p.attenuation > 0 }, func(p point) float64 { return p.attenuation / 100 }},
	}
	ref := models[refSensor]()
	for _, a := range axes {
		if a.values == 0 {
			continue
		}
		var g []point
		for _, p := range pts {
			if p.sensor == refSensor && p.coverage == refCoverage && a.pick(p) {
				g = append(g, p)
			}
		}
		slices.SortFunc(g, func(p, q point) int { return cmp.Compare(a.x(p), a.x(q)) })
		row, err := studyRow(title, a.xlabel, []string{fmt.Sprintf("%s at %.0f%%", ref.Name, 100*refCoverage)}, [][]point{g}, a.x)
		if err != nil {
			return nil, err
		}
		if err := save("coverage-"+a.name, display.Grid{Rows: 1, Cols: len(row), Plots: row}, vg.Length(len(row))*13*vg.Inch/3, 4.5*vg.Inch); err != nil {
			return nil, err
		}
	}
	// The event display of the reference point (or the first point with a fit).
	var ex *point
	for i := range pts {
		if pts[i].example != nil && (ex == nil || (pts[i].sensor == refSensor && pts[i].coverage == refCoverage && pts[i].ttsScale == 1 && pts[i].attenuation == 0)) {
			ex = &pts[i]
			if ex.sensor == refSensor && ex.coverage == refCoverage {
				break
			}
		}
	}
	if ex != nil {
		fig, err := eventFigure(o, *ex)
		if err != nil {
			return nil, err
		}
		if err := save("event", fig, 8*vg.Inch, 7.5*vg.Inch); err != nil {
			return nil, err
		}
	}
	return files, nil
}

// eventFigure draws the example event of p with its fit.
func eventFigure(o options, p point) (display.Figure, error) {
	ex := p.example
	tr := &ex.track
	if !p.det.Contains(tr.Vertex) {
		tr = nil
	}
	return display.NewEventDisplay(display.EventConfig{
		Detector: p.det, Hits: ex.ev.Hits, Track: tr,
		Title: fmt.Sprintf("event %d: %s %g MeV, %s sensors at %.0f%% coverage; fit %.1f MeV", ex.ev.Number, o.particle, o.energy, models[p.sensor]().Name, 100*p.coverage, ex.energy),
	})
}
