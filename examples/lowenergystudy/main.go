// Command lowenergystudy measures how far the low-energy fitter's own
// account of its quality can be trusted: the pull widths (Gaussian core
// of (fit - truth) / reported error, with their standard errors) of the
// vertex coordinates, time, the two direction angles and the energy; the
// along-track vertex offset; and the fraction of converged fits far from
// the truth with and without the fit's quality flag. Electrons of each
// energy are drawn with the simulator's own samplers (gen.InFiducial,
// gen.Isotropic through sim.Run) in the demo or the large tank.
package main

import (
	"context"
	"flag"
	"fmt"
	"io"
	"log"
	"math"
	"os"
	"strconv"
	"strings"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/lowenergy"
	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/setup"
)

var usage = cli.Usage{
	Name:    "lowenergystudy",
	Does:    "Measures the low-energy fitter's pull widths (vertex x, y, z, time, two direction angles, energy), the along-track vertex offset and the far-miss fraction among converged and unflagged fits, for electrons at each energy.",
	Writes:  "a table on standard output",
	Example: "go run ./examples/lowenergystudy -detector large -energies 5,10,20,50 -n 2000",
}

func main() {
	tank := flag.String("detector", detflag.Default, detflag.Usage+"; the built-in large tank is simulated with the 10-hit trigger its fitter tables were made with")
	energies := flag.String("energies", "5,10,20,50", "comma-separated kinetic energies, MeV")
	n := flag.Int("n", 500, "events per energy")
	seed := flag.Uint64("seed", 11, "run seed")
	fid := flag.Float64("fiducial", 100, "minimum distance of the vertices from the sensor surface, cm")
	sensor := flag.String("sensor", "", "sensor class lining the tank instead of its own, at the same coverage (small, medium, large; empty: the tank's own)")
	cli.Parse(usage)
	var es []float64
	for _, s := range strings.Split(*energies, ",") {
		e, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
		if err != nil || !(e > 0) {
			log.Fatalf("lowenergystudy: -energies: %q is no positive number", s)
		}
		es = append(es, e)
	}
	if *n < 10 {
		log.Fatalf("lowenergystudy: -n = %d: need at least 10 events", *n)
	}
	if err := run(os.Stdout, *tank, *sensor, es, *n, *seed, *fid); err != nil {
		log.Fatal(err)
	}
}

func config(tank string, seed uint64) (sim.Config, error) {
	cfg, err := detflag.Config(tank, seed)
	if err != nil {
		return sim.Config{}, err
	}
	if tank == "large" {
		cfg.Trigger = setup.DefaultTrigger()
	}
	return cfg, nil
}

// Study is the measurement at one energy.
type Study struct {
	Ekin                          float64
	Triggered, Converged, Flagged int
	// Pulls: x, y, z, t, angle 1, angle 2, energy.
	Pulls [7]resolution.Gaussian
	// AngleRatio68 is the 68% quantile of the angle to the truth over
	// the quadrature sum of the two angle errors (1.07 for calibrated
	// Gaussian errors: the 68% point of a Rayleigh distribution, 1.51
	// sigma, over sqrt(2) sigma).
	AngleRatio68 resolution.Estimate
	// Along is the median along-track vertex offset (cm) of the converged
	// fits, AlongClean that of the converged fits not flagged Suspect.
	Along, AlongClean resolution.Estimate
	// Far and FarUnflagged count converged fits more than 3 m from the truth.
	Far, FarUnflagged int
}

func run(w io.Writer, tank, sensor string, es []float64, n int, seed uint64, fid float64) error {
	cfg, err := config(tank, seed)
	if err != nil {
		return err
	}
	if sensor != "" {
		switch sensor {
		case "small":
			cfg.Sensor = pmt.Small()
		case "medium":
			cfg.Sensor = pmt.Medium()
		case "large":
			cfg.Sensor = pmt.Large()
		default:
			return fmt.Errorf("lowenergystudy: -sensor %q: want small, medium or large", sensor)
		}
		// Line the tank anew with the sensor class at the same coverage.
		det, err := geom.Layout(cfg.Detector.Tank(), cfg.Sensor.CathodeDiameter, cfg.Detector.Coverage())
		if err != nil {
			return err
		}
		cfg.Detector, cfg.Dead = det, nil
	}
	f, err := lowenergy.New(lowenergy.Config{Setup: cfg.Setup})
	if err != nil {
		return err
	}
	if msg := f.TablesWarning(); msg != "" {
		fmt.Fprintln(w, "warning:", msg)
	}
	fmt.Fprintf(w, "%s tank, %s sensors, tables %q, %d events per energy, seed %d, vertices >= %g cm inside the sensor surface\n", tank, cfg.Sensor.Name, f.Tables().Name, n, seed, fid)
	fmt.Fprintf(w, "%6s %6s %6s %6s | %-15s %-15s %-15s %-15s %-15s %-15s %-15s | %-13s %-14s | %s\n",
		"E/MeV", "trig", "conv", "flag", "pull x", "pull y", "pull z", "pull t", "pull ang1", "pull ang2", "pull E", "ang/err 68%", "along med/cm all, unflagged", "far>3m all/unflagged")
	for k, e := range es {
		s, err := measure(cfg, f, e, fid, uint64(k)*uint64(n), n)
		if err != nil {
			return err
		}
		p := s.Pulls
		fmt.Fprintf(w, "%6g %6d %6d %6d | %-15v %-15v %-15v %-15v %-15v %-15v %-15v | %-13v %v, %v | %d/%d, %d/%d\n",
			e, s.Triggered, s.Converged, s.Flagged, p[0].Sigma, p[1].Sigma, p[2].Sigma, p[3].Sigma, p[4].Sigma, p[5].Sigma, p[6].Sigma,
			s.AngleRatio68, s.Along, s.AlongClean, s.Far, s.Converged, s.FarUnflagged, s.Converged-s.Flagged)
	}
	return nil
}

func measure(cfg sim.Config, f *lowenergy.Fitter, e, fid float64, first uint64, n int) (Study, error) {
	s := Study{Ekin: e}
	simr, err := sim.New(cfg)
	if err != nil {
		return s, err
	}
	gun, err := gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{{PDG: phys.Electron, Ekin: gen.FixedEnergy(e), Direction: gen.Isotropic()}},
		Vertex:    gen.InFiducial(cfg.Detector.Tank(), fid),
	})
	if err != nil {
		return s, err
	}
	var pulls [7][]float64
	var ratio, along, alongClean []float64
	err = simr.Run(context.Background(), gun, sim.RunOptions{First: first, Count: uint64(n)}, func(ev *event.Event) error {
		s.Triggered++
		r, err := f.Fit(ev.Hits)
		if err != nil {
			return err
		}
		if r.Status != fit.Converged {
			return nil
		}
		s.Converged++
		if r.Suspect {
			s.Flagged++
		}
		p := ev.Truth.Primaries[0]
		d := r.Track.Vertex.Sub(p.Pos)
		if d.Norm() > 300 {
			s.Far++
			if !r.Suspect {
				s.FarUnflagged++
			}
		}
		er := r.Errors
		e1, e2 := phys.Basis(r.Track.Dir)
		angle := math.Acos(math.Max(-1, math.Min(1, p.Dir.Dot(r.Track.Dir))))
		vals := [7]float64{d.X / er.Vertex.X, d.Y / er.Vertex.Y, d.Z / er.Vertex.Z, (r.Track.Time - p.Time) / er.Time,
			p.Dir.Dot(e1) / er.Angle[0], p.Dir.Dot(e2) / er.Angle[1], (r.Track.Ekin - e) / er.Ekin}
		for i, v := range vals {
			pulls[i] = append(pulls[i], v)
		}
		ratio = append(ratio, angle/math.Hypot(er.Angle[0], er.Angle[1]))
		along = append(along, d.Dot(p.Dir))
		if !r.Suspect {
			alongClean = append(alongClean, d.Dot(p.Dir))
		}
		return nil
	})
	if err != nil {
		return s, err
	}
	if s.Converged < 10 {
		return s, fmt.Errorf("lowenergystudy: %g MeV: only %d converged fits", e, s.Converged)
	}
	for i := range pulls {
		if s.Pulls[i], err = resolution.GaussianCore(pulls[i], 2); err != nil {
			return s, err
		}
	}
	if s.AngleRatio68, err = resolution.Quantile(ratio, 0.68); err != nil {
		return s, err
	}
	if s.Along, err = resolution.Quantile(along, 0.5); err != nil {
		return s, err
	}
	if len(alongClean) > 0 {
		if s.AlongClean, err = resolution.Quantile(alongClean, 0.5); err != nil {
			return s, err
		}
	}
	return s, nil
}
