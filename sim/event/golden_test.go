package event

import (
	"flag"
	"path/filepath"
	"reflect"
	"testing"
)

var update = flag.Bool("update", false, "rewrite testdata/event/format-v1.root")

// goldenPath is a file written by format version 1 of this package and
// committed, so that a later change that can no longer read it fails here.
var goldenPath = filepath.Join("..", "..", "testdata", "event", "format-v1.root")

// goldenContent is what the golden file holds: a fixed draw of random
// events in the small layout.
func goldenContent(t *testing.T) (setup, RunInfo, []Event) {
	s := smallSetup(t)
	run := testRun(500, 8)
	run.ShardIndex, run.ShardCount = 2, 5
	return s, run, randomEvents(21, 500, 6, s.det.NumSensors(), 12)
}

func TestGoldenFile(t *testing.T) {
	s, run, events := goldenContent(t)
	if *update {
		writeFile(t, goldenPath, s, run, events)
	}
	r, got := readAll(t, goldenPath)
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
}
