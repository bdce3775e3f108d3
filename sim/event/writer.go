package event

import (
	"fmt"
	"os"

	"go-hep.org/x/hep/groot"
	"go-hep.org/x/hep/groot/riofs"
	"go-hep.org/x/hep/groot/rtree"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/geom/safefile"
	"github.com/conelight/conelight/pmt"
)

// eventBasketSize is the basket buffer of each events branch (bytes).
// groot's default of 32 kB makes the hit branches start a new zlib stream
// every few events; 128 kB halves the write time (BenchmarkWrite) for
// about 8 MB of buffers per Writer.
const eventBasketSize = 128 << 10

// Writer streams events into a new event file. Events go to disk basket by
// basket as they are written; none are held in memory. The file is built
// under the temporary name .NAME.tmp in the destination directory
// (safefile.Reserve) and appears under its final name only when Close
// succeeds, so a crash or an error never leaves a partial file under that
// name. The run tree is written by Close, so that it records how the run
// ended (Interrupt, SetSource).
//
// A Writer is not safe for concurrent use.
type Writer struct {
	path     string
	tmp      *safefile.Temp
	date     uint32 // ROOT date stamped on every record (dates.go)
	file     *riofs.File
	tree     rtree.Writer
	run      RunInfo
	nSensors int
	n        int
	last     uint64 // largest event number written (valid when n > 0)

	rec  eventRecord
	cols []column
	crc  uint32
	buf  []byte

	begin int64 // start of the checksummed region (see integrity.go)
	chunk int64 // checksum chunk size

	done bool  // Close or Abort was called
	err  error // a failed write poisons the writer
}

// Create starts the event file at path for events simulated with detector
// det, sensor model sensor and run settings run, all of which are stored in
// the file. det must not be nil, sensor must pass Validate and have the
// detector's cathode diameter, and run must pass Validate.
func Create(path string, det *geom.Detector, sensor pmt.Model, run RunInfo) (*Writer, error) {
	return create(path, det, sensor, run, defaultChunkSize)
}

// create is Create with a chosen integrity chunk size (tests use small
// chunks).
func create(path string, det *geom.Detector, sensor pmt.Model, run RunInfo, chunk int64) (_ *Writer, err error) {
	if det == nil {
		return nil, fmt.Errorf("event: Create %s: nil detector", path)
	}
	if err := sensor.Validate(); err != nil {
		return nil, fmt.Errorf("event: Create %s: sensor model: %w", path, err)
	}
	if sensor.CathodeDiameter != det.CathodeDiameter() {
		return nil, fmt.Errorf("event: Create %s: sensor model CathodeDiameter = %v cm differs from the detector's %v cm",
			path, sensor.CathodeDiameter, det.CathodeDiameter())
	}
	if err := run.Validate(); err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}

	date, err := recordDate()
	if err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}
	tmp, err := safefile.Reserve(path)
	if err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}
	w := &Writer{path: path, tmp: tmp, date: date, run: run, nSensors: det.NumSensors(), chunk: chunk}
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("event: Create %s: ROOT writer failed: %v", path, p)
		}
		if err != nil {
			w.Abort()
		}
	}()
	if w.file, err = groot.Create(tmp.Name()); err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}
	if w.begin, err = fileSize(tmp.Name()); err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}

	var dr detectorRecord
	dr.set(det)
	var sr sensorRecord
	sr.set(&sensor)
	for _, t := range [...]struct {
		name string
		cols []column
	}{{detectorTree, dr.cols()}, {sensorTree, sr.cols()}} {
		if err := writeSingle(w.file, t.name, t.cols); err != nil {
			return nil, fmt.Errorf("event: Create %s: %w", path, err)
		}
	}

	w.cols = w.rec.cols(FormatVersion)
	w.tree, err = rtree.NewWriter(w.file, eventsTree, writeVars(w.cols, &w.crc),
		rtree.WithTitle("conelight events"), rtree.WithBasketSize(eventBasketSize))
	if err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}
	if err := registerLeafStreamers(w.file, w.tree); err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}
	return w, nil
}

// writeSingle writes a tree with one entry holding the columns' values.
func writeSingle(f *riofs.File, name string, cols []column) error {
	var crc uint32
	tw, err := rtree.NewWriter(f, name, writeVars(cols, &crc))
	if err != nil {
		return fmt.Errorf("tree %q: %w", name, err)
	}
	if err := registerLeafStreamers(f, tw); err != nil {
		return fmt.Errorf("tree %q: %w", name, err)
	}
	crc, _ = checksum(cols, nil)
	if _, err := tw.Write(); err != nil {
		return fmt.Errorf("tree %q: %w", name, err)
	}
	if err := tw.Close(); err != nil {
		return fmt.Errorf("tree %q: %w", name, err)
	}
	return nil
}

// Write appends e to the file. e must pass Validate for the detector's
// sensor count, its Number must lie in the run's event range, outside
// the run's missing spans, and exceed the Number of the event written
// before (so that no event is stored twice); an event that does not is
// rejected with an error and the Writer stays usable.
// A failure of the file itself leaves the Writer unusable: Close then
// reports the error and removes the temporary file.
func (w *Writer) Write(e *Event) (err error) {
	switch {
	case w.done:
		return fmt.Errorf("event: Write to %s after Close or Abort", w.path)
	case w.err != nil:
		return fmt.Errorf("event: Write to %s after an earlier error: %w", w.path, w.err)
	}
	if err := e.Validate(w.nSensors); err != nil {
		return err
	}
	if !w.run.contains(e.Number) {
		return fmt.Errorf("event: event Number = %d outside the run's range [%d, %d] in %s",
			e.Number, w.run.FirstEvent, w.run.lastEvent(), w.path)
	}
	if w.n > 0 && e.Number <= w.last {
		return fmt.Errorf("event: event Number = %d after event %d in %s: numbers must increase", e.Number, w.last, w.path)
	}
	if m, ok := w.run.missing(e.Number); ok {
		return fmt.Errorf("event: event Number = %d lies in the run's missing %v in %s", e.Number, m, w.path)
	}
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("ROOT writer failed: %v", p)
		}
		if err != nil {
			w.err = err
			err = fmt.Errorf("event: Write event %d to %s: %w", e.Number, w.path, err)
		}
	}()
	w.rec.set(e)
	w.crc, w.buf = checksum(w.cols, w.buf)
	_, err = w.tree.Write()
	if err == nil {
		w.n++
		w.last = e.Number
	}
	return err
}

// Interrupt records that the run stopped after simulating the first done
// event numbers of its range (written or dropped by the trigger): the
// file is flagged interrupted and the rest of the range recorded missing
// (RunInfo.Interrupted, RunInfo.Missing). Call it before Close; events
// already written must lie in the done part.
func (w *Writer) Interrupt(done uint64) error {
	switch {
	case w.done:
		return fmt.Errorf("event: Interrupt of %s after Close or Abort", w.path)
	case done >= w.run.Events:
		return fmt.Errorf("event: Interrupt of %s: done = %d, but the range has only %d events", w.path, done, w.run.Events)
	case w.n > 0 && w.last >= w.run.FirstEvent+done:
		return fmt.Errorf("event: Interrupt of %s: done = %d, but event %d was written", w.path, done, w.last)
	case len(w.run.Missing) > 0 || w.run.Interrupted:
		return fmt.Errorf("event: Interrupt of %s: the run already records missing events", w.path)
	}
	w.run.Interrupted = true
	w.run.Missing = []Span{{First: w.run.FirstEvent + done, N: w.run.Events - done}}
	return nil
}

// SetSource records the accounting of the generator's source file
// (RunInfo.Source): events read, and those skipped with one reason line
// each. Call it before Close.
func (w *Writer) SetSource(s SourceStats) error {
	if w.done {
		return fmt.Errorf("event: SetSource of %s after Close or Abort", w.path)
	}
	run := w.run
	run.Source = s
	if err := run.Validate(); err != nil {
		return fmt.Errorf("event: SetSource of %s: %w", w.path, err)
	}
	w.run = run
	return nil
}

// Len returns the number of events written so far.
func (w *Writer) Len() int { return w.n }

// Path returns the final path of the file.
func (w *Writer) Path() string { return w.path }

// Close finishes the file, flushes it to stable storage and renames it to
// its final path. If anything fails, or an earlier Write failed, the
// temporary file is removed and the error returned. Closing twice is an
// error.
func (w *Writer) Close() (err error) {
	if w.done {
		return fmt.Errorf("event: Close of %s: already closed", w.path)
	}
	if w.err != nil {
		w.Abort()
		return fmt.Errorf("event: Close of %s: not written because of an earlier error: %w", w.path, w.err)
	}
	w.done = true
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("ROOT writer failed: %v", p)
		}
		if err != nil {
			w.tmp.Abort()
			err = fmt.Errorf("event: Close of %s: %w", w.path, err)
		}
	}()
	if err := w.tree.Close(); err != nil {
		w.file.Close()
		return err
	}
	var rr runRecord
	rr.set(&w.run)
	if err := writeSingle(w.file, runTree, rr.cols(FormatVersion)); err != nil {
		w.file.Close()
		return err
	}
	if err := w.putIntegrity(); err != nil {
		w.file.Close()
		return err
	}
	if err := w.file.Close(); err != nil {
		return err
	}
	if err := stampFile(w.tmp.Name(), w.date); err != nil {
		return fmt.Errorf("stamping dates: %w", err)
	}
	return w.tmp.Commit()
}

// putIntegrity stamps the dates of the records written so far and stores
// their checksums (groot writes straight to the file, so the bytes on
// disk are the final ones).
func (w *Writer) putIntegrity() error {
	end, err := fileSize(w.tmp.Name())
	if err != nil {
		return err
	}
	f, err := os.OpenFile(w.tmp.Name(), os.O_RDWR, 0)
	if err != nil {
		return err
	}
	defer f.Close()
	if err := stampRecords(f, rootBegin, end, w.date, false); err != nil {
		return fmt.Errorf("stamping dates: %w", err)
	}
	return putIntegrity(w.file, f, w.begin, end, w.chunk)
}

func fileSize(name string) (int64, error) {
	fi, err := os.Stat(name)
	if err != nil {
		return 0, err
	}
	return fi.Size(), nil
}

// Abort abandons the file: the temporary file is removed and nothing
// appears under the final path. Abort after Close or Abort does nothing,
// so `defer w.Abort()` is a safe cleanup.
func (w *Writer) Abort() error {
	if w.done {
		return nil
	}
	w.done = true
	if w.file != nil {
		func() {
			defer func() { recover() }() // the file is being discarded; a failing close must not panic the caller
			w.file.Close()
		}()
	}
	if w.tmp == nil {
		return nil
	}
	if err := w.tmp.Abort(); err != nil {
		return fmt.Errorf("event: Abort %s: %w", w.path, err)
	}
	return nil
}
