// Command mergeshards joins the shard files of one run into one event file
// (see event.Merge: the shards must come from the same detector, sensor
// model and run settings, and their event ranges must join).
//
//	go run ./examples/mergeshards -out all.root part-*.root
package main

import (
	"flag"
	"fmt"
	"github.com/conelight/conelight/examples/internal/cli"
	"os"

	"github.com/conelight/conelight/sim/event"
)

// usage is the program's -h text.
var usage = cli.Usage{
	Name:    "mergeshards",
	Does:    "Joins the shard files of one run into one event file; the shards must come from the same detector, sensor model and run settings, and their event ranges must join.",
	Reads:   "the shard files given as arguments",
	Writes:  "the merged event file -out",
	Example: "go run ./examples/mergeshards -out all.root part-*.root",
	Args:    "SHARD.root ...",
	MinArgs: 1,
}

func main() {
	out := flag.String("out", "merged.root", "output file")
	shards := cli.Parse(usage)
	if err := event.Merge(*out, shards...); err != nil {
		fmt.Fprintln(os.Stderr, "mergeshards:", err)
		os.Exit(1)
	}
	fmt.Printf("merged %d files into %s\n", len(shards), *out)
}
