package event

import (
	"flag"
	"fmt"
	"path/filepath"
	"reflect"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden file of the current format version in testdata/event")

// goldenPath is the file written by format version v of this package and
// committed, so that a later change that can no longer read it fails here.
func goldenPath(v int) string {
	return filepath.Join("..", "..", "testdata", "event", fmt.Sprintf("format-v%d.root", v))
}

// goldenContent is what the golden file of format version v holds: a
// fixed draw of random events in the small layout; from version 2 on, an
// interrupted shard of a run from a generator file.
func goldenContent(t *testing.T, v int) (setup, RunInfo, []Event) {
	s := smallSetup(t)
	run := testRun(500, 8)
	run.ShardIndex, run.ShardCount = 2, 5
	events := randomEvents(21, 500, 6, s.det.NumSensors(), 12)
	if v == 1 {
		run.Run = Span{} // not recorded
		return s, run, asVersion1(events)
	}
	run.Run = Span{First: 0, N: 2000}
	run.Interrupted = true
	run.Missing = []Span{{First: 506, N: 2}}
	run.Source = SourceStats{Read: 7, Skipped: 1, Reasons: []string{"event 3 (line 40): no particle the simulator tracks"}}
	return s, run, events
}

func TestGoldenFile(t *testing.T) {
	for v := oldestVersion; v <= FormatVersion; v++ {
		t.Run(fmt.Sprintf("v%d", v), func(t *testing.T) {
			s, run, events := goldenContent(t, v)
			if *update && v == FormatVersion {
				writeFile(t, goldenPath(v), s, run, events)
			}
			r, got := readAll(t, goldenPath(v))
			if r.FormatVersion() != v {
				t.Errorf("FormatVersion() = %d, want %d", r.FormatVersion(), v)
			}
			if !reflect.DeepEqual(got, events) {
				t.Errorf("golden file events differ from the expected draw")
			}
			if !reflect.DeepEqual(r.Run(), run) {
				t.Errorf("golden Run() = %+v, want %+v", r.Run(), run)
			}
			if !reflect.DeepEqual(r.Detector().Sensors(), s.det.Sensors()) || r.Detector().Tank() != s.det.Tank() {
				t.Errorf("golden detector = %v, want %v", r.Detector(), s.det)
			}
			if d := modelDifference(r.Sensor(), s.model); d != "" {
				t.Errorf("golden sensor model differs: %s", d)
			}
		})
	}
}
