// Command demorun is the first thing to run: it builds the demo tank (an
// invented 10 m tank lined at 30% coverage with 20 cm sensors, see
// geom.DemoTank), simulates electrons and muons at a few energies from
// random points 1 m or more inside the wall with random directions,
// writes each sample to a ROOT event file and prints what the detector
// saw: photoelectrons per MeV, hits, and where the light came from. Then
// it reconstructs the events and prints the resolution table: electrons,
// positrons and photons up to the top of the low-energy fitter's
// calibration (lowenergy.Fitter.EkinRange, 100 MeV for the built-in
// tables) with that fitter (fit/lowenergy), the other samples with the single-ring fitter (fit/ring), which fits
// both the electron and the muon hypothesis and so gives the identity; the
// ring fit takes about half a second per event, so only the first -ringfit events
// of each sample are ring-fitted. Samples neither fitter covers (muons
// below the ring fitter's tables) are listed without a fit. The figures
// (event display, hit-time residuals, charge against angle, resolution
// against energy, pulls, mis-identification) are written to the output
// folder as PNG and SVG.
//
//	go run ./examples/demorun
//	go run ./examples/demorun -particle mu- -energy 300,800 -n 200 -seed 7 -out /tmp/run7
//
// The files open in any ROOT-reading tool; the schema is in the README.
package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"path/filepath"
	"strconv"
	"strings"
	"time"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

type options struct {
	particles []string
	energies  []float64
	n         int
	seed      uint64
	out       string
	quiet     bool
	ringFit   int // events per sample for the ring fitter
	noFigures bool
	detector  string // -detector (detflag); empty means the demo tank
}

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "demorun",
	Does:    "Simulates electrons and muons in the demo tank, prints what the detector saw, reconstructs the events and prints the resolution table.",
	Reads:   "nothing (simulates its own events)",
	Writes:  "one ROOT event file per sample and the figures (PNG, SVG) into -out; tables on standard output",
	Example: "go run ./examples/demorun -particle mu- -energy 300,800 -n 200 -seed 7 -out /tmp/run7",
}

func main() {
	var o options
	particle := flag.String("particle", "e-,mu-", "comma-separated particles: e-, e+, mu-, mu+, gamma")
	energy := flag.String("energy", "20,200,800", "comma-separated kinetic energies, MeV")
	flag.IntVar(&o.n, "n", 100, "events per particle and energy")
	flag.Uint64Var(&o.seed, "seed", 1, "run seed")
	flag.StringVar(&o.out, "out", "demorun-out", "output folder")
	flag.BoolVar(&o.quiet, "quiet", false, "no progress bar")
	flag.IntVar(&o.ringFit, "ringfit", 16, "events per sample reconstructed with the single-ring fitter (0: none)")
	flag.BoolVar(&o.noFigures, "nofigures", false, "write no figures")
	flag.StringVar(&o.detector, "detector", detflag.Default, detflag.Usage)
	cli.Parse(usage)
	var err error
	o.particles = strings.Split(*particle, ",")
	if o.energies, err = parseEnergies(*energy); err != nil {
		fail(err)
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	if err := run(ctx, os.Stdout, os.Stderr, o); err != nil {
		fail(err)
	}
}

func fail(err error) {
	fmt.Fprintln(os.Stderr, "demorun:", err)
	os.Exit(1)
}

func parseEnergies(s string) ([]float64, error) {
	var es []float64
	for _, f := range strings.Split(s, ",") {
		e, err := strconv.ParseFloat(strings.TrimSpace(f), 64)
		if err != nil || !(e > 0) {
			return nil, fmt.Errorf("-energy: %q is not a positive number", f)
		}
		es = append(es, e)
	}
	return es, nil
}

func run(ctx context.Context, stdout, stderr io.Writer, o options) error {
	if o.n <= 0 {
		return fmt.Errorf("-n = %d must be positive", o.n)
	}
	if o.ringFit < 0 {
		return fmt.Errorf("-ringfit = %d must not be negative", o.ringFit)
	}
	if err := os.MkdirAll(o.out, 0o755); err != nil {
		return err
	}
	cfg, err := detflag.Config(o.detector, o.seed)
	if err != nil {
		return err
	}
	s, err := sim.New(cfg)
	if err != nil {
		return err
	}
	pdgs := make([]int, len(o.particles))
	for i, name := range o.particles {
		if pdgs[i], err = phys.ParsePDG(strings.TrimSpace(name)); err != nil {
			return fmt.Errorf("-particle: %w", err)
		}
	}
	fmt.Fprintf(stdout, "%s tank: %v\n%d sensors (%s, %.1f cm), coverage %.3f, seed %d\n\n",
		cfg.Name, cfg.Detector.Tank(), cfg.Detector.NumSensors(), cfg.Sensor.Name, cfg.Sensor.CathodeDiameter, cfg.Detector.Coverage(), o.seed)
	fmt.Fprintln(stdout, "kept: triggered events written to the file; pe: photoelectrons per event; hits: per event;")
	fmt.Fprintln(stdout, "scat., refl.: photoelectrons from scattered and liner-reflected light; track: primary track length.")
	fmt.Fprintf(stdout, "%-6s %8s %6s %9s %8s %8s %7s %7s %10s  %s\n",
		"part.", "E (MeV)", "kept", "pe/event", "pe/MeV", "hits", "scat.", "refl.", "track (cm)", "file")
	var samples []*sample
	for i, name := range o.particles {
		name, pdg := strings.TrimSpace(name), pdgs[i]
		for _, e := range o.energies {
			g, err := gen.NewGun(gen.GunConfig{
				Particles: []gen.GunParticle{{PDG: pdg, Ekin: gen.FixedEnergy(e), Direction: gen.Isotropic()}},
				Vertex:    gen.InFiducial(cfg.Detector.Tank(), 100),
			})
			if err != nil {
				return err
			}
			path := filepath.Join(o.out, fmt.Sprintf("%s_%gMeV.root", strings.TrimSpace(name), e))
			label := fmt.Sprintf("%s %g MeV", name, e)
			opt := sim.RunOptions{Count: uint64(o.n)}
			if !o.quiet {
				opt.Progress = progressBar(stderr, label)
				opt.ProgressEvery = 200 * time.Millisecond
			}
			if _, err := s.WriteRun(ctx, g, opt, path); err != nil {
				return err
			}
			if !o.quiet {
				fmt.Fprintln(stderr)
			}
			sum, evs, err := summarize(path)
			if err != nil {
				return err
			}
			samples = append(samples, &sample{name: name, pdg: pdg, energy: e, events: evs})
			fmt.Fprintf(stdout, "%-6s %8g %6d %9.1f %8.2f %8.1f %6.1f%% %6.1f%% %10.1f  %s\n",
				name, e, sum.kept, sum.pe, sum.pe/e, sum.hits, 100*sum.scattered, 100*sum.reflected, sum.length, path)
		}
	}
	return reconstruct(ctx, stdout, stderr, o, s.Config(), samples)
}

type summary struct {
	kept                 int
	pe, hits             float64
	scattered, reflected float64
	length               float64
}

// summarize reads an event file back, averages what it holds and returns
// its events.
func summarize(path string) (summary, []*event.Event, error) {
	r, err := event.Open(path)
	if err != nil {
		return summary{}, nil, err
	}
	defer r.Close()
	var s summary
	var evs []*event.Event
	var pe, scat, refl float64
	for ev, err := range r.Events() {
		if err != nil {
			return summary{}, nil, err
		}
		evs = append(evs, &ev)
		s.kept++
		pe += float64(ev.Truth.Photoelectrons)
		scat += float64(ev.Truth.PEScattered)
		refl += float64(ev.Truth.PEReflected)
		s.hits += float64(len(ev.Hits))
		if len(ev.Truth.Tracks) > 0 {
			s.length += ev.Truth.Tracks[0].Length
		}
	}
	if s.kept > 0 {
		n := float64(s.kept)
		s.pe, s.hits, s.length = pe/n, s.hits/n, s.length/n
	}
	if pe > 0 {
		s.scattered, s.reflected = scat/pe, refl/pe
	}
	return s, evs, nil
}

// progressBar returns a progress callback drawing one line on w.
func progressBar(w io.Writer, label string) func(sim.Progress) {
	const width = 30
	return func(p sim.Progress) {
		frac := 1.0
		if p.Total > 0 {
			frac = float64(p.Done) / float64(p.Total)
		}
		n := int(frac * width)
		fmt.Fprintf(w, "\r%-16s [%s%s] %d/%d events, %.0f ev/s, %s left ",
			label, strings.Repeat("=", n), strings.Repeat(" ", width-n), p.Done, p.Total, p.Rate, p.Remaining.Round(time.Second))
	}
}
