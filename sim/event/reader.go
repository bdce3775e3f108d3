package event

import (
	"errors"
	"fmt"
	"iter"
	"os"

	"go-hep.org/x/hep/groot/riofs"
	"go-hep.org/x/hep/groot/rtree"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
)

// Reader reads an event file. The detector, sensor model and run settings
// are read and checked by Open; events are read on demand by Events,
// Range or Event, each entry checked against its stored checksum and
// against the detector.
//
// A Reader is not safe for concurrent use: do not iterate from two
// goroutines at once (open the file twice instead).
type Reader struct {
	path   string
	fd     *os.File
	file   *riofs.File
	events rtree.Tree
	n      int
	det    *geom.Detector
	model  pmt.Model
	run    RunInfo
	// version is the file's format version, from oldestVersion to
	// FormatVersion.
	version int32
}

// Open opens the event file at path and reads its description. A file
// that is not a conelight event file, is truncated or is corrupt gives an
// error naming the file.
func Open(path string) (*Reader, error) {
	fd, err := os.Open(path)
	if err != nil {
		return nil, fmt.Errorf("event: %w", err)
	}
	fi, err := fd.Stat()
	if err != nil {
		fd.Close()
		return nil, fmt.Errorf("event: %w", err)
	}
	r, err := newReader(path, fd, fi.Size())
	if err != nil {
		fd.Close()
		return nil, err
	}
	r.fd = fd
	return r, nil
}

// newReader reads the file description from src, of size bytes, which is
// named path in errors. It does not close src on failure.
func newReader(path string, src riofs.Reader, size int64) (_ *Reader, err error) {
	r := &Reader{path: path}
	defer r.recoverAs(&err, nil, nil)
	if err := preflight(src, size); err != nil {
		return nil, r.errorf("not a readable event file: %w", err)
	}
	g := &guardedFile{src: src}
	if r.file, err = riofs.NewReader(g); err != nil {
		return nil, r.errorf("not a readable ROOT file: %w", err)
	}
	if err := loadIntegrity(r.file, g); err != nil {
		return nil, r.errorf("%w", err)
	}

	// The format version decides the columns: read it first, alone.
	var rr runRecord
	if err := r.readColumns(runTree, rr.versionColumns(), false); err != nil {
		return nil, err
	}
	if err := rr.checkVersion(); err != nil {
		return nil, r.errorf("tree %q: %w", runTree, err)
	}
	r.version = rr.FormatVersion
	if err := r.readSingle(runTree, rr.cols(r.version)); err != nil {
		return nil, err
	}
	if r.run, err = rr.run(); err != nil {
		return nil, r.errorf("tree %q: %w", runTree, err)
	}
	var dr detectorRecord
	if err := r.readSingle(detectorTree, dr.cols()); err != nil {
		return nil, err
	}
	if r.det, err = dr.detector(); err != nil {
		return nil, r.errorf("tree %q: %w", detectorTree, err)
	}
	var sr sensorRecord
	if err := r.readSingle(sensorTree, sr.cols()); err != nil {
		return nil, err
	}
	if r.model, err = sr.model(); err != nil {
		return nil, r.errorf("tree %q: %w", sensorTree, err)
	}

	if r.events, err = r.tree(eventsTree); err != nil {
		return nil, err
	}
	n := r.events.Entries()
	if n < 0 || uint64(n) > r.run.Events-r.run.missingCount() {
		return nil, r.errorf("tree %q has %d entries for a run of %d events, %d of them missing", eventsTree, n, r.run.Events, r.run.missingCount())
	}
	r.n = int(n)
	return r, nil
}

// tree looks up the named tree.
func (r *Reader) tree(name string) (rtree.Tree, error) {
	obj, err := r.file.Get(name)
	if err != nil {
		return nil, r.errorf("no tree %q (not a conelight event file?): %w", name, err)
	}
	t, ok := obj.(rtree.Tree)
	if !ok {
		return nil, r.errorf("%q is a %s, not a tree", name, obj.Class())
	}
	return t, nil
}

// readSingle reads the one entry of the named tree into cols and checks
// its checksum.
func (r *Reader) readSingle(name string, cols []column) error {
	return r.readColumns(name, cols, true)
}

// readColumns reads the one entry of the named tree into cols, which are
// all of its columns but the checksum if check is set, and then verifies
// the checksum; otherwise any of them.
func (r *Reader) readColumns(name string, cols []column, check bool) error {
	t, err := r.tree(name)
	if err != nil {
		return err
	}
	if n := t.Entries(); n != 1 {
		return r.errorf("tree %q has %d entries, want 1", name, n)
	}
	var crc uint32
	vars := readVars(cols, &crc)
	if !check {
		vars = vars[:len(cols)]
	}
	tr, err := rtree.NewReader(t, vars)
	if err != nil {
		return r.errorf("tree %q: %w", name, err)
	}
	defer tr.Close()
	if err := tr.Read(func(rtree.RCtx) error { return nil }); err != nil {
		return r.errorf("tree %q: %w", name, err)
	}
	if !check {
		return nil
	}
	if sum, _ := checksum(cols, nil); sum != crc {
		return r.errorf("tree %q: checksum mismatch (stored %08x, computed %08x): file corrupt", name, crc, sum)
	}
	return nil
}

func (r *Reader) errorf(format string, args ...any) error {
	return fmt.Errorf("event: %s: "+format, append([]any{r.path}, args...)...)
}

// recoverAs, deferred, turns a panic inside the ROOT decoder into an error
// naming the file and, if entry is not nil, the entry being read. A panic
// raised while *inCaller is set came from the caller's own code (the body
// of a range loop) and is passed on untouched.
func (r *Reader) recoverAs(err *error, entry *int64, inCaller *bool) {
	p := recover()
	if p == nil {
		return
	}
	if inCaller != nil && *inCaller {
		panic(p)
	}
	if entry != nil {
		*err = r.errorf("entry %d: corrupt file: ROOT decoder failed: %v", *entry, p)
		return
	}
	*err = r.errorf("corrupt file: ROOT decoder failed reading the file structure: %v", p)
}

// Detector returns the detector the events were simulated with.
func (r *Reader) Detector() *geom.Detector { return r.det }

// Sensor returns the sensor model the events were simulated with.
func (r *Reader) Sensor() pmt.Model { return r.model }

// Run returns the run settings and record.
func (r *Reader) Run() RunInfo { return r.run }

// FormatVersion returns the file's format version (see FormatVersion).
func (r *Reader) FormatVersion() int { return int(r.version) }

// Len returns the number of events in the file.
func (r *Reader) Len() int { return r.n }

// Path returns the path the Reader was opened with.
func (r *Reader) Path() string { return r.path }

// Close closes the file.
func (r *Reader) Close() error {
	if r.fd == nil {
		return nil
	}
	err := r.fd.Close()
	r.fd = nil
	return err
}

// Events returns an iterator over all events in file order. A read error
// is yielded once, with a zero Event, and ends the iteration:
//
//	for ev, err := range r.Events() {
//		if err != nil { ... }
//		...
//	}
func (r *Reader) Events() iter.Seq2[Event, error] { return r.Range(0, r.n) }

// Range returns an iterator over the n events starting at index first (in
// file order, 0 <= first, first+n <= Len()). See Events.
func (r *Reader) Range(first, n int) iter.Seq2[Event, error] {
	return func(yield func(Event, error) bool) {
		if first < 0 || n < 0 || first > r.n-n {
			yield(Event{}, r.errorf("Range(%d, %d) outside the file's %d events", first, n, r.n))
			return
		}
		if n == 0 {
			return
		}
		stopped := false
		err := r.scan(int64(first), int64(first+n), func(e Event) error {
			if !yield(e, nil) {
				stopped = true
				return errStop
			}
			return nil
		})
		if err != nil && !stopped {
			yield(Event{}, err)
		}
	}
}

// Event reads the event at index i (0 <= i < Len()) in file order.
func (r *Reader) Event(i int) (Event, error) {
	for e, err := range r.Range(i, 1) {
		return e, err
	}
	return Event{}, r.errorf("event %d not read", i) // unreachable for a valid i
}

var errStop = errors.New("event: iteration stopped")

// scan reads entries [beg, end) of the events tree and calls fn with each
// event. It returns fn's first error, or a read error naming the file and
// entry.
func (r *Reader) scan(beg, end int64, fn func(Event) error) (err error) {
	var (
		inCaller bool
		entry    = beg
		failure  error // an error found by the callback, already described
		rec      eventRecord
		crc      uint32
		buf      []byte
		cols     = rec.cols(r.version)
	)
	defer r.recoverAs(&err, &entry, &inCaller)
	tr, err := rtree.NewReader(r.events, readVars(cols, &crc), rtree.WithRange(beg, end))
	if err != nil {
		return r.errorf("tree %q: %w", eventsTree, err)
	}
	defer tr.Close()
	err = tr.Read(func(ctx rtree.RCtx) error {
		entry = ctx.Entry
		e, err := r.decode(&rec, cols, crc, &buf)
		if err != nil {
			failure = r.errorf("entry %d: %w", ctx.Entry, err)
			return failure
		}
		inCaller = true
		err = fn(e)
		inCaller = false
		return err
	})
	switch {
	case err == nil:
		return nil
	case failure != nil:
		return failure
	case errors.Is(err, errStop):
		return errStop
	}
	return r.errorf("entry %d: %w", entry, err)
}

// decode checks the entry just read into rec against its checksum crc and
// the file's detector and run, and converts it to an Event.
func (r *Reader) decode(rec *eventRecord, cols []column, crc uint32, buf *[]byte) (Event, error) {
	var sum uint32
	if sum, *buf = checksum(cols, *buf); sum != crc {
		return Event{}, fmt.Errorf("checksum mismatch (stored %08x, computed %08x): file corrupt", crc, sum)
	}
	e, err := rec.event()
	if err != nil {
		return Event{}, err
	}
	if err := e.Validate(r.det.NumSensors()); err != nil {
		return Event{}, err
	}
	if !r.run.contains(e.Number) {
		return Event{}, fmt.Errorf("event number %d outside the run's range [%d, %d]", e.Number, r.run.FirstEvent, r.run.lastEvent())
	}
	if m, ok := r.run.missing(e.Number); ok {
		return Event{}, fmt.Errorf("event number %d lies in the run's missing %v", e.Number, m)
	}
	return e, nil
}
