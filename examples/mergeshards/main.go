// Command mergeshards joins the shard files of one run into one event file
// (see event.MergeWith): the shards must come from the same detector,
// sensor model and run settings, and form a complete set: every shard of
// the run present once, none interrupted, their event ranges joining
// without gap or overlap. With -partial it merges an incomplete set and
// records the missing events in the merged file.
//
//	go run ./examples/mergeshards -out all.root part-*.root
package main

import (
	"flag"
	"fmt"
	"io"
	"os"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/sim/event"
)

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "mergeshards",
	Does:    "Joins the shard files of one run into one event file; the shards must come from the same detector, sensor model and run settings and form a complete set (every shard once, none interrupted, ranges joining), unless -partial.",
	Reads:   "the shard files given as arguments",
	Writes:  "the merged event file -out, and a summary on standard output",
	Example: "go run ./examples/mergeshards -out all.root part-*.root",
	Args:    "SHARD.root ...",
	MinArgs: 1,
}

func main() {
	out := flag.String("out", "merged.root", "output file")
	partial := flag.Bool("partial", false, "merge an incomplete set (shards absent or interrupted) and record the missing events in the output")
	shards := cli.Parse(usage)
	if err := merge(os.Stdout, *out, *partial, shards); err != nil {
		fmt.Fprintln(os.Stderr, "mergeshards:", err)
		os.Exit(1)
	}
}

// merge merges shards into out and writes a summary to w.
func merge(w io.Writer, out string, partial bool, shards []string) error {
	if err := event.MergeWith(out, event.MergeOptions{Partial: partial}, shards...); err != nil {
		return err
	}
	r, err := event.Open(out)
	if err != nil {
		return err
	}
	defer r.Close()
	run := r.Run()
	fmt.Fprintf(w, "merged %d files into %s: %d events stored of event numbers %d to %d\n",
		len(shards), out, r.Len(), run.FirstEvent, run.FirstEvent+run.Events-1)
	if run.Complete() {
		return nil
	}
	fmt.Fprintf(w, "PARTIAL run (recorded in %s):", out)
	if run.Interrupted {
		fmt.Fprint(w, " a shard was interrupted;")
	}
	for _, m := range run.Missing {
		fmt.Fprintf(w, " %v missing;", m)
	}
	fmt.Fprintln(w)
	return nil
}
