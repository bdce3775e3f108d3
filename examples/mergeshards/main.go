// Command mergeshards joins the shard files of one run into one event file
// (see event.Merge: the shards must come from the same detector, sensor
// model and run settings, and their event ranges must join).
//
//	go run ./examples/mergeshards -out all.root part-*.root
package main

import (
	"flag"
	"fmt"
	"os"

	"github.com/conelight/conelight/sim/event"
)

func main() {
	out := flag.String("out", "merged.root", "output file")
	flag.Parse()
	if flag.NArg() == 0 {
		fmt.Fprintln(os.Stderr, "mergeshards: no input files")
		os.Exit(2)
	}
	if err := event.Merge(*out, flag.Args()...); err != nil {
		fmt.Fprintln(os.Stderr, "mergeshards:", err)
		os.Exit(1)
	}
	fmt.Printf("merged %d files into %s\n", flag.NArg(), *out)
}
