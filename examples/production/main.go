// Command production simulates one shard of a large run of a particle gun
// in the demo tank (or a sensor layout from a CSV file) and writes it to a
// ROOT event file, for batch systems: run it once per job-array index with
// -shard set to the index, then join the files with mergeshards. With
// -batch slurm or -batch htcondor it prints instead the job script of the
// whole run (templates slurm.sh.tmpl, htcondor.sub.tmpl).
//
// On SIGINT or SIGTERM (a batch system's time limit) it closes the file of
// the events done so far, marked interrupted, and exits with status 3; the
// merge refuses such a shard unless told to merge a partial run.
//
//	go run ./examples/production -particle mu- -emin 200 -emax 1000 -count 100000 -seed 12345 -shard 3 -shards 50 -out part-3.root
//	go run ./examples/production -particle mu- -emin 200 -emax 1000 -count 100000 -seed 12345 -shards 50 -batch slurm > production.slurm
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"os"
	"os/signal"
	"syscall"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

type options struct {
	particle   string
	emin, emax float64
	count      uint64
	seed       uint64
	shard      int
	shards     int
	layout     string
	detector   string // -detector (detflag); empty means the demo tank
	out        string
	wall       float64
	batch      string
}

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "production",
	Does:    "Simulates one shard of a large particle-gun run for a batch system (one job per -shard), to be joined with mergeshards.",
	Reads:   "optionally a detector description (-detector) and a sensor-layout CSV file (-layout)",
	Writes:  "the shard's ROOT event file -out",
	Example: "go run ./examples/production -particle mu- -emin 200 -emax 1000 -count 100000 -seed 12345 -shard 3 -shards 50 -out part-3.root",
}

// defineFlags defines the program's flags in fs, to be parsed into o.
func defineFlags(fs *flag.FlagSet, o *options) {
	fs.StringVar(&o.particle, "particle", "e-", "particle: e-, e+, mu-, mu+, gamma")
	fs.Float64Var(&o.emin, "emin", 10, "lowest kinetic energy, MeV")
	fs.Float64Var(&o.emax, "emax", 10, "highest kinetic energy, MeV (uniform between)")
	fs.Uint64Var(&o.count, "count", 1000, "events in the whole run (all shards)")
	fs.Uint64Var(&o.seed, "seed", 1, "run seed (the same for every shard)")
	fs.IntVar(&o.shard, "shard", 0, "this job's shard, 0 .. shards-1")
	fs.IntVar(&o.shards, "shards", 1, "number of shards of the run")
	fs.StringVar(&o.detector, "detector", detflag.Default, detflag.Usage)
	fs.StringVar(&o.layout, "layout", "", "sensor-layout CSV file of medium-class sensors, replacing the -detector's layout (a description file can name a CSV itself: [layout] sensor_csv)")
	fs.Float64Var(&o.wall, "wall", 100, "minimum vertex distance to the wall, cm")
	fs.StringVar(&o.out, "out", "events.root", "output file")
	fs.StringVar(&o.batch, "batch", "", "print the job script of the whole run for this batch system (slurm, htcondor) instead of running")
}

func main() {
	var o options
	defineFlags(flag.CommandLine, &o)
	cli.Parse(usage)
	if o.batch != "" {
		script, err := batchScript(o.batch, flag.CommandLine, o.shards)
		if err != nil {
			fmt.Fprintln(os.Stderr, "production:", err)
			os.Exit(2)
		}
		fmt.Print(script)
		return
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	n, err := run(ctx, o)
	switch {
	case errors.Is(err, context.Canceled):
		fmt.Fprintf(os.Stderr, "production: interrupted: wrote %d events to %s, marked interrupted; rerun shard %d\n", n, o.out, o.shard)
		os.Exit(3)
	case err != nil:
		fmt.Fprintln(os.Stderr, "production:", err)
		os.Exit(1)
	}
	fmt.Printf("wrote %d events to %s\n", n, o.out)
}

func run(ctx context.Context, o options) (int, error) {
	pdg, err := phys.ParsePDG(o.particle)
	if err != nil {
		return 0, fmt.Errorf("-particle: %w", err)
	}
	cfg, err := detflag.Config(o.detector, o.seed)
	if err != nil {
		return 0, err
	}
	if o.layout != "" {
		det, err := geom.LoadSensorCSV(o.layout)
		if err != nil {
			return 0, err
		}
		cfg.Detector = det
		cfg.Dead = nil // indices of the replaced layout
		cfg.Sensor = pmt.Medium()
		cfg.Sensor.CathodeDiameter = det.CathodeDiameter()
	}
	s, err := sim.New(cfg)
	if err != nil {
		return 0, err
	}
	energy := gen.FixedEnergy(o.emin)
	if o.emax != o.emin {
		energy = gen.UniformEnergy(o.emin, o.emax)
	}
	g, err := gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{{PDG: pdg, Ekin: energy, Direction: gen.Isotropic()}},
		Vertex:    gen.InFiducial(cfg.Detector.Tank(), o.wall),
	})
	if err != nil {
		return 0, err
	}
	return s.WriteRun(ctx, g, sim.RunOptions{Count: o.count, Shard: o.shard, Shards: o.shards}, o.out)
}
