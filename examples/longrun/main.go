// Command longrun streams a long run to one ROOT event file, to show that
// memory stays flat however many events are made and that an interrupted
// run leaves a complete file. By default it simulates 100000 electrons of
// 10 MeV from random points 1 m or more inside the wall of the demo tank
// (geom.DemoTank, an invented scenario), with random directions, printing
// a progress line with the heap in use; at the end it reads the file back
// and counts its events.
//
//	go run ./examples/longrun
//	go run ./examples/longrun -n 10000 -particle mu- -energy 300 -out /tmp/mu.root
//	/usr/bin/time -v go run ./examples/longrun -n 100000   # peak RSS
//
// Interrupt it (Ctrl-C, SIGINT) and the events finished so far are closed
// into a complete file under the final name; the program says how many and
// exits with status 130.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime"
	"time"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

type options struct {
	n        uint64
	particle string
	energy   float64
	seed     uint64
	out      string
	every    time.Duration
	check    bool
	detector string // -detector (detflag); empty means the demo tank
}

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "longrun",
	Does:    "Streams a long run into one ROOT event file with flat memory; an interrupt leaves a complete file.",
	Reads:   "nothing (simulates its own events)",
	Writes:  "the event file -out; progress lines on standard error",
	Example: "go run ./examples/longrun -n 10000 -particle mu- -energy 300 -out /tmp/mu.root",
}

func main() {
	var o options
	flag.Uint64Var(&o.n, "n", 100000, "number of events")
	flag.StringVar(&o.particle, "particle", "e-", "particle: e-, e+, mu-, mu+ or gamma")
	flag.Float64Var(&o.energy, "energy", 10, "kinetic energy, MeV")
	flag.Uint64Var(&o.seed, "seed", 1, "run seed")
	flag.StringVar(&o.detector, "detector", detflag.Default, detflag.Usage)
	flag.StringVar(&o.out, "out", "longrun.root", "output event file")
	flag.DurationVar(&o.every, "progress", 2*time.Second, "interval between progress lines")
	flag.BoolVar(&o.check, "check", true, "read the file back at the end and count its events")
	cli.Parse(usage)
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	written, err := run(ctx, os.Stdout, os.Stderr, o)
	switch {
	case errors.Is(err, context.Canceled):
		fmt.Fprintf(os.Stdout, "interrupted: %d events closed into %s\n", written, o.out)
		if o.check {
			if err := check(os.Stdout, o.out, written); err != nil {
				fmt.Fprintln(os.Stderr, "longrun:", err)
				os.Exit(1)
			}
		}
		os.Exit(130)
	case err != nil:
		fmt.Fprintln(os.Stderr, "longrun:", err)
		os.Exit(1)
	}
}

// run simulates o.n events to o.out and returns the number written; on
// cancellation the error is ctx's and the file holds the events done.
func run(ctx context.Context, stdout, stderr io.Writer, o options) (int, error) {
	pdg, err := phys.ParsePDG(o.particle)
	if err != nil {
		return 0, fmt.Errorf("-particle: %w", err)
	}
	if o.n == 0 {
		return 0, errors.New("-n must be positive")
	}
	cfg, err := detflag.Config(o.detector, o.seed)
	if err != nil {
		return 0, err
	}
	s, err := sim.New(cfg)
	if err != nil {
		return 0, err
	}
	g, err := gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{{PDG: pdg, Ekin: gen.FixedEnergy(o.energy), Direction: gen.Isotropic()}},
		Vertex:    gen.InFiducial(cfg.Detector.Tank(), 100),
	})
	if err != nil {
		return 0, err
	}
	fmt.Fprintf(stdout, "%d x %s to %s on %d workers, seed %d\n", o.n, g, o.out, s.Config().Workers, o.seed)
	start := time.Now()
	opt := sim.RunOptions{Count: o.n, Progress: progressLine(stderr), ProgressEvery: o.every}
	written, err := s.WriteRun(ctx, g, opt, o.out)
	if err != nil {
		return written, err
	}
	fmt.Fprintf(stdout, "%d events written to %s in %s\n", written, o.out, time.Since(start).Round(time.Millisecond))
	if o.check {
		return written, check(stdout, o.out, written)
	}
	return written, nil
}

// progressLine returns a progress callback printing one line per report,
// with the Go heap in use, which must stay flat over the run.
func progressLine(w io.Writer) func(sim.Progress) {
	var ms runtime.MemStats
	return func(p sim.Progress) {
		runtime.ReadMemStats(&ms)
		fmt.Fprintf(w, "%d/%d events (%d kept), %.0f ev/s, %s left, heap in use %.1f MB\n",
			p.Done, p.Total, p.Kept, p.Rate, p.Remaining.Round(time.Second), float64(ms.HeapInuse)/(1<<20))
	}
}

// check reads the file back, every entry verified against its checksum,
// and compares the count with want.
func check(w io.Writer, path string, want int) error {
	r, err := event.Open(path)
	if err != nil {
		return err
	}
	defer r.Close()
	n := 0
	var last uint64
	for ev, err := range r.Events() {
		if err != nil {
			return err
		}
		if n > 0 && ev.Number <= last {
			return fmt.Errorf("%s: event %d after %d", path, ev.Number, last)
		}
		last = ev.Number
		n++
	}
	if n != want {
		return fmt.Errorf("%s holds %d events, %d were written", path, n, want)
	}
	fmt.Fprintf(w, "read back: %s holds %d events (run of %d), all entries verified\n", path, n, r.Run().Events)
	return nil
}
