package sim

import (
	"context"
	"os"
	"reflect"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
)

// badEventsFile returns the HepMC3 library's NuHepMC file with event 1
// (number 102) spoilt: a momentum "x". Event 3 (number 104, neutral
// current) has nothing to track.
func badEventsFile(t *testing.T) *gen.HepMC {
	t.Helper()
	b, err := os.ReadFile("../testdata/gen/hepmc3/nuhepmc_v1_gev_mm.hepmc3")
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(string(b), "P 3 -1 11 5.0000000000000003e-02", "P 3 -1 11 x", 1)
	if text == string(b) {
		t.Fatal("the spoilt line is not in the file")
	}
	h, err := gen.ReadHepMC(strings.NewReader(text), "bad.hepmc3", gen.HepMCOptions{Vertex: gen.AtPoint(r3.Vector{})})
	if err != nil {
		t.Fatal(err)
	}
	return h
}

// TestRunBadEvents: by default a run stops at a bad event with an error
// naming the file, line, event and token; with SkipBad it goes on, leaves
// the bad event out, counts and reports it. An event with nothing to
// track stops neither: it is counted and reported as empty.
func TestRunBadEvents(t *testing.T) {
	s := demoSim(t, 2, func(c *Config) { c.KeepUntriggered = true })
	run := func(policy BadEventPolicy) ([]uint64, []BadEvent, Progress, error) {
		var kept []uint64
		var bad []BadEvent
		var last Progress
		err := s.Run(context.Background(), badEventsFile(t), RunOptions{Count: 4, BadEvents: policy,
			OnBad:    func(b BadEvent) { bad = append(bad, b) },
			Progress: func(p Progress) { last = p }},
			func(ev *event.Event) error { kept = append(kept, ev.Number); return nil })
		return kept, bad, last, err
	}

	kept, bad, _, err := run(StopAtBad)
	t.Logf("stop: %v", err)
	if err == nil || !strings.Contains(err.Error(), `bad.hepmc3 line 28 (event 1, number 102 in the file): P line: px "x" is not a finite number`) {
		t.Errorf("stop: error %v", err)
	}
	if !reflect.DeepEqual(kept, []uint64{0}) || len(bad) != 0 {
		t.Errorf("stop: kept %v, reported %v", kept, bad)
	}

	kept, bad, last, err := run(SkipBad)
	if err != nil {
		t.Fatalf("skip: %v", err)
	}
	for _, b := range bad {
		t.Logf("skip: %+v", b)
	}
	if !reflect.DeepEqual(kept, []uint64{0, 2}) || len(bad) != 2 ||
		bad[0].Number != 1 || bad[0].Empty || !strings.Contains(bad[0].Reason, `line 28 (event 1, number 102 in the file)`) ||
		bad[1].Number != 3 || !bad[1].Empty || !strings.Contains(bad[1].Reason, "number 104 in the file): nothing to track: 2 final-state particles not tracked (1 neutrinos)") {
		t.Errorf("skip: kept %v, reported %+v", kept, bad)
	}
	if last.Done != 4 || last.Kept != 2 || last.Empty != 1 || last.Skipped != 1 {
		t.Errorf("skip: final progress %+v", last)
	}
}
