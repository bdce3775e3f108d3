package sim

import (
	"context"
	"errors"
	"fmt"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
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
	w := s.cfg.Water.Config()
	return event.RunInfo{
		Seed:      s.cfg.Seed,
		Generator: g.String(),
		Version:   Version,
		Water: fmt.Sprintf("T=%g C, band %g-%g nm, absorption x%g, Rayleigh x%g, Mie length %g cm at %g nm (exponent %g, g %g), attenuation length %g cm at %g nm",
			w.TemperatureC, w.BandLo, w.BandHi, s.cfg.Water.AbsorptionScale(), w.RayleighScale,
			w.MieLength, w.MieWavelength, w.MieExponent, w.MieG, w.AttenuationLength, w.AttenuationWavelength),
		Options: fmt.Sprintf("liner reflectivity %g (diffuse %g), photon prescale %g, dark noise %v, em %+v, muon %+v",
			s.cfg.Liner.Reflectivity, s.cfg.Liner.DiffuseFraction, s.prescale, !s.cfg.NoDarkNoise, s.cfg.EM, s.cfg.Muon),
		ShardIndex:      opt.Shard,
		ShardCount:      shards,
		FirstEvent:      first,
		Events:          n,
		Run:             event.Span{First: opt.First, N: opt.Count},
		Trigger:         s.cfg.Trigger,
		KeepUntriggered: s.cfg.KeepUntriggered,
	}, nil
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
