// Command ringstudy measures the single-ring fitter (fit/ring) on
// simulated events: for each point (a particle at one momentum) it draws
// vertices uniformly at least -wall cm inside the sensor surface and
// isotropic directions (sim/gen's samplers), keeps fully contained
// events (a muon's straight range ends 50 cm or more inside), fits both
// hypotheses and reports the 68% quantiles of the vertex, direction and
// momentum errors, the vertex bias along the track, the Gaussian-core
// pull widths of every reported parameter, the mis-identification with
// the zero cut (k/n with Clopper-Pearson intervals) and with a cut
// calibrated on the even events and counted on the odd ones, and the
// median Cramer-Rao bound with the achieved/bound ratio. Every figure
// has its standard error and sample size.
//
// -out writes the figures as a resolution.Baseline (JSON); -baseline
// compares them with a stored one by resolution.Compare, reporting each
// figure's change in standard errors and failing on a significant
// worsening; -power prints, for each 68% resolution, the power to detect
// a 15% worsening at that level (resolution.Power).
//
// -scan runs the light-model diagnostic instead: for each point, the
// charge and time parts of the likelihood summed over the events with the
// vertex moved along the true axis (ring.Fitter.NLLParts), and where each
// part has its minimum; a part whose minimum is away from zero biases
// the fitted vertex along the track.
//
//	go run ./examples/ringstudy -detector large -n 100 -out testdata/ring/large_study.json
//	go run ./examples/ringstudy -detector demo -points e-600,mu-600 -n 20
//	go run ./examples/ringstudy -scan -detector demo -points e-600 -n 16
package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"strings"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/fit/resolution"
)

var usage = cli.Usage{
	Name:    "ringstudy",
	Does:    "Simulates fully contained single electrons and muons at fixed momenta, fits them with the single-ring fitter (fit/ring) and reports resolutions (68% quantiles), the vertex bias along the track, pull widths, mis-identification (k/n, Clopper-Pearson) and the median Cramer-Rao bound with the achieved/bound ratio, each with its error and sample size.",
	Reads:   "the detector given by -detector; optionally a stored baseline (-baseline)",
	Writes:  "the report on standard output; the figures as a resolution.Baseline JSON file (-out)",
	Example: "go run ./examples/ringstudy -detector large -n 100 -out testdata/ring/large_study.json",
}

// defaultPoints are the large-tank study's points.
const defaultPoints = "e-300,e-500,e-700,e-1000,mu-300,mu-500,mu-700,mu-1000"

func main() {
	var o options
	spec := detflag.Register(flag.CommandLine, "large")
	flag.IntVar(&o.n, "n", 100, "events per point")
	points := flag.String("points", defaultPoints, "points: particle-momentum (MeV/c), comma separated")
	flag.Float64Var(&o.wall, "wall", 200, "least distance of the vertices from the sensor surface, cm")
	flag.Uint64Var(&o.seed, "seed", 3000, "run seed (point i uses seed+i)")
	out := flag.String("out", "", "write the figures to this resolution.Baseline JSON file")
	base := flag.String("baseline", "", "compare the figures with this stored baseline (resolution.Compare)")
	level := flag.Float64("level", 3, "with -baseline: a worsening of this many standard errors fails")
	power := flag.Bool("power", false, "print the power to detect a 15% worsening of each 68% resolution at -level")
	doScan := flag.Bool("scan", false, "instead of the study: the light-model diagnostic, the charge and time parts of the likelihood scanned along the true axis")
	cli.Parse(usage)
	o.detector = *spec
	var err error
	if o.points, err = parsePoints(*points); err == nil {
		if *doScan {
			err = scan(context.Background(), os.Stdout, o)
		} else {
			err = main1(os.Stdout, o, *out, *base, *level, *power)
		}
	}
	if err != nil {
		fmt.Fprintln(os.Stderr, "ringstudy:", err)
		os.Exit(1)
	}
}

func main1(w io.Writer, o options, out, base string, level float64, power bool) error {
	b, err := run(context.Background(), w, o)
	if err != nil {
		return err
	}
	if power {
		printPower(w, b, level)
	}
	if out != "" {
		b.Command = "go run ./examples/ringstudy " + strings.Join(os.Args[1:], " ")
		if err := b.Save(out); err != nil {
			return err
		}
		fmt.Fprintln(w, "wrote", out)
	}
	if base != "" {
		old, err := resolution.LoadBaseline(base)
		if err != nil {
			return err
		}
		c, err := resolution.Compare(old, b, level)
		if err != nil {
			return err
		}
		fmt.Fprint(w, c)
		if bad := c.Worsened(); len(bad) > 0 {
			return fmt.Errorf("%d figures worse than %s by %g standard errors or more", len(bad), base, level)
		}
	}
	return nil
}
