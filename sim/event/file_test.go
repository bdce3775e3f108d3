package event

import (
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// TestRoundTrip writes random events (every field set, some lists empty)
// with two different detector layouts and sensor models and checks that
// the reader returns identical events, detector, model and run settings.
// The comparison is reflect.DeepEqual: exact equality of every float.
func TestRoundTrip(t *testing.T) {
	for _, tc := range []struct {
		name string
		s    setup
	}{{"demo", demoSetup(t)}, {"small", smallSetup(t)}} {
		t.Run(tc.name, func(t *testing.T) {
			run := testRun(1000, 300)
			run.ShardIndex, run.ShardCount = 1, 3
			events := randomEvents(1, run.FirstEvent, 200, tc.s.det.NumSensors(), 600)
			// Make sure the edge cases are present whatever the draw.
			events[0] = Event{Number: events[0].Number}
			events[1].Hits, events[1].Truth.Primaries, events[1].Truth.Tracks = nil, nil, nil
			path := tempPath(t, "run.root")
			writeFile(t, path, tc.s, run, events)

			r, got := readAll(t, path)
			if r.Len() != len(events) || len(got) != len(events) {
				t.Fatalf("Len() = %d, read %d events, want %d", r.Len(), len(got), len(events))
			}
			for i := range events {
				if !reflect.DeepEqual(got[i], events[i]) {
					t.Fatalf("event %d read back as\n%+v\nwant\n%+v", i, got[i], events[i])
				}
			}
			if !reflect.DeepEqual(r.Run(), run) {
				t.Errorf("Run() = %+v, want %+v", r.Run(), run)
			}
			if got, want := r.Detector().Sensors(), tc.s.det.Sensors(); !reflect.DeepEqual(got, want) {
				t.Errorf("detector sensors differ: got %d sensors, want %d", len(got), len(want))
			}
			if r.Detector().Tank() != tc.s.det.Tank() || r.Detector().CathodeDiameter() != tc.s.det.CathodeDiameter() {
				t.Errorf("detector = %v, want %v", r.Detector(), tc.s.det)
			}
			if d := modelDifference(r.Sensor(), tc.s.model); d != "" {
				t.Errorf("sensor model differs: %s", d)
			}
		})
	}
}

// modelDifference compares two models field by field through the file's
// own column table and the curves' points.
func modelDifference(a, b pmt.Model) string {
	var ra, rb sensorRecord
	ra.set(&a)
	rb.set(&b)
	return firstDifference(ra.cols(), rb.cols())
}

// TestEmptyListsReadNil: an empty non-nil list is stored like a nil one
// and reads back as nil.
func TestEmptyListsReadNil(t *testing.T) {
	s := smallSetup(t)
	e := Event{Number: 3, Hits: []pmt.Hit{}}
	e.Truth.Tracks = []Track{}
	path := tempPath(t, "e.root")
	writeFile(t, path, s, testRun(0, 10), []Event{e})
	_, got := readAll(t, path)
	if len(got) != 1 || got[0].Hits != nil || got[0].Truth.Tracks != nil || got[0].Truth.Primaries != nil {
		t.Fatalf("got %+v, want one event with nil lists", got)
	}
}

// TestEmptyFile: a file with no events is valid.
func TestEmptyFile(t *testing.T) {
	s := demoSetup(t)
	path := tempPath(t, "e.root")
	writeFile(t, path, s, testRun(0, 10), nil)
	r, got := readAll(t, path)
	if r.Len() != 0 || len(got) != 0 {
		t.Fatalf("Len() = %d, read %d events, want 0", r.Len(), len(got))
	}
}

// TestRangeAndEvent checks random access against sequential reading.
func TestRangeAndEvent(t *testing.T) {
	s := smallSetup(t)
	events := randomEvents(2, 0, 50, s.det.NumSensors(), 20)
	path := tempPath(t, "e.root")
	writeFile(t, path, s, testRun(0, 50), events)
	r, _ := readAll(t, path)

	var got []Event
	for e, err := range r.Range(17, 9) {
		if err != nil {
			t.Fatal(err)
		}
		got = append(got, e)
	}
	if !reflect.DeepEqual(got, events[17:26]) {
		t.Errorf("Range(17, 9) differs from events[17:26]")
	}
	for _, i := range []int{0, 33, 49} {
		e, err := r.Event(i)
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(e, events[i]) {
			t.Errorf("Event(%d) differs from the written event", i)
		}
	}
	// Breaking out of the loop stops the iteration cleanly.
	n := 0
	for _, err := range r.Events() {
		if err != nil {
			t.Fatal(err)
		}
		n++
		if n == 5 {
			break
		}
	}
	if n != 5 {
		t.Errorf("iterated %d events before break, want 5", n)
	}
	for _, c := range [][2]int{{-1, 2}, {0, 51}, {49, 2}, {0, -1}} {
		for _, err := range r.Range(c[0], c[1]) {
			if err == nil || !strings.Contains(err.Error(), "outside") {
				t.Errorf("Range(%d, %d): error %v, want an out-of-range error", c[0], c[1], err)
			}
		}
	}
	if _, err := r.Event(50); err == nil {
		t.Errorf("Event(50) of 50 events: no error")
	}
}

// TestPanicInLoopBodyPropagates: the reader's recovery from decoder panics
// must not swallow a panic of the caller's own loop body.
func TestPanicInLoopBodyPropagates(t *testing.T) {
	s := smallSetup(t)
	path := tempPath(t, "e.root")
	writeFile(t, path, s, testRun(0, 10), randomEvents(3, 0, 3, s.det.NumSensors(), 5))
	r, _ := readAll(t, path)
	defer func() {
		if p := recover(); p != "mine" {
			t.Errorf("recovered %v, want the loop body's panic", p)
		}
	}()
	for range r.Events() {
		panic("mine")
	}
}

// TestAtomicWrite: the final name appears only at Close; Abort and a
// failed Close leave nothing behind.
func TestAtomicWrite(t *testing.T) {
	s := smallSetup(t)
	dir := t.TempDir()
	path := filepath.Join(dir, "run.root")
	w, err := Create(path, s.det, s.model, testRun(0, 10))
	if err != nil {
		t.Fatal(err)
	}
	e := randomEvents(4, 0, 1, s.det.NumSensors(), 5)[0]
	if err := w.Write(&e); err != nil {
		t.Fatal(err)
	}
	names := dirEntries(t, dir)
	if !slices.Equal(names, []string{".run.root.tmp"}) {
		t.Fatalf("directory during writing holds %v, want one temporary file", names)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	if names := dirEntries(t, dir); !slices.Equal(names, []string{"run.root"}) {
		t.Fatalf("directory after Close holds %v, want [run.root]", names)
	}
	if err := w.Close(); err == nil {
		t.Errorf("second Close: no error")
	}
	if err := w.Write(&e); err == nil || !strings.Contains(err.Error(), "after Close") {
		t.Errorf("Write after Close: error %v", err)
	}
	if err := w.Abort(); err != nil {
		t.Errorf("Abort after Close: %v", err)
	}

	// Abort leaves the earlier file untouched and removes the temporary.
	w, err = Create(path, s.det, s.model, testRun(0, 10))
	if err != nil {
		t.Fatal(err)
	}
	if err := w.Write(&e); err != nil {
		t.Fatal(err)
	}
	if err := w.Abort(); err != nil {
		t.Fatal(err)
	}
	if names := dirEntries(t, dir); !slices.Equal(names, []string{"run.root"}) {
		t.Fatalf("directory after Abort holds %v, want [run.root]", names)
	}
	if _, got := readAll(t, path); len(got) != 1 {
		t.Errorf("file after an aborted rewrite holds %d events, want the original 1", len(got))
	}
}

// TestWriteRejectsBadEvents: each bad event gives an error naming the
// field and value, and the writer stays usable.
func TestWriteRejectsBadEvents(t *testing.T) {
	s := smallSetup(t) // 4 sensors
	path := tempPath(t, "e.root")
	w, err := Create(path, s.det, s.model, testRun(100, 10))
	if err != nil {
		t.Fatal(err)
	}
	defer w.Abort()
	good := func() Event { return randomEvents(5, 100, 1, 4, 5)[0] }
	for _, tc := range []struct {
		want string
		edit func(*Event)
	}{
		{"Hits[0].Sensor = 4 outside [0, 4)", func(e *Event) { e.Hits = []pmt.Hit{{Sensor: 4}} }},
		{"Hits[1].Sensor = -1", func(e *Event) { e.Hits = []pmt.Hit{{}, {Sensor: -1}} }},
		{"Hits[0].Time = NaN", func(e *Event) { e.Hits = []pmt.Hit{{Time: nan()}} }},
		{"Hits[0].Charge = +Inf", func(e *Event) { e.Hits = []pmt.Hit{{Charge: inf()}} }},
		{"Number = 99 outside the run's range [100, 109]", func(e *Event) { e.Number = 99 }},
		{"Number = 110 outside", func(e *Event) { e.Number = 110 }},
		{"Truth.Tracks[0].Fate = 99 is not a known fate", func(e *Event) { e.Truth.Tracks = []Track{{Fate: 99}} }},
		{"Truth.Tracks[0].Secondaries = -2", func(e *Event) { e.Truth.Tracks = []Track{{Secondaries: -2}} }},
		{"Truth.Primaries[0].Dir.Y = NaN", func(e *Event) { e.Truth.Primaries = []phys.Particle{{Dir: vec(0, nan(), 0)}} }},
		{"Truth.Primaries[0].PDG = 4294967296 does not fit", func(e *Event) { e.Truth.Primaries = []phys.Particle{{PDG: 1 << 32}} }},
		{"Truth.Photoelectrons = 5 differs from PEDirect+PEScattered+PEReflected = 3", func(e *Event) {
			e.Truth.Photoelectrons, e.Truth.PEDirect, e.Truth.PEScattered, e.Truth.PEReflected = 5, 1, 1, 1
		}},
		{"Truth.DarkPE = -1 must not be negative", func(e *Event) { e.Truth.DarkPE = -1 }},
		{"Truth.TriggerTime = 5 must be 0 when Triggered is false", func(e *Event) { e.Truth.Triggered, e.Truth.TriggerTime = false, 5 }},
		{"Truth.Interaction.Nucleon.Ekin = -Inf", func(e *Event) { e.Truth.Interaction.Nucleon.Ekin = -inf() }},
		{"Truth.Interaction.Weight = NaN", func(e *Event) { e.Truth.Interaction.Weight = nan() }},
		{"Truth.Interaction.SourceEvent = 4 must be 0 when FromFile is false", func(e *Event) {
			e.Truth.Interaction.SourceEvent, e.Truth.Interaction.FromFile = 4, false
		}},
	} {
		e := good()
		tc.edit(&e)
		err := w.Write(&e)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("error %v, want one containing %q", err, tc.want)
		}
	}
	if err := w.Write(nil); err == nil {
		t.Errorf("Write(nil): no error")
	}
	e := good()
	if err := w.Write(&e); err != nil {
		t.Fatalf("good event after rejected ones: %v", err)
	}
	if err := w.Write(&e); err == nil || !strings.Contains(err.Error(), "event Number = 100 after event 100") {
		t.Errorf("the same event twice: error %v", err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	if _, got := readAll(t, path); len(got) != 1 || !reflect.DeepEqual(got[0], e) {
		t.Errorf("file holds %d events, want only the good one", len(got))
	}

	// A run with missing events takes none of them.
	run := testRun(100, 10)
	run.Interrupted, run.Missing = true, []Span{{First: 105, N: 5}}
	w, err = Create(tempPath(t, "m.root"), s.det, s.model, run)
	if err != nil {
		t.Fatal(err)
	}
	defer w.Abort()
	e.Number = 107
	if err := w.Write(&e); err == nil || !strings.Contains(err.Error(), "event Number = 107 lies in the run's missing events 105 to 109") {
		t.Errorf("an event in a missing span: error %v", err)
	}
}

// TestCreateRejectsBadInput: nil detector, invalid model, mismatched
// cathode, bad run settings.
func TestCreateRejectsBadInput(t *testing.T) {
	s := demoSetup(t)
	dir := t.TempDir()
	path := filepath.Join(dir, "e.root")
	badModel := s.model
	badModel.TTS = -1
	otherCathode := pmt.Medium()
	run := testRun(0, 10)
	badShard := run
	badShard.ShardIndex = 3
	noEvents := run
	noEvents.Events = 0
	badTrigger := run
	badTrigger.Trigger.Window = -5
	for _, tc := range []struct {
		name string
		err  func() error
		want string
	}{
		{"nil detector", func() error { _, err := Create(path, nil, s.model, run); return err }, "nil detector"},
		{"invalid model", func() error { _, err := Create(path, s.det, badModel, run); return err }, "TTS"},
		{"cathode", func() error { _, err := Create(path, s.det, otherCathode, run); return err }, "CathodeDiameter = 20.3 cm differs"},
		{"shard", func() error { _, err := Create(path, s.det, s.model, badShard); return err }, "ShardIndex = 3"},
		{"events", func() error { _, err := Create(path, s.det, s.model, noEvents); return err }, "Events = 0"},
		{"trigger", func() error { _, err := Create(path, s.det, s.model, badTrigger); return err }, "Trigger"},
		{"directory", func() error {
			_, err := Create(filepath.Join(dir, "no", "such", "dir", "e.root"), s.det, s.model, run)
			return err
		}, "no such file"},
	} {
		err := tc.err()
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error %v, want one containing %q", tc.name, err, tc.want)
		}
	}
	if names := dirEntries(t, dir); len(names) != 0 {
		t.Errorf("failed Creates left %v", names)
	}
}

// TestOpenNotAnEventFile: a missing file, a non-ROOT file and a ROOT file
// without our trees give errors naming the file.
func TestOpenNotAnEventFile(t *testing.T) {
	dir := t.TempDir()
	for _, tc := range []struct {
		name string
		data []byte
		want string
	}{
		{"text.root", []byte("x,y,z\n1,2,3\n"), "text.root"},
		{"empty.root", nil, "empty.root"},
	} {
		p := filepath.Join(dir, tc.name)
		if err := writeBytes(p, tc.data); err != nil {
			t.Fatal(err)
		}
		if _, err := Open(p); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("Open(%s): error %v", tc.name, err)
		}
	}
	if _, err := Open(filepath.Join(dir, "missing.root")); err == nil {
		t.Errorf("Open of a missing file: no error")
	}
	p := filepath.Join(dir, "other.root")
	if err := writeForeignROOT(p); err != nil {
		t.Fatal(err)
	}
	if _, err := Open(p); err == nil || !strings.Contains(err.Error(), "other.root") || !strings.Contains(err.Error(), "not a conelight event file") {
		t.Errorf("Open of a foreign ROOT file: error %v", err)
	}
}

// TestRunInfoValidateRecord: the run range, missing spans and source
// accounting are checked, each error naming the field.
func TestRunInfoValidateRecord(t *testing.T) {
	for _, tc := range []struct {
		edit func(*RunInfo)
		want string
	}{
		{func(r *RunInfo) { r.Run = Span{First: 12, N: 100} }, "RunInfo.Run = events 12 to 111 does not contain"},
		{func(r *RunInfo) { r.Run = Span{First: 0, N: 15} }, "RunInfo.Run = events 0 to 14 does not contain"},
		{func(r *RunInfo) { r.Missing = []Span{{First: 15, N: 0}} }, "RunInfo.Missing[0] = no events at 15"},
		{func(r *RunInfo) { r.Missing = []Span{{First: 18, N: 5}} }, "RunInfo.Missing[0] = events 18 to 22"},
		{func(r *RunInfo) { r.Missing = []Span{{First: 12, N: 2}, {First: 11, N: 1}} }, "RunInfo.Missing[1] = events 11 to 11"},
		{func(r *RunInfo) { r.Missing = []Span{{First: 12, N: 2}, {First: 13, N: 1}} }, "RunInfo.Missing[1]"},
		{func(r *RunInfo) { r.Source = SourceStats{Read: 2, Skipped: 3} }, "Source.Skipped = 3 exceeds Source.Read = 2"},
		{func(r *RunInfo) { r.Source = SourceStats{Read: 2, Skipped: 1} }, "Source.Reasons has 0 lines for Skipped = 1"},
		{func(r *RunInfo) { r.Source = SourceStats{Read: 2, Skipped: 1, Reasons: []string{"a\nb"}} }, `Source.Reasons[0] = "a\nb" must be one line`},
	} {
		r := testRun(10, 10)
		tc.edit(&r)
		if err := r.Validate(); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%+v: error %v, want one containing %q", r, err, tc.want)
		}
	}
	r := testRun(10, 10)
	r.Run = Span{First: 0, N: 20}
	r.Missing = []Span{{First: 12, N: 2}, {First: 14, N: 6}}
	r.Source = SourceStats{Read: 3, Skipped: 1, Reasons: []string{"event 7: nothing to track"}}
	if err := r.Validate(); err != nil {
		t.Errorf("good record: %v", err)
	}
}
