package event

import (
	"errors"
	"fmt"
	"slices"
)

// Merge joins the event files srcs, shards of one run, into the new file
// dst (written atomically, like Create and Close).
//
// The shards must agree on the detector, the sensor model and every run
// setting except the shard numbering and the event range; the first
// disagreement is reported naming the two files and the field. Their
// event ranges (RunInfo.FirstEvent, Events) must not overlap and must
// join without gaps: the merged run covers their union and is shard 0 of 1.
//
// Events are written shard by shard in increasing FirstEvent, whatever
// the order of srcs, each shard's events in its stored order; so the
// merged file is in event-number order whenever every shard is. Events are
// streamed, never all held in memory. dst may be one of srcs.
func Merge(dst string, srcs ...string) (err error) {
	if len(srcs) == 0 {
		return fmt.Errorf("event: Merge into %s: no source files", dst)
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
			return fmt.Errorf("event: Merge into %s: %w", dst, err)
		}
		readers = append(readers, r)
	}
	if err := checkShards(readers); err != nil {
		return fmt.Errorf("event: Merge into %s: %w", dst, err)
	}
	slices.SortStableFunc(readers, func(a, b *Reader) int {
		switch {
		case a.run.FirstEvent < b.run.FirstEvent:
			return -1
		case a.run.FirstEvent > b.run.FirstEvent:
			return 1
		}
		return 0
	})
	run := readers[0].run
	run.ShardIndex, run.ShardCount = 0, 1
	for i, r := range readers[1:] {
		prev := readers[i]
		next := prev.run.lastEvent() + 1
		switch {
		case r.run.FirstEvent < next:
			return fmt.Errorf("event: Merge into %s: event ranges of %s [%d, %d] and %s [%d, %d] overlap",
				dst, prev.path, prev.run.FirstEvent, prev.run.lastEvent(), r.path, r.run.FirstEvent, r.run.lastEvent())
		case r.run.FirstEvent > next:
			return fmt.Errorf("event: Merge into %s: events %d to %d missing between %s and %s",
				dst, next, r.run.FirstEvent-1, prev.path, r.path)
		}
		run.Events += r.run.Events
	}

	w, err := Create(dst, readers[0].det, readers[0].model, run)
	if err != nil {
		return fmt.Errorf("event: Merge: %w", err)
	}
	defer w.Abort()
	for _, r := range readers {
		for e, err := range r.Events() {
			if err != nil {
				return fmt.Errorf("event: Merge into %s: %w", dst, err)
			}
			if err := w.Write(&e); err != nil {
				return fmt.Errorf("event: Merge into %s: %w", dst, err)
			}
		}
	}
	// Close the sources before the rename so that dst may be one of them.
	for _, r := range readers {
		if err := r.Close(); err != nil {
			return fmt.Errorf("event: Merge into %s: %w", dst, err)
		}
	}
	return w.Close()
}

// checkShards reports the first difference in detector, sensor model or
// run settings (other than the shard numbering and range) between the
// first reader and the others.
func checkShards(rs []*Reader) error {
	a := rs[0]
	ad, as, ar := descriptionColumns(a)
	for _, b := range rs[1:] {
		bd, bs, br := descriptionColumns(b)
		var errs []error
		for _, d := range [...]struct{ what, diff string }{
			{"detector", firstDifference(ad, bd)},
			{"sensor model", firstDifference(as, bs)},
			{"run settings", firstDifference(ar, br, runRangeColumns...)},
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
	return dr.cols(), sr.cols(), rr.cols()
}
