package event

import (
	"errors"
	"fmt"
	"slices"
	"strings"
)

// MergeOptions modify Merge.
type MergeOptions struct {
	// Partial accepts what Merge otherwise refuses as incomplete: shards
	// that were interrupted or miss events, and shards absent from the
	// set. The merged file then records every missing span
	// (RunInfo.Missing) and whether a shard was interrupted. Overlapping
	// or duplicated shards are refused all the same.
	Partial bool
}

// Merge joins the event files srcs, the shards of one run, into the new
// file dst (written atomically, like Create and Close), refusing an
// incomplete set: see MergeWith.
func Merge(dst string, srcs ...string) error { return MergeWith(dst, MergeOptions{}, srcs...) }

// MergeWith joins the event files srcs, shards of one run, into the new
// file dst (written atomically, like Create and Close).
//
// The shards must agree on the detector, the sensor model and every run
// setting except their place in the run (shard index, event range) and
// what became of it (interruption, missing events, source accounting);
// the first disagreement is reported naming the two files and the field.
// No two may have the same shard index or overlapping event ranges.
// Unless opt.Partial, every shard index from 0 to ShardCount-1 must be
// present, no shard may be interrupted or miss events, and the shards'
// ranges must cover the run's range (RunInfo.Run) without a gap; errors
// name the shards and the missing event numbers.
//
// The merged file is shard 0 of 1 and covers the run's range; it records
// the missing spans of a partial merge and the shards' source accounting,
// summed. Events are written shard by shard in increasing FirstEvent,
// whatever the order of srcs, each shard's events in its stored order; so
// the merged file is in event-number order whenever every shard is.
// Events are streamed, never all held in memory. dst may be one of srcs.
func MergeWith(dst string, opt MergeOptions, srcs ...string) (err error) {
	fail := func(format string, args ...any) error {
		return fmt.Errorf("event: Merge into %s: "+format, append([]any{dst}, args...)...)
	}
	if len(srcs) == 0 {
		return fail("no source files")
	}
	readers := make([]*Reader, 0, len(srcs))
	defer func() {
		for _, r := range readers {
			r.Close()
		}
	}()
	for _, s := range srcs {
		r, err := Open(s)
		if err != nil {
			return fail("%w", err)
		}
		readers = append(readers, r)
	}
	if err := checkShards(readers); err != nil {
		return fail("%w", err)
	}
	run, err := mergedRun(readers, opt)
	if err != nil {
		return fail("%w", err)
	}

	w, err := Create(dst, readers[0].det, readers[0].model, run)
	if err != nil {
		return fmt.Errorf("event: Merge: %w", err)
	}
	defer w.Abort()
	for _, r := range readers {
		for e, err := range r.Events() {
			if err != nil {
				return fail("%w", err)
			}
			if err := w.Write(&e); err != nil {
				return fail("%w", err)
			}
		}
	}
	// Close the sources before the rename so that dst may be one of them.
	for _, r := range readers {
		if err := r.Close(); err != nil {
			return fail("%w", err)
		}
	}
	return w.Close()
}

// mergedRun sorts the shards by FirstEvent, checks them as a set and
// returns the RunInfo of their merge.
func mergedRun(rs []*Reader, opt MergeOptions) (RunInfo, error) {
	slices.SortStableFunc(rs, func(a, b *Reader) int {
		switch {
		case a.run.FirstEvent < b.run.FirstEvent:
			return -1
		case a.run.FirstEvent > b.run.FirstEvent:
			return 1
		}
		return 0
	})
	count := rs[0].run.ShardCount
	byIndex := make(map[int]*Reader, len(rs))
	for _, r := range rs {
		if prev, dup := byIndex[r.run.ShardIndex]; dup {
			return RunInfo{}, fmt.Errorf("%s and %s are both shard %d of %d", prev.path, r.path, r.run.ShardIndex, count)
		}
		byIndex[r.run.ShardIndex] = r
	}
	for i, r := range rs[1:] {
		if prev := rs[i]; r.run.FirstEvent <= prev.run.lastEvent() {
			return RunInfo{}, fmt.Errorf("event ranges of %s (%v) and %s (%v) overlap",
				prev.path, shardSpan(prev), r.path, shardSpan(r))
		}
	}

	// The run's range; files of format version 1 do not record it, so
	// there it is what the shards cover.
	whole := rs[0].run.Run
	if whole == (Span{}) {
		last := rs[len(rs)-1]
		whole = Span{First: rs[0].run.FirstEvent, N: last.run.lastEvent() - rs[0].run.FirstEvent + 1}
	}

	var problems []string
	var missing []Span
	var absent []int
	for k := 0; k < count; k++ {
		if byIndex[k] == nil {
			absent = append(absent, k)
		}
	}
	if len(absent) > 0 {
		problems = append(problems, fmt.Sprintf("shards %s of %d are absent", intList(absent), count))
	}
	next, where := whole.First, "at the start of the run"
	interrupted := false
	for _, r := range rs {
		if r.run.FirstEvent > next {
			gap := Span{First: next, N: r.run.FirstEvent - next}
			missing = append(missing, gap)
			problems = append(problems, fmt.Sprintf("%v missing %s, before %s", gap, where, r.path))
		}
		for _, m := range r.run.Missing {
			missing = append(missing, m)
			problems = append(problems, fmt.Sprintf("%s (shard %d of %d) misses %v", r.path, r.run.ShardIndex, count, m))
		}
		if r.run.Interrupted {
			interrupted = true
			problems = append(problems, fmt.Sprintf("%s (shard %d of %d) was interrupted", r.path, r.run.ShardIndex, count))
		}
		next, where = r.run.lastEvent()+1, "after "+r.path
	}
	if end := whole.First + whole.N; next < end && next != 0 {
		gap := Span{First: next, N: end - next}
		missing = append(missing, gap)
		problems = append(problems, fmt.Sprintf("%v missing at the end of the run, %s", gap, where))
	}
	if len(problems) > 0 && !opt.Partial {
		return RunInfo{}, fmt.Errorf("incomplete set of %d shards (use the partial option to merge it and record what is missing): %s",
			len(rs), strings.Join(problems, "; "))
	}

	run := rs[0].run
	run.ShardIndex, run.ShardCount = 0, 1
	run.FirstEvent, run.Events, run.Run = whole.First, whole.N, whole
	run.Interrupted = interrupted
	run.Missing = coalesce(missing)
	run.Source = SourceStats{}
	for _, r := range rs {
		run.Source.Read += r.run.Source.Read
		run.Source.Skipped += r.run.Source.Skipped
		run.Source.Reasons = append(run.Source.Reasons, r.run.Source.Reasons...)
	}
	return run, run.Validate()
}

func shardSpan(r *Reader) Span { return Span{First: r.run.FirstEvent, N: r.run.Events} }

// coalesce joins adjacent spans of a sorted, disjoint list.
func coalesce(spans []Span) []Span {
	var out []Span
	for _, s := range spans {
		if n := len(out); n > 0 && out[n-1].First+out[n-1].N == s.First {
			out[n-1].N += s.N
			continue
		}
		out = append(out, s)
	}
	return out
}

func intList(ks []int) string {
	s := make([]string, len(ks))
	for i, k := range ks {
		s[i] = fmt.Sprint(k)
	}
	return strings.Join(s, ", ")
}

// checkShards reports the first difference in detector, sensor model or
// run settings (other than the place of the shard in the run and what
// became of it) between the first reader and the others.
func checkShards(rs []*Reader) error {
	a := rs[0]
	ad, as, ar := descriptionColumns(a)
	for _, b := range rs[1:] {
		bd, bs, br := descriptionColumns(b)
		var errs []error
		for _, d := range [...]struct{ what, diff string }{
			{"detector", firstDifference(ad, bd)},
			{"sensor model", firstDifference(as, bs)},
			{"run settings", firstDifference(ar, br, runShardColumns...)},
		} {
			if d.diff != "" {
				errs = append(errs, fmt.Errorf("%s and %s differ in %s: %s", a.path, b.path, d.what, d.diff))
			}
		}
		if errs != nil {
			return errors.Join(errs...)
		}
	}
	return nil
}

// descriptionColumns returns the file-layout columns of r's detector,
// sensor model and run settings, filled with their values.
func descriptionColumns(r *Reader) (det, sensor, run []column) {
	var dr detectorRecord
	dr.set(r.det)
	var sr sensorRecord
	sr.set(&r.model)
	var rr runRecord
	rr.set(&r.run)
	return dr.cols(), sr.cols(), rr.cols(FormatVersion)
}
