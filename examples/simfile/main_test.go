package main

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/conelight/conelight/sim/event"
)

const libFile = "../../testdata/gen/hepmc3/nuhepmc_v1_gev_mm.hepmc3"

func TestSimFile(t *testing.T) {
	dir := t.TempDir()
	o, err := parseArgs([]string{"-in", libFile, "-out", filepath.Join(dir, "run.root"), "-progress", "1h"}, os.Stderr)
	if err != nil {
		t.Fatal(err)
	}
	var log bytes.Buffer
	sum, err := run(context.Background(), o, &log)
	t.Log(log.String())
	if err != nil {
		t.Fatal(err)
	}
	// Five events: four with something to track, the neutral-current
	// one (number 104) empty and listed.
	if sum.done != 5 || sum.empty != 1 || sum.skippedBad != 0 ||
		!strings.Contains(log.String(), "empty event: sim: event 3 (") || !strings.Contains(log.String(), "number 104 in the file") {
		t.Errorf("summary %+v, log %q", sum, log.String())
	}
	r, err := event.Open(o.out)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	n := 0
	for ev, err := range r.Events() {
		if err != nil {
			t.Fatal(err)
		}
		if ev.Number == 3 {
			t.Error("the empty event was written")
		}
		// The NuHepMC truth of the file (testdata/gen/hepmc3/expected.json).
		in := ev.Truth.Interaction
		want := map[uint64][4]int{0: {14, 200, 101, 1000080160}, 1: {12, 400, 102, 1000080160}, 2: {-14, 201, 103, 2212}, 4: {12, 700, 105, 0}}[ev.Number]
		weight := map[uint64]float64{0: 1.25, 1: 0.75, 2: 1, 4: 2}[ev.Number]
		if in.PDG != want[0] || in.Process != want[1] || in.SourceEvent != int64(want[2]) || in.Target != want[3] || !in.FromFile || in.Q2 <= 0 || in.Weight != weight {
			t.Errorf("event %d: interaction %+v, want PDG, process, number, target %v", ev.Number, in, want)
		}
		n++
	}
	if n != sum.written {
		t.Errorf("file holds %d events, run wrote %d", n, sum.written)
	}
	if src := r.Run().Source; src.Read != 5 || src.Skipped != 1 || !strings.Contains(src.Reasons[0], "number 104 in the file): nothing to track") {
		t.Errorf("run record Source %+v", src)
	}
}

func TestSimFileBadEvent(t *testing.T) {
	dir := t.TempDir()
	b, err := os.ReadFile(libFile)
	if err != nil {
		t.Fatal(err)
	}
	bad := filepath.Join(dir, "bad.hepmc3")
	if err := os.WriteFile(bad, bytes.Replace(b, []byte("P 3 -1 11 5.0000000000000003e-02"), []byte("P 3 -1 11 x"), 1), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, policy := range []string{"stop", "skip"} {
		out := filepath.Join(dir, policy+".root")
		o, err := parseArgs([]string{"-in", bad, "-out", out, "-bad", policy, "-progress", "1h"}, os.Stderr)
		if err != nil {
			t.Fatal(err)
		}
		var log bytes.Buffer
		sum, err := run(context.Background(), o, &log)
		t.Logf("%s: %+v %v\n%s", policy, sum, err, log.String())
		_, statErr := os.Stat(out)
		switch policy {
		case "stop":
			if err == nil || !strings.Contains(err.Error(), `bad.hepmc3 line 28 (event 1, number 102 in the file): P line: px "x"`) || statErr == nil {
				t.Errorf("stop: error %v, output %v", err, statErr)
			}
		case "skip":
			if err != nil || sum.skippedBad != 1 || sum.empty != 1 || statErr != nil ||
				!strings.Contains(log.String(), "bad event skipped: sim: event 1: generator: gen: "+bad+" line 28") {
				t.Errorf("skip: %+v, error %v, output %v", sum, err, statErr)
			}
		}
	}
}

func TestSimFileArgs(t *testing.T) {
	var stderr bytes.Buffer
	for _, args := range [][]string{
		{"-in", libFile, "stray.root"},
		{"-out", "x.root"},
		{"-in", libFile, "-bad", "ignore"},
		{"-in", libFile, "-vertex", "moon"},
	} {
		if _, err := parseArgs(args, &stderr); err == nil {
			t.Errorf("%q accepted", args)
		}
	}
	stderr.Reset()
	if _, err := parseArgs([]string{"-h"}, &stderr); err == nil || !strings.Contains(stderr.String(), "Example:") ||
		!strings.Contains(stderr.String(), "Input (-in)") || !strings.Contains(stderr.String(), "Output (-out)") {
		t.Errorf("-h: %v\n%s", err, stderr.String())
	}
	if _, err := run(context.Background(), options{in: libFile, first: 9, bad: "stop", vertex: "file"}, &stderr); err == nil {
		t.Error("-first beyond the file accepted")
	}
}
