package sim

import (
	"context"
	"errors"
	"fmt"
	"math/rand/v2"
	"sync"
	"time"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// RunOptions selects the events of a run and how it reports.
type RunOptions struct {
	// First and Count: the run covers event numbers First .. First+Count-1.
	First, Count uint64
	// Shard and Shards split the run for a batch system: the Count
	// events are cut into Shards contiguous blocks as equal as possible,
	// and this run makes block Shard (ShardRange gives its numbers).
	// Shards 0 means 1. Every event has the same random stream as in the
	// unsplit run, so the merged shards (event.Merge) equal the unsplit run.
	Shard, Shards int
	// Progress, when set, is called from Run's goroutine about every
	// ProgressEvery (default 1 s) and once at the end.
	Progress      func(Progress)
	ProgressEvery time.Duration
	// BadEvents says what the run does with an event the generator or
	// the simulation fails on (a malformed event in a file): stop
	// (StopAtBad, the default) or skip it (SkipBad). Events with nothing
	// to track are never an error: they are counted as Empty and left
	// out of the output under either policy.
	BadEvents BadEventPolicy
	// OnBad, when set, is called from Run's goroutine, in event order,
	// for every event left out of the output as empty or skipped, with a
	// one-line reason naming the event (and for a file, the file, line
	// and the file's own event number).
	OnBad func(BadEvent)
}

// BadEventPolicy says what a run does with a bad event.
type BadEventPolicy int

const (
	// StopAtBad ends the run with the first bad event's error.
	StopAtBad BadEventPolicy = iota
	// SkipBad leaves bad events out of the output, counts them
	// (Progress.Skipped) and reports each to RunOptions.OnBad.
	SkipBad
)

// String returns "stop" or "skip".
func (p BadEventPolicy) String() string {
	switch p {
	case StopAtBad:
		return "stop"
	case SkipBad:
		return "skip"
	}
	return fmt.Sprintf("BadEventPolicy(%d)", int(p))
}

// BadEvent is an event a run left out of its output.
type BadEvent struct {
	Number uint64 // event number in the run
	// Empty says the event had nothing to track (it is not an error);
	// otherwise the event was bad and skipped.
	Empty  bool
	Reason string
}

// Progress reports a run's advance.
type Progress struct {
	Done, Total uint64 // events handled (kept, dropped, empty or skipped) and to do
	Kept        uint64 // events passed to the output
	// Empty counts events with nothing to track, Skipped bad events left
	// out under SkipBad; neither is passed to the output.
	Empty, Skipped uint64
	Elapsed        time.Duration
	Rate           float64       // events per second so far
	Remaining      time.Duration // estimate at the current rate
}

// ShardRange returns the first event number and the number of events of
// the shard opt selects: block Shard of Shards equal contiguous blocks of
// First .. First+Count-1 (the first Count mod Shards blocks are one event
// longer).
func (o RunOptions) ShardRange() (first, n uint64, err error) {
	shards := o.Shards
	if shards == 0 {
		shards = 1
	}
	if shards < 0 || o.Shard < 0 || o.Shard >= shards {
		return 0, 0, fmt.Errorf("sim: RunOptions.Shard = %d, Shards = %d: want 0 <= Shard < Shards", o.Shard, o.Shards)
	}
	if o.First+o.Count < o.First {
		return 0, 0, fmt.Errorf("sim: RunOptions.First = %d + Count = %d overflows", o.First, o.Count)
	}
	k, s := uint64(o.Shard), uint64(shards)
	base, extra := o.Count/s, o.Count%s
	n = base
	if k < extra {
		n++
	}
	first = o.First + k*base + min(k, extra)
	return first, n, nil
}

type result struct {
	i     uint64
	ev    *event.Event
	err   error
	empty string // why the event had nothing to track, if it had not
}

// Run simulates the events selected by opt on Config.Workers goroutines
// and passes each kept event to out in event-number order, one at a time
// from Run's goroutine. At most a few events per worker are in memory at
// once, so a run of any length streams to its writer. The output is the
// same for any number of workers.
//
// Run stops at the first error from the generator or the simulation
// (unless opt.BadEvents is SkipBad), at the first error from out, and when
// ctx is cancelled; it returns after every event already handed to out,
// with the error (ctx.Err() on cancellation). The events passed to out
// before that are a complete in-order prefix of the run. Events with
// nothing to track are counted (Progress.Empty), reported to opt.OnBad
// and left out; they do not stop the run.
func (s *Simulator) Run(ctx context.Context, g gen.Generator, opt RunOptions, out func(*event.Event) error) error {
	if g == nil || out == nil {
		return errors.New("sim: Run needs a generator and an output function")
	}
	first, n, err := opt.ShardRange()
	if err != nil {
		return err
	}
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	workers := s.cfg.Workers
	window := 4 * workers
	tokens := make(chan struct{}, window)
	jobs := make(chan uint64)
	results := make(chan result, window)
	go func() {
		defer close(jobs)
		for i := uint64(0); i < n; i++ {
			select {
			case tokens <- struct{}{}:
			case <-ctx.Done():
				return
			}
			select {
			case jobs <- i:
			case <-ctx.Done():
				return
			}
		}
	}()
	var wg sync.WaitGroup
	for k := 0; k < workers; k++ {
		w, err := s.newWorker()
		if err != nil {
			cancel()
			return err
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			var prims []phys.Particle
			for i := range jobs {
				num := first + i
				rng := EventStream(s.cfg.Seed, num)
				var r result
				r.i = i
				var info gen.Info
				prims, info, r.err = generate(g, num, rng, prims[:0])
				if r.err != nil {
					r.err = fmt.Errorf("sim: event %d: generator: %w", num, r.err)
				} else if len(prims) == 0 {
					r.empty = emptyReason(g, num, info)
				} else if r.ev, r.err = w.simulate(num, rng, prims); r.err == nil {
					r.ev.Truth.Interaction = InteractionTruth(g, info)
				}
				results <- r
			}
		}()
	}
	go func() { wg.Wait(); close(results) }()

	every := opt.ProgressEvery
	if every <= 0 {
		every = time.Second
	}
	start := time.Now()
	lastReport := start
	var done, kept, empty, skipped uint64
	report := func() {
		if opt.Progress == nil {
			return
		}
		el := time.Since(start)
		p := Progress{Done: done, Total: n, Kept: kept, Empty: empty, Skipped: skipped, Elapsed: el}
		if el > 0 {
			p.Rate = float64(done) / el.Seconds()
		}
		if p.Rate > 0 {
			p.Remaining = time.Duration(float64(n-done) / p.Rate * float64(time.Second))
		}
		opt.Progress(p)
	}
	pending := make(map[uint64]result, window)
	var next uint64
	var firstErr error
	for r := range results {
		if firstErr != nil {
			continue // drain
		}
		pending[r.i] = r
		for {
			r, ok := pending[next]
			if !ok {
				break
			}
			delete(pending, next)
			next++
			<-tokens
			if r.err != nil && opt.BadEvents == SkipBad {
				skipped++
				if opt.OnBad != nil {
					opt.OnBad(BadEvent{Number: first + r.i, Reason: r.err.Error()})
				}
				r.ev, r.empty, r.err = nil, "", nil
			}
			if r.err != nil {
				firstErr = r.err
				cancel()
				break
			}
			done++
			if r.ev == nil { // empty or skipped
				if r.empty != "" {
					empty++
					if opt.OnBad != nil {
						opt.OnBad(BadEvent{Number: first + r.i, Empty: true, Reason: r.empty})
					}
				}
				continue
			}
			if r.ev.Truth.Triggered || s.cfg.KeepUntriggered {
				if err := out(r.ev); err != nil {
					firstErr = err
					cancel()
					break
				}
				kept++
			}
		}
		if opt.Progress != nil && time.Since(lastReport) >= every {
			lastReport = time.Now()
			report()
		}
	}
	report()
	if firstErr != nil {
		return firstErr
	}
	if done < n {
		return ctx.Err()
	}
	return nil
}

// emptyReason says why event number has nothing to track, naming the
// generator and, for a file, the file's own event number.
func emptyReason(g gen.Generator, number uint64, info gen.Info) string {
	src := g.String()
	if info.SourceEvent != 0 {
		src += fmt.Sprintf(", number %d in the file", info.SourceEvent)
	}
	return fmt.Sprintf("sim: event %d (%s): nothing to track: %d final-state particles not tracked (%d neutrinos)",
		number, src, info.Skipped, info.SkippedNeutrinos)
}

// generate calls the generator and turns a panic inside it (a bug in a
// user's generator) into an error for that event, so that one bad event
// ends the run cleanly instead of killing an overnight production.
func generate(g gen.Generator, number uint64, rng *rand.Rand, dst []phys.Particle) (prims []phys.Particle, info gen.Info, err error) {
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("generator panicked: %v", p)
		}
	}()
	return g.Generate(number, rng, dst)
}
