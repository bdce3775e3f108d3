// Command simfile simulates the events of a generator file in the demo
// tank and writes them to a ROOT event file.
//
//	go run ./examples/simfile -in events.hepmc3 -out run.root
//	go run ./examples/simfile -in events.hepmc3 -shard 3 -shards 50 -out part-3.root
//
// See usage (-h) for the inputs, outputs and options.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"time"

	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/gen"
)

const usage = `simfile simulates the events of a generator file in the demo tank and
writes them to a ROOT event file.

Input (-in): a HepMC3 text file (Asciiv3, "HepMC::Asciiv3-START_EVENT_LISTING"),
or a HepMC2 text file (IO_GenEvent, including HepMC2 files written by the
HepMC3 library). NuHepMC files (neutrino generators) give the event truth its
incoming neutrino, target, outgoing nucleon, Q2, process ID and weight; the
event is placed at its NuHepMC lab position if it has one, else where the
file's vertices are (-vertex fiducial places each event uniformly in the
tank's fiducial volume instead). Final-state e-, e+, mu-, mu+, photons, pi+,
pi-, pi0, protons and neutrons are simulated; neutrinos are counted; residual
nuclei (too slow to make light) are recorded in the truth as not followed and
counted. Any other final-state particle (a kaon, a hyperon) is an error naming
its line, unless -count-unfollowed records it in the truth and counts it.

Output (-out): a ROOT event file (see sim/event), written under a temporary
name beside it and renamed when complete. An interrupted run (Ctrl-C) closes
the events finished so far into a complete file.

Events with nothing to simulate are counted and listed, never fatal. A bad
event in the file (a malformed line) stops the run with an error naming the
file, line and event (-bad stop, the default), or is skipped, listed and
counted (-bad skip). Progress goes to standard error about every second.

Shards: -shards N -shard K simulates the K-th of N equal blocks of the
events, with the same random streams as the unsplit run; join the shard
files with examples/mergeshards.

Example:

	go run ./examples/simfile -in testdata/gen/hepmc3/nuhepmc_v1_gev_mm.hepmc3 -out run.root -bad skip

Options:
`

type options struct {
	in, out       string
	seed          uint64
	first, count  uint64
	shard, shards int
	bad           string
	vertex        string
	wall          float64
	every         time.Duration
	unfollowed    bool
	detector      string // -detector (detflag)
}

// summary is what a run did.
type summary struct {
	written                        int
	done, total, empty, skippedBad uint64
	notFollowed                    uint64
}

func main() {
	o, err := parseArgs(os.Args[1:], os.Stderr)
	if errors.Is(err, flag.ErrHelp) {
		os.Exit(0)
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "simfile:", err)
		os.Exit(2)
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	sum, err := run(ctx, o, os.Stderr)
	if err != nil && !errors.Is(err, context.Canceled) {
		fmt.Fprintln(os.Stderr, "simfile:", err)
		os.Exit(1)
	}
	fmt.Printf("wrote %d events to %s (%d of %d events done, %d empty, %d bad skipped, %d particles not followed)\n",
		sum.written, o.out, sum.done, sum.total, sum.empty, sum.skippedBad, sum.notFollowed)
	if err != nil {
		fmt.Fprintln(os.Stderr, "simfile: interrupted:", err)
		os.Exit(1)
	}
}

// parseArgs reads the command line; stray positional arguments are
// refused (a mistyped flag would otherwise be ignored silently).
func parseArgs(args []string, stderr io.Writer) (options, error) {
	var o options
	fs := flag.NewFlagSet("simfile", flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {
		fmt.Fprint(fs.Output(), usage)
		fs.PrintDefaults()
	}
	fs.StringVar(&o.in, "in", "", "generator file to read (HepMC3 Asciiv3 or HepMC2 IO_GenEvent text); required")
	fs.StringVar(&o.out, "out", "events.root", "ROOT event file to write")
	fs.StringVar(&o.detector, "detector", detflag.Default, detflag.Usage)
	fs.BoolVar(&o.unfollowed, "count-unfollowed", false, "record final-state particles the simulator cannot follow (kaons, hyperons) in the truth and count them, instead of stopping at them")
	fs.Uint64Var(&o.seed, "seed", 1, "run seed (the same for every shard)")
	fs.Uint64Var(&o.first, "first", 0, "index of the first event of the file to simulate (0-based)")
	fs.Uint64Var(&o.count, "count", 0, "number of events to simulate from -first, over all shards (0: to the end of the file)")
	fs.IntVar(&o.shard, "shard", 0, "this job's shard, 0 .. shards-1")
	fs.IntVar(&o.shards, "shards", 1, "number of shards of the run")
	fs.StringVar(&o.bad, "bad", "stop", "what to do with a bad event of the file: stop (the run ends with its error) or skip (counted and listed)")
	fs.StringVar(&o.vertex, "vertex", "file", "event placement: file (the file's lab position or vertices) or fiducial (uniform in the tank, -wall from the sensors)")
	fs.Float64Var(&o.wall, "wall", 100, "with -vertex fiducial: minimum distance of the vertex to the sensor surface, cm")
	fs.DurationVar(&o.every, "progress", time.Second, "interval between progress lines on standard error")
	if err := fs.Parse(args); err != nil {
		return o, err
	}
	if fs.NArg() > 0 {
		return o, fmt.Errorf("unexpected argument %q (all inputs are flags; see -h)", fs.Arg(0))
	}
	if o.in == "" {
		return o, errors.New("-in is required (see -h)")
	}
	if o.bad != "stop" && o.bad != "skip" {
		return o, fmt.Errorf("-bad = %q: want stop or skip", o.bad)
	}
	if o.vertex != "file" && o.vertex != "fiducial" {
		return o, fmt.Errorf("-vertex = %q: want file or fiducial", o.vertex)
	}
	return o, nil
}

func run(ctx context.Context, o options, stderr io.Writer) (summary, error) {
	var sum summary
	cfg, err := detflag.Config(o.detector, o.seed)
	if err != nil {
		return sum, err
	}
	s, err := sim.New(cfg)
	if err != nil {
		return sum, err
	}
	hopts := gen.HepMCOptions{CountUnfollowed: o.unfollowed}
	if o.vertex == "fiducial" {
		hopts.Vertex = gen.InFiducial(cfg.Detector.Tank(), o.wall)
	}
	h, err := gen.OpenHepMC(o.in, hopts)
	if err != nil {
		return sum, err
	}
	defer h.Close()
	n := uint64(h.Len())
	if o.first >= n {
		return sum, fmt.Errorf("-first = %d: %s has %d events", o.first, o.in, n)
	}
	count := o.count
	if count == 0 {
		count = n - o.first
	}
	if count > n-o.first {
		return sum, fmt.Errorf("-first = %d, -count = %d: %s has %d events", o.first, o.count, o.in, n)
	}
	opt := sim.RunOptions{First: o.first, Count: count, Shard: o.shard, Shards: o.shards, ProgressEvery: o.every}
	if o.bad == "skip" {
		opt.BadEvents = sim.SkipBad
	}
	opt.OnBad = func(b sim.BadEvent) {
		kind := "bad event skipped"
		if b.Empty {
			kind = "empty event"
		}
		fmt.Fprintf(stderr, "simfile: %s: %s\n", kind, b.Reason)
	}
	opt.Progress = func(p sim.Progress) {
		sum.done, sum.total, sum.empty, sum.skippedBad, sum.notFollowed = p.Done, p.Total, p.Empty, p.Skipped, p.NotFollowed
		fmt.Fprintf(stderr, "simfile: %d/%d events, %d kept, %d empty, %d bad skipped, %d particles not followed, %.1f ev/s, %v left\n",
			p.Done, p.Total, p.Kept, p.Empty, p.Skipped, p.NotFollowed, p.Rate, p.Remaining.Round(time.Second))
	}
	sum.written, err = s.WriteRun(ctx, h, opt, o.out)
	return sum, err
}
