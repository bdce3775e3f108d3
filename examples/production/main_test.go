package main

import (
	"cmp"
	"context"
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/examples/internal/detflag"
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

// -detector: a production of a described tank writes that tank's
// detector, and the event file reproduces it through -detector again
// (all but the dead sensors, which event files do not record).
func TestDetectorFile(t *testing.T) {
	example := filepath.Join("..", "..", "testdata", "setup", "example.toml")
	want, err := detflag.Load(example)
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "pool.root")
	o := options{particle: "e-", emin: 15, emax: 15, count: 2, seed: 3, shards: 1, wall: 100, detector: example, out: out}
	if _, err := run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	got, err := detflag.Load(out)
	if err != nil {
		t.Fatal(err)
	}
	if got.Detector.NumSensors() != want.Detector.NumSensors() || got.Sensor.Name != want.Sensor.Name ||
		got.Water.Config() != want.Water.Config() || got.Liner != want.Liner || got.Trigger != want.Trigger {
		t.Errorf("event file gives %d sensors of %q, water %+v, liner %+v, trigger %+v; want %d of %q, %+v, %+v, %+v",
			got.Detector.NumSensors(), got.Sensor.Name, got.Water.Config(), got.Liner, got.Trigger,
			want.Detector.NumSensors(), want.Sensor.Name, want.Water.Config(), want.Liner, want.Trigger)
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

// TestSlurmScriptRuns runs the Slurm script with bash, with stand-ins for
// sbatch and the production program: outside a task it submits the array
// and the merge that waits for it; as task K it removes a stale temporary
// file and runs shard K into part-K.root.
func TestSlurmScriptRuns(t *testing.T) {
	bash, err := exec.LookPath("bash")
	if err != nil {
		t.Skip("no bash")
	}
	var o options
	fs := flag.NewFlagSet("production", flag.ContinueOnError)
	defineFlags(fs, &o)
	if _, err := cli.ParseArgs(fs, usage, []string{"-count", "50", "-seed", "3", "-shards", "4", "-batch", "slurm"}); err != nil {
		t.Fatal(err)
	}
	script, err := batchScript(o.batch, fs, o.shards)
	if err != nil {
		t.Fatal(err)
	}
	dir, bin := t.TempDir(), t.TempDir()
	write := func(path, text string) {
		if err := os.WriteFile(path, []byte(text), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	write(filepath.Join(dir, "production.slurm"), script)
	write(filepath.Join(bin, "sbatch"), "#!/bin/sh\necho \"$@\" >> sbatch.log\necho 4242\n")
	write(filepath.Join(dir, "conelight-production"), "#!/bin/sh\nfor a in \"$@\"; do echo \"$a\"; done > args.txt\n")
	runScript := func(env ...string) {
		cmd := exec.Command(bash, "production.slurm")
		cmd.Dir = dir
		cmd.Env = append(os.Environ(), append(env, "PATH="+bin+string(os.PathListSeparator)+os.Getenv("PATH"))...)
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("bash production.slurm %v: %v\n%s", env, err, out)
		}
	}

	runScript("SLURM_ARRAY_TASK_ID=")
	log, err := os.ReadFile(filepath.Join(dir, "sbatch.log"))
	if err != nil {
		t.Fatal(err)
	}
	want := "--parsable production.slurm\n--dependency=afterok:4242 --job-name=conelight-merge --output=merge.log --wrap ./conelight-mergeshards -out run.root part-*.root\n"
	if string(log) != want {
		t.Errorf("submission calls sbatch with\n%s\nwant\n%s", log, want)
	}

	for k := range 4 {
		stale := filepath.Join(dir, fmt.Sprintf(".part-%d.root.tmp", k))
		write(stale, "left by a killed attempt")
		runScript(fmt.Sprintf("SLURM_ARRAY_TASK_ID=%d", k))
		if _, err := os.Stat(stale); !os.IsNotExist(err) {
			t.Errorf("task %d left the stale temporary file", k)
		}
		args, err := os.ReadFile(filepath.Join(dir, "args.txt"))
		if err != nil {
			t.Fatal(err)
		}
		var j options
		fs := flag.NewFlagSet("production", flag.ContinueOnError)
		defineFlags(fs, &j)
		if _, err := cli.ParseArgs(fs, usage, strings.Fields(string(args))); err != nil {
			t.Fatal(err)
		}
		if j.shard != k || j.shards != 4 || j.out != fmt.Sprintf("part-%d.root", k) || j.count != 50 || j.seed != 3 || j.batch != "" {
			t.Errorf("task %d runs %+v", k, j)
		}
	}
}
