// Command regen regenerates every derived artefact of the repository, in
// the order they depend on each other, and is safe to rerun (every step
// is deterministic: fixed seeds, recorded dates):
//
//  1. tables: the fitters' embedded tables (go generate in fit/lowenergy
//     and fit/ring), which depend on the physics constants of the
//     simulator;
//  2. baselines: the regression baselines the tests compare with (go test
//     -update), which depend on the tables;
//  3. figures: the README's figures in docs/;
//  4. readme: the README's measured tables, rendered from the baselines
//     and study results between generated-block markers.
//
// Run it from the repository root after a change of physics constants,
// simulator or fitters:
//
//	go run ./examples/regen                  # all four steps
//	go run ./examples/regen -steps readme    # only re-render the README tables
//	go run ./examples/regen -n               # print the commands, run nothing
//
// The test of this package fails when a README block no longer matches
// what the readme step renders from the files in testdata/.
package main

import (
	"flag"
	"fmt"
	"io"
	"os"
	"os/exec"
	"slices"
	"strings"

	"github.com/conelight/conelight/examples/internal/cli"
	"github.com/conelight/conelight/geom/safefile"
)

var usage = cli.Usage{
	Name:    "regen",
	Does:    "Regenerates the fitters' tables, the regression baselines, the README figures and the README's measured tables, in that order; safe to rerun.",
	Reads:   "the repository (run from its root)",
	Writes:  "fit/lowenergy/data, fit/ring tables, testdata baselines, docs/*.png, README.md blocks between generated markers",
	Example: "go run ./examples/regen -steps baselines,readme",
}

// step is one stage of the regeneration: commands run in order, then
// copies of files they wrote (from, to).
type step struct {
	name   string
	cmds   [][]string
	copies [][2]string
}

// demorunFigures is where the figures step has demorun write the ring
// event picture that the README shows.
const demorunFigures = "docs/.demorun-ring"

// steps lists the stages in dependency order.
var steps = []step{
	{"tables", [][]string{
		{"go", "generate", "./fit/lowenergy"},
		{"go", "generate", "./fit/ring"},
	}, nil},
	{"baselines", [][]string{
		{"go", "test", "./sim/event", "-run", "TestGolden", "-update"},
		{"go", "test", "./fit/lowenergy", "-run", "TestResolution", "-update"},
		{"go", "test", "./fit/ring", "-run", "TestDemoRegression", "-update"},
	}, nil},
	{"figures", [][]string{
		{"go", "run", "./examples/coverage", "-out", "docs", "-formats", "png", "-quiet"},
		{"go", "run", "./examples/demorun", "-particle", "e-", "-energy", "800", "-n", "8", "-ringfit", "8", "-quiet", "-out", demorunFigures},
	}, [][2]string{{demorunFigures + "/event.png", "docs/event-ring.png"}}},
}

func main() {
	only := flag.String("steps", "tables,baselines,figures,readme", "comma-separated steps to run, in their fixed order: tables, baselines, figures, readme")
	dry := flag.Bool("n", false, "print the commands without running them")
	cli.Parse(usage)
	want := strings.Split(*only, ",")
	for _, w := range want {
		if w != "readme" && !slices.ContainsFunc(steps, func(s step) bool { return s.name == w }) {
			fmt.Fprintf(os.Stderr, "regen: -steps: unknown step %q (steps: tables, baselines, figures, readme)\n", w)
			os.Exit(2)
		}
	}
	for _, s := range steps {
		if !slices.Contains(want, s.name) {
			continue
		}
		for _, c := range s.cmds {
			fmt.Println("+", strings.Join(c, " "))
			if *dry {
				continue
			}
			cmd := exec.Command(c[0], c[1:]...)
			cmd.Stdout, cmd.Stderr = os.Stdout, os.Stderr
			if err := cmd.Run(); err != nil {
				fmt.Fprintf(os.Stderr, "regen: step %s: %s: %v\n", s.name, strings.Join(c, " "), err)
				os.Exit(1)
			}
		}
		for _, c := range s.copies {
			fmt.Println("+ copy", c[0], c[1])
			if *dry {
				continue
			}
			if err := copyFile(c[0], c[1]); err != nil {
				fmt.Fprintf(os.Stderr, "regen: step %s: %v\n", s.name, err)
				os.Exit(1)
			}
		}
		if s.name == "figures" && !*dry {
			os.RemoveAll(demorunFigures)
		}
	}
	if slices.Contains(want, "readme") {
		fmt.Println("+ render README blocks")
		if *dry {
			return
		}
		changed, err := updateREADME("README.md")
		if err != nil {
			fmt.Fprintln(os.Stderr, "regen: readme:", err)
			os.Exit(1)
		}
		fmt.Printf("README.md: %d block(s) changed\n", changed)
	}
}

// copyFile copies from to to atomically.
func copyFile(from, to string) error {
	data, err := os.ReadFile(from)
	if err != nil {
		return err
	}
	return safefile.Write(to, func(w io.Writer) error { _, err := w.Write(data); return err })
}
