package event

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"

	"go-hep.org/x/hep/groot"
	"go-hep.org/x/hep/groot/riofs"
	"go-hep.org/x/hep/groot/rtree"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
)

// eventBasketSize is the basket buffer of each events branch (bytes).
// groot's default of 32 kB makes the hit branches start a new zlib stream
// every few events; 128 kB halves the write time (BenchmarkWrite) for
// about 8 MB of buffers per Writer.
const eventBasketSize = 128 << 10

// Writer streams events into a new event file. Events go to disk basket by
// basket as they are written; none are held in memory. The file is built
// under a temporary name in the destination directory and appears under
// its final name only when Close succeeds, so a crash or an error never
// leaves a partial file under that name.
//
// A Writer is not safe for concurrent use.
type Writer struct {
	path, tmp string
	file      *riofs.File
	tree      rtree.Writer
	run       RunInfo
	nSensors  int
	n         int

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

	dir, base := filepath.Split(path)
	tmpf, err := os.CreateTemp(dir, "."+base+".tmp-*")
	if err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}
	tmp := tmpf.Name()
	if err := tmpf.Close(); err != nil {
		os.Remove(tmp)
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}
	w := &Writer{path: path, tmp: tmp, run: run, nSensors: det.NumSensors(), chunk: chunk}
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("event: Create %s: ROOT writer failed: %v", path, p)
		}
		if err != nil {
			w.Abort()
		}
	}()
	if w.file, err = groot.Create(tmp); err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}
	if w.begin, err = fileSize(tmp); err != nil {
		return nil, fmt.Errorf("event: Create %s: %w", path, err)
	}

	var dr detectorRecord
	dr.set(det)
	var sr sensorRecord
	sr.set(&sensor)
	var rr runRecord
	rr.set(&run)
	for _, t := range [...]struct {
		name string
		cols []column
	}{{runTree, rr.cols()}, {detectorTree, dr.cols()}, {sensorTree, sr.cols()}} {
		if err := writeSingle(w.file, t.name, t.cols); err != nil {
			return nil, fmt.Errorf("event: Create %s: %w", path, err)
		}
	}

	w.cols = w.rec.cols()
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
// sensor count and its Number must lie in the run's event range; an event
// that does not is rejected with an error and the Writer stays usable.
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
	}
	return err
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
			os.Remove(w.tmp)
			err = fmt.Errorf("event: Close of %s: %w", w.path, err)
		}
	}()
	if err := w.tree.Close(); err != nil {
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
	if err := syncFile(w.tmp); err != nil {
		return err
	}
	if err := os.Chmod(w.tmp, 0o644); err != nil {
		return err
	}
	if err := os.Rename(w.tmp, w.path); err != nil {
		return err
	}
	// Make the rename durable. Some file systems cannot sync a
	// directory; the file is complete either way, so that is not an error.
	if d, err := os.Open(filepath.Dir(w.path)); err == nil {
		d.Sync()
		d.Close()
	}
	return nil
}

// putIntegrity stores the checksums of everything written so far (groot
// writes straight to the file, so the bytes on disk are the final ones).
func (w *Writer) putIntegrity() error {
	end, err := fileSize(w.tmp)
	if err != nil {
		return err
	}
	f, err := os.Open(w.tmp)
	if err != nil {
		return err
	}
	defer f.Close()
	return putIntegrity(w.file, f, w.begin, end, w.chunk)
}

func fileSize(name string) (int64, error) {
	fi, err := os.Stat(name)
	if err != nil {
		return 0, err
	}
	return fi.Size(), nil
}

// syncFile flushes the named file's contents to stable storage (groot
// does not expose its descriptor, so a second one is opened).
func syncFile(name string) error {
	f, err := os.OpenFile(name, os.O_RDWR, 0)
	if err != nil {
		return err
	}
	return errors.Join(f.Sync(), f.Close())
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
	if err := os.Remove(w.tmp); err != nil && !errors.Is(err, os.ErrNotExist) {
		return fmt.Errorf("event: Abort %s: %w", w.path, err)
	}
	return nil
}
