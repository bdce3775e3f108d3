// Command hadronstudy looks at the delayed signals of hadronic events in
// the tank: how often a charged-current single-pion-like event of about
// 1 GeV leaves a decay electron after its primary readout window, and
// when neutrons are captured in pure and gadolinium-loaded water, with
// the fraction a tagging window after the primary event would catch.
//
// The measurement is at truth level: decay electrons are found among the
// transport's secondaries (an e+ from a mu+, or an e- from a mu- later
// than any delta ray), captures in the event truth (the neutron track's
// fate and capture time, the signal photoelectrons its gammas made).
// Detector-level tagging, from the hits of the later triggers and of the
// extended readout window, awaits the simulator's readout of sub-events.
//
// The single-pion-like sample is a particle gun, an invented scenario: a
// mu- of 500 MeV within 30 degrees of the beam, a pi+ of 200 MeV and a
// proton of 150 MeV, isotropic, from one vertex in the fiducial volume.
//
//	go run ./examples/hadronstudy -n 2000 -out hadronstudy
package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"

	"github.com/golang/geo/r3"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/fit/display"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
	"github.com/conelight/conelight/sim/transport"
)

var usage = cli.Usage{
	Name: "hadronstudy",
	Does: "Truth-level study of delayed signals: decay electrons of a ~1 GeV charged-current single-pion-like sample (gun: mu- + pi+ + p) after the primary readout window, and neutron capture times, positions and tagging fractions in pure and Gd-loaded water with an extended window. " +
		"Detector-level tagging (hits of later triggers) awaits the simulator's sub-event readout.",
	Reads:   "the detector given by -detector (default: the demo tank)",
	Writes:  "the report on standard output; plots decay-time.png, capture-time.png, capture-pe.png, capture-distance.png in -out",
	Example: "go run ./examples/hadronstudy -n 2000 -out hadronstudy",
}

type options struct {
	detector   string
	n          int
	seed       uint64
	gd         float64
	windowUS   float64
	searchUS   float64
	minPE      int
	neutronMeV float64
	out        string
}

func main() {
	var o options
	flag.StringVar(&o.detector, "detector", "", detflag.Usage)
	flag.IntVar(&o.n, "n", 1000, "events per sample")
	flag.Uint64Var(&o.seed, "seed", 1, "run seed")
	flag.Float64Var(&o.gd, "gd", 0.001, "gadolinium mass fraction of the loaded water (0.001 = 0.1%)")
	flag.Float64Var(&o.windowUS, "window-us", 500, "extended window after the primary event in which a capture is looked for, us")
	flag.Float64Var(&o.searchUS, "search-us", 20, "end of the decay-electron search after the primary event, us")
	flag.IntVar(&o.minPE, "min-pe", 10, "signal photoelectrons a capture needs to count as tagged (truth level)")
	flag.Float64Var(&o.neutronMeV, "neutron-mev", 2, "kinetic energy of the neutrons, MeV")
	flag.StringVar(&o.out, "out", "hadronstudy", "folder for the plots")
	cli.Parse(usage)
	if err := run(o, os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "hadronstudy:", err)
		os.Exit(1)
	}
}

func run(o options, w io.Writer) error {
	switch {
	case o.n < 1:
		return fmt.Errorf("-n = %d: need at least 1 event", o.n)
	case !(o.gd > 0 && o.gd <= setup.MaxGdMassFraction):
		return fmt.Errorf("-gd = %g: want a mass fraction in (0, %g]", o.gd, setup.MaxGdMassFraction)
	case !(o.windowUS > 0) || !(o.searchUS > 0) || math.IsInf(o.windowUS, 0) || math.IsInf(o.searchUS, 0):
		return fmt.Errorf("-window-us = %g, -search-us = %g: want positive finite times", o.windowUS, o.searchUS)
	case o.minPE < 0:
		return fmt.Errorf("-min-pe = %d must not be negative", o.minPE)
	case !(o.neutronMeV > 0 && o.neutronMeV <= 100):
		return fmt.Errorf("-neutron-mev = %g: want (0, 100] MeV", o.neutronMeV)
	}
	s, err := detflag.Load(o.detector)
	if err != nil {
		return err
	}
	if err := os.MkdirAll(o.out, 0o755); err != nil {
		return err
	}
	fmt.Fprintf(w, "hadronstudy: detector %s, %d events per sample, seed %d\n", s.Name, o.n, o.seed)
	fmt.Fprintln(w, "TRUTH LEVEL: detector-level tagging from the hits of later triggers awaits the simulator's sub-event readout.")
	if err := decayStudy(o, s, w); err != nil {
		return err
	}
	return neutronStudy(o, s, w)
}

// decaySink follows the transport's secondaries and keeps the decay
// electrons of muons: an e+ whose parent is a mu+ (muons make no positron
// otherwise), or an e- from a mu- later than lateDelta, when every delta
// ray of a stopped muon is long made.
type decaySink struct {
	pdgOf  []int // PDG code by track number (index 0 unused)
	decays []phys.Particle
}

// lateDelta (ns): a muon of a few hundred MeV stops within about 10 ns, so
// an electron it emits later is its decay electron; decays of a mu- before
// it fall inside the primary readout window and are not taggable anyway.
const lateDelta = 100

func (d *decaySink) Segment(phys.Segment)                     {}
func (d *decaySink) Deposit(r3.Vector, float64, float64, int) {}
func (d *decaySink) Secondary(p phys.Particle) {
	for len(d.pdgOf) <= p.Track {
		d.pdgOf = append(d.pdgOf, 0)
	}
	d.pdgOf[p.Track] = p.PDG
	parent := 0
	if p.Parent > 0 && p.Parent < len(d.pdgOf) {
		parent = d.pdgOf[p.Parent]
	}
	if p.PDG == phys.Positron && parent == phys.MuonPlus || p.PDG == phys.Electron && parent == phys.MuonMinus && p.Time > lateDelta {
		d.decays = append(d.decays, p)
	}
}

// ccPionGun is the single-pion-like sample's gun (see the package
// comment).
func ccPionGun(s setup.Setup) (*gen.Gun, error) {
	beam := r3.Vector{X: 1}
	return gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{
			{PDG: phys.MuonMinus, Ekin: gen.FixedEnergy(500), Direction: gen.InCone(beam, 30*math.Pi/180)},
			{PDG: phys.PionPlusCode, Ekin: gen.FixedEnergy(200), Direction: gen.Isotropic()},
			{PDG: phys.ProtonCode, Ekin: gen.FixedEnergy(150), Direction: gen.Isotropic()},
		},
		Vertex: gen.InFiducial(s.Detector.Tank(), 200),
	})
}

func decayStudy(o options, s setup.Setup, w io.Writer) error {
	g, err := ccPionGun(s)
	if err != nil {
		return err
	}
	p, err := transport.New(material.Water(), em.DefaultConfig(), muon.DefaultConfig())
	if err != nil {
		return err
	}
	tr, err := transport.NewTracker(p)
	if err != nil {
		return err
	}
	window := s.Trigger.PostTrigger // the primary window ends this long after the event (trigger near t = 0)
	search := o.searchUS * 1e3
	var times []float64
	var any, tagged, both int
	var prims []phys.Particle
	for i := 0; i < o.n; i++ {
		rng := sim.EventStream(o.seed, uint64(i))
		if prims, _, err = g.Generate(uint64(i), rng, prims[:0]); err != nil {
			return err
		}
		sink := decaySink{pdgOf: make([]int, len(prims)+1)}
		for k, q := range prims {
			sink.pdgOf[k+1] = q.PDG
		}
		if _, err := tr.Run(prims, s.Detector, rng, &sink); err != nil {
			return fmt.Errorf("event %d: %w", i, err)
		}
		late := 0
		for _, e := range sink.decays {
			times = append(times, e.Time/1e3)
			if e.Time > window && e.Time < search {
				late++
			}
		}
		if len(sink.decays) > 0 {
			any++
		}
		if late > 0 {
			tagged++
		}
		if late > 1 {
			both++
		}
	}
	fmt.Fprintf(w, "\n1 GeV CC single-pion-like (%v)\n", g)
	for _, r := range []struct {
		name string
		k    int
	}{
		{"events with a muon decay electron (any time after 100 ns for mu-)", any},
		{fmt.Sprintf("events with one after the primary window (%.0f ns) and before %.0f us", window, o.searchUS), tagged},
		{"events with two such (mu- and pi+ -> mu+ chains)", both},
	} {
		b, err := resolution.Proportion(r.k, o.n)
		if err != nil {
			return err
		}
		fmt.Fprintf(w, "  %-88s %s\n", r.name, b.Percent())
	}
	h, err := histogram(times, 50, "decay electrons of the single-pion-like sample (truth)", "time after the event, us", "decay electrons per bin")
	if err != nil {
		return err
	}
	return save(o, "decay-time.png", h)
}

// capture is the truth of one neutron event.
type capture struct {
	time, dist float64 // ns, cm from the start
	pe         int
	captured   bool
}

func neutronStudy(o options, s setup.Setup, w io.Writer) error {
	g, err := gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{{PDG: phys.NeutronCode, Ekin: gen.FixedEnergy(o.neutronMeV), Direction: gen.Isotropic()}},
		Vertex:    gen.InFiducial(s.Detector.Tank(), 200),
	})
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "\nneutrons (%v); tagged: captured within %.0f us with >= %d signal photoelectrons\n", g, o.windowUS, o.minPE)
	type sample struct {
		name string
		caps []capture
	}
	var samples []sample
	for _, gd := range []float64{0, o.gd} {
		s.GdMassFraction = gd
		cfg := detflag.SimConfig(s, o.seed)
		cfg.NoDarkNoise, cfg.KeepUntriggered = true, true
		sm, err := sim.New(cfg)
		if err != nil {
			return err
		}
		var caps []capture
		var prims []phys.Particle
		for i := 0; i < o.n; i++ {
			if prims, _, err = g.Generate(uint64(i), sim.EventStream(o.seed, uint64(i)), prims[:0]); err != nil {
				return err
			}
			ev, err := sm.Event(uint64(i), prims)
			if err != nil {
				return err
			}
			t := ev.Truth.Tracks[0]
			caps = append(caps, capture{time: t.DecayTime, dist: t.Range, pe: ev.Truth.Photoelectrons, captured: t.Fate == phys.Captured})
		}
		name := "pure water"
		if gd > 0 {
			name = fmt.Sprintf("%.3g%% Gd", 100*gd)
		}
		samples = append(samples, sample{name, caps})
	}
	var tHists, peHists, dHists [][]float64
	var names []string
	for _, sm := range samples {
		var ts, pes, ds []float64
		tagged := 0
		for _, c := range sm.caps {
			if !c.captured {
				continue
			}
			ts, pes, ds = append(ts, c.time/1e3), append(pes, float64(c.pe)), append(ds, c.dist)
			if c.time < o.windowUS*1e3 && c.pe >= o.minPE {
				tagged++
			}
		}
		if len(ts) < 2 {
			return fmt.Errorf("%s: only %d neutrons captured", sm.name, len(ts))
		}
		mt, err := resolution.Mean(ts)
		if err != nil {
			return err
		}
		mpe, err := resolution.Mean(pes)
		if err != nil {
			return err
		}
		md, err := resolution.Mean(ds)
		if err != nil {
			return err
		}
		tag, err := resolution.Proportion(tagged, len(sm.caps))
		if err != nil {
			return err
		}
		fmt.Fprintf(w, "  %-10s captured %d of %d\n", sm.name, len(ts), len(sm.caps))
		fmt.Fprintf(w, "  %-10s mean capture time %.1f +- %.1f us, capture distance %.2f +- %.2f cm, signal pe %.2f +- %.2f\n",
			"", mt.Value, mt.Err, md.Value, md.Err, mpe.Value, mpe.Err)
		fmt.Fprintf(w, "  %-10s tagged (truth level) %s\n", "", tag.Percent())
		tHists, peHists, dHists, names = append(tHists, ts), append(peHists, pes), append(dHists, ds), append(names, sm.name)
	}
	for _, f := range []struct {
		file, title, x string
		data           [][]float64
		logY           bool
	}{
		{"capture-time.png", "neutron capture time (truth)", "capture time, us", tHists, true},
		{"capture-pe.png", "signal photoelectrons of a capture (truth)", "photoelectrons", peHists, false},
		{"capture-distance.png", "capture point from the start (truth)", "distance, cm", dHists, false},
	} {
		pl, err := overlay(f.data, names, 40, f.title, f.x, f.logY)
		if err != nil {
			return err
		}
		if err := save(o, f.file, pl); err != nil {
			return err
		}
	}
	return nil
}

func histogram(x []float64, bins int, title, xl, yl string) (*plot.Plot, error) {
	if len(x) == 0 {
		return nil, errors.New("no entries to plot")
	}
	p := plot.New()
	p.Title.Text, p.X.Label.Text, p.Y.Label.Text = title, xl, yl
	h, err := plotter.NewHist(plotter.Values(x), bins)
	if err != nil {
		return nil, err
	}
	p.Add(h)
	return p, nil
}

// overlay draws the samples' histograms over a common range as lines;
// with logY on a logarithmic scale, empty bins left out.
func overlay(data [][]float64, names []string, bins int, title, xl string, logY bool) (*plot.Plot, error) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, d := range data {
		for _, v := range d {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	if !(hi > lo) {
		hi = lo + 1
	}
	p := plot.New()
	p.Title.Text, p.X.Label.Text, p.Y.Label.Text = title, xl, "fraction of captures per bin"
	width := (hi - lo) / float64(bins)
	for k, d := range data {
		xy := make(plotter.XYs, bins)
		for i := range xy {
			xy[i].X = lo + (float64(i)+0.5)*width
		}
		for _, v := range d {
			i := min(int((v-lo)/width), bins-1)
			xy[i].Y += 1 / float64(len(d))
		}
		if logY {
			kept := xy[:0]
			for _, q := range xy {
				if q.Y > 0 {
					kept = append(kept, q)
				}
			}
			xy = kept
		}
		l, err := plotter.NewLine(xy)
		if err != nil {
			return nil, err
		}
		l.Color = plotter.DefaultLineStyle.Color
		if k > 0 {
			l.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
		}
		p.Add(l)
		p.Legend.Add(names[k], l)
	}
	p.Legend.Top, p.Legend.Left = true, false
	if logY {
		p.Y.Scale, p.Y.Tick.Marker = plot.LogScale{}, plot.LogTicks{Prec: -1}
	}
	return p, nil
}

func save(o options, name string, p *plot.Plot) error {
	return display.Save(filepath.Join(o.out, name), p, 6*vg.Inch, 4*vg.Inch)
}
