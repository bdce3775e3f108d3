package main

import (
	"cmp"
	"context"
	"flag"
	"fmt"
	"path/filepath"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/event"
)

func TestShardsAndMerge(t *testing.T) {
	// The batch recipe at a tiny size: two shards merged hold the events of
	// the unsplit run.
	dir := t.TempDir()
	base := options{particle: "e-", emin: 8, emax: 12, count: 6, seed: 9, shards: 1, wall: 100}
	whole := base
	whole.out = filepath.Join(dir, "whole.root")
	if _, err := run(context.Background(), whole); err != nil {
		t.Fatal(err)
	}
	var parts []string
	for k := 0; k < 2; k++ {
		o := base
		o.shard, o.shards = k, 2
		o.out = filepath.Join(dir, "part"+string(rune('0'+k))+".root")
		if _, err := run(context.Background(), o); err != nil {
			t.Fatal(err)
		}
		parts = append(parts, o.out)
	}
	merged := filepath.Join(dir, "merged.root")
	if err := event.Merge(merged, parts...); err != nil {
		t.Fatal(err)
	}
	read := func(p string) []event.Event {
		r, err := event.Open(p)
		if err != nil {
			t.Fatal(err)
		}
		defer r.Close()
		var evs []event.Event
		for ev, err := range r.Events() {
			if err != nil {
				t.Fatal(err)
			}
			evs = append(evs, ev)
		}
		return evs
	}
	if a, b := read(whole.out), read(merged); len(a) == 0 || !reflect.DeepEqual(a, b) {
		t.Fatalf("merged shards differ from the run: %d vs %d events", len(a), len(b))
	}
	if _, err := run(context.Background(), options{particle: "kaon"}); err == nil {
		t.Error("unknown particle accepted")
	}
}

// scriptJobs parses a job script made by batchScript: the job indices
// and, for each, the production's arguments.
func scriptJobs(t *testing.T, system, script string) map[int][]string {
	t.Helper()
	jobs := map[int][]string{}
	var n int
	var argLine, index string
	for _, line := range strings.Split(script, "\n") {
		switch system {
		case "slurm":
			if r, ok := strings.CutPrefix(line, "#SBATCH --array=0-"); ok {
				last, err := strconv.Atoi(r)
				if err != nil {
					t.Fatalf("array line %q: %v", line, err)
				}
				n = last + 1
			}
			if r, ok := strings.CutPrefix(line, "exec ./conelight-production "); ok {
				argLine, index = r, "$k"
			}
			if line == `k="$SLURM_ARRAY_TASK_ID"` {
				jobs[-1] = nil // the index comes from the array
			}
		case "htcondor":
			if r, ok := strings.CutPrefix(line, "queue "); ok {
				var err error
				if n, err = strconv.Atoi(r); err != nil {
					t.Fatalf("queue line %q: %v", line, err)
				}
			}
			if r, ok := strings.CutPrefix(line, "arguments             = "); ok {
				argLine, index = strings.Trim(r, `"`), "$(Process)"
				jobs[-1] = nil
			}
		}
	}
	if n == 0 || argLine == "" || jobs[-1] != nil || len(jobs) != 1 {
		t.Fatalf("%s script: no job count, argument line or index:\n%s", system, script)
	}
	delete(jobs, -1)
	for k := 0; k < n; k++ {
		line := strings.ReplaceAll(strings.ReplaceAll(argLine, index, strconv.Itoa(k)), `"`, "")
		jobs[k] = strings.Fields(line)
	}
	return jobs
}

func TestBatchTemplates(t *testing.T) {
	// Each template maps the job index to the shard: the jobs' shards
	// cover every event of the run exactly once, each job writes its own
	// file in the submit directory, and the run settings pass unchanged.
	cmd := []string{"-particle", "mu-", "-emin", "200", "-emax", "1000", "-count", "1003", "-seed", "77", "-shards", "7", "-wall", "150"}
	for _, system := range []string{"slurm", "htcondor"} {
		t.Run(system, func(t *testing.T) {
			var o options
			fs := flag.NewFlagSet("production", flag.ContinueOnError)
			defineFlags(fs, &o)
			if _, err := cli.ParseArgs(fs, usage, append(cmd, "-batch", system)); err != nil {
				t.Fatal(err)
			}
			script, err := batchScript(o.batch, fs, o.shards)
			if err != nil {
				t.Fatal(err)
			}
			jobs := scriptJobs(t, system, script)
			if len(jobs) != 7 {
				t.Fatalf("%d jobs, want 7", len(jobs))
			}
			var spans []event.Span
			outs := map[string]bool{}
			for k, args := range jobs {
				var j options
				fs := flag.NewFlagSet("production", flag.ContinueOnError)
				defineFlags(fs, &j)
				if _, err := cli.ParseArgs(fs, usage, args); err != nil {
					t.Fatalf("job %d: %v (%q)", k, err, args)
				}
				if j.shard != k || j.out != fmt.Sprintf("part-%d.root", k) || outs[j.out] {
					t.Errorf("job %d runs shard %d into %s", k, j.shard, j.out)
				}
				outs[j.out] = true
				run := j
				run.shard, run.out, run.batch = o.shard, o.out, o.batch
				if run != o {
					t.Errorf("job %d runs %+v, want the settings %+v", k, j, o)
				}
				first, n, err := sim.RunOptions{Count: j.count, Shard: j.shard, Shards: j.shards}.ShardRange()
				if err != nil {
					t.Fatal(err)
				}
				spans = append(spans, event.Span{First: first, N: n})
			}
			slices.SortFunc(spans, func(a, b event.Span) int { return cmp.Compare(a.First, b.First) })
			next := uint64(0)
			for _, s := range spans {
				if s.First != next {
					t.Fatalf("shards leave a gap or overlap at event %d: %v", next, spans)
				}
				next += s.N
			}
			if next != 1003 {
				t.Errorf("shards cover events 0 to %d, want 0 to 1002", next-1)
			}
		})
	}

	var o options
	fs := flag.NewFlagSet("production", flag.ContinueOnError)
	defineFlags(fs, &o)
	if _, err := cli.ParseArgs(fs, usage, []string{"-layout", "my layout.csv"}); err != nil {
		t.Fatal(err)
	}
	if _, err := batchScript("slurm", fs, 3); err == nil || !strings.Contains(err.Error(), "-layout") {
		t.Errorf("an argument with a space: error %v", err)
	}
	if _, err := batchScript("pbs", fs, 3); err == nil || !strings.Contains(err.Error(), `-batch = "pbs"`) {
		t.Errorf("unknown batch system: error %v", err)
	}
}
