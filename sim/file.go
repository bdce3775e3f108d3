package sim

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/muon"
)

// Version is the conelight version recorded in event files.
const Version = "0.1.0-dev"

// RunInfo returns the run description stored in event files for a run of
// generator g with options opt.
func (s *Simulator) RunInfo(g gen.Generator, opt RunOptions) (event.RunInfo, error) {
	first, n, err := opt.ShardRange()
	if err != nil {
		return event.RunInfo{}, err
	}
	shards := opt.Shards
	if shards == 0 {
		shards = 1
	}
	return event.RunInfo{
		Seed:            s.cfg.Seed,
		Generator:       g.String(),
		Version:         Version,
		Water:           s.waterDescription(),
		Options:         s.optionsDescription(),
		ShardIndex:      opt.Shard,
		ShardCount:      shards,
		FirstEvent:      first,
		Events:          n,
		Run:             event.Span{First: opt.First, N: opt.Count},
		Trigger:         s.cfg.Trigger,
		KeepUntriggered: s.cfg.KeepUntriggered,
		Setup:           s.cfg.Name,
		Dead:            s.deadSorted(),
		ExtendedWindow:  s.cfg.ExtendedWindow,
		Optics:          s.opticsRecord(),
	}, nil
}

// opticsRecord returns the water and liner settings for the run record.
func (s *Simulator) opticsRecord() event.Optics {
	w := s.cfg.Water.Config()
	if math.IsInf(w.MieLength, 1) {
		w.MieLength = 0 // both switch the Mie component off
	}
	return event.Optics{Water: w, Liner: s.cfg.Liner, Recorded: true}
}

// deadSorted returns the dead sensors in index order, nil for none.
func (s *Simulator) deadSorted() []int {
	var d []int
	for i, dead := range s.dead {
		if dead {
			d = append(d, i)
		}
	}
	return d
}

// waterDescription describes the water optics in words for the run
// record: only the settings that act, with their units.
func (s *Simulator) waterDescription() string {
	w := s.cfg.Water.Config()
	var b strings.Builder
	fmt.Fprintf(&b, "water at %g C, light simulated over %g-%g nm; ", w.TemperatureC, w.BandLo, w.BandHi)
	if w.AttenuationLength > 0 {
		fmt.Fprintf(&b, "attenuation length %g cm at %g nm (pure-water absorption scaled by %.4g)", w.AttenuationLength, w.AttenuationWavelength, s.cfg.Water.AbsorptionScale())
	} else {
		fmt.Fprintf(&b, "absorption %s", scaleWords(s.cfg.Water.AbsorptionScale()))
	}
	fmt.Fprintf(&b, "; Rayleigh scattering %s", scaleWords(w.RayleighScale))
	if w.MieLength > 0 && !math.IsInf(w.MieLength, 1) {
		fmt.Fprintf(&b, "; Mie-like scattering length %g cm at %g nm, scaling as wavelength^%g, mean cosine %g", w.MieLength, w.MieWavelength, w.MieExponent, w.MieG)
	} else {
		b.WriteString("; no Mie-like scattering")
	}
	if s.cfg.GdMassFraction != 0 {
		fmt.Fprintf(&b, "; gadolinium mass fraction %g", s.cfg.GdMassFraction)
	}
	return b.String()
}

// scaleWords says how a pure-water coefficient is scaled.
func scaleWords(f float64) string {
	switch f {
	case 0:
		return "off"
	case 1:
		return "of pure water"
	}
	return fmt.Sprintf("%g times that of pure water", f)
}

// optionsDescription lists the simulator settings that change the events,
// in words, for the run record.
func (s *Simulator) optionsDescription() string {
	c := &s.cfg
	dark := "on"
	if c.NoDarkNoise {
		dark = "off"
	}
	ext := "off"
	if c.ExtendedWindow > 0 {
		ext = fmt.Sprintf("%g ns after the primary trigger", c.ExtendedWindow)
	}
	mu := c.Muon
	return fmt.Sprintf("liner reflectivity %g (diffuse fraction %g); photons traced: a fraction %.4g of those emitted; dark noise %s; extended window %s; "+
		"electrons, positrons: stopped below %.4g MeV, delta rays above %.4g MeV, bremsstrahlung photons above %.4g MeV, photons absorbed below %.4g MeV, steps of at most %g cm and %g of the energy; "+
		"muons, pions, protons: delta rays above %g MeV, steps of at most %g cm and %g of the energy (%g below the Cherenkov threshold), followed down to %g MeV%s",
		c.Liner.Reflectivity, c.Liner.DiffuseFraction, s.prescale, dark, ext,
		c.EM.ChargedCut, c.EM.DeltaCut, c.EM.BremsCut, c.EM.PhotonCut, c.EM.MaxStep, c.EM.MaxEnergyLossFraction,
		mu.DeltaCut, mu.MaxStep, mu.MaxFracLoss, mu.MaxFracLossBelowThreshold, mu.LowCut, heavySwitches(mu))
}

// heavySwitches names the processes switched off in the heavy-particle
// transport.
func heavySwitches(c muon.Config) string {
	var off []string
	if c.NoScattering {
		off = append(off, "multiple scattering")
	}
	if c.NoStraggling {
		off = append(off, "straggling")
	}
	if c.NoDeltaRays {
		off = append(off, "delta rays")
	}
	if len(off) == 0 {
		return ""
	}
	return "; switched off: " + strings.Join(off, ", ")
}

// WriteRun runs the simulation like Run and streams the kept events to a
// self-describing ROOT event file at path (see sim/event for the schema).
// It returns the number of events written.
//
// The file appears under path only when complete: it is written under a
// temporary name beside it and renamed at the end. When ctx is cancelled,
// the events finished so far (an in-order prefix of the run) are closed
// into a readable file that records the interruption (the rest of the
// range as missing, see event.Writer.Interrupt), and ctx's error is
// returned; on any other error nothing is left under path. The events
// read and those left out (empty, or bad and skipped; see
// RunOptions.BadEvents), with Run's one-line reason for each, go into the
// run record (RunInfo.Source) when the generator reads a file
// (SourceGenerator) or any event was left out.
func (s *Simulator) WriteRun(ctx context.Context, g gen.Generator, opt RunOptions, path string) (int, error) {
	if g == nil {
		return 0, errors.New("sim: WriteRun needs a generator")
	}
	info, err := s.RunInfo(g, opt)
	if err != nil {
		return 0, err
	}
	if info.Events == 0 {
		return 0, fmt.Errorf("sim: shard %d of %d of %d events holds no event", opt.Shard, info.ShardCount, opt.Count)
	}
	w, err := event.Create(path, s.cfg.Detector, s.cfg.Sensor, info)
	if err != nil {
		return 0, err
	}
	defer w.Abort()
	var done uint64 // events simulated, from Run's last progress report
	progress := opt.Progress
	opt.Progress = func(p Progress) {
		done = p.Done
		if progress != nil {
			progress(p)
		}
	}
	var leftOut []string // Run's reasons for the events it left out, in order
	onBad := opt.OnBad
	opt.OnBad = func(b BadEvent) {
		leftOut = append(leftOut, b.Reason)
		if onBad != nil {
			onBad(b)
		}
	}
	runErr := s.Run(ctx, g, opt, w.Write)
	if runErr != nil && !errors.Is(runErr, context.Canceled) && !errors.Is(runErr, context.DeadlineExceeded) {
		return 0, runErr
	}
	if done < info.Events {
		if err := w.Interrupt(done); err != nil {
			return 0, err
		}
	}
	if _, ok := g.(SourceGenerator); ok || len(leftOut) > 0 {
		src := event.SourceStats{Read: done, Skipped: uint64(len(leftOut)), Reasons: leftOut}
		if err := w.SetSource(src); err != nil {
			return 0, err
		}
	}
	if err := w.Close(); err != nil {
		return 0, err
	}
	return w.Len(), runErr
}
