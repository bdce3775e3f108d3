package fit

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os/exec"
	"slices"
	"strings"
	"testing"
)

// The dependency rules of the library (DEVELOPERS.md), checked on the
// import graph that `go list -deps -json` reports:
//
//   - a package under fit/ reaches, of the simulator (sim and its
//     sub-packages), only sim/phys, sim/optics and sim/setup, so that the
//     reconstruction serves real data without the simulator;
//   - geom and pmt reach no simulator package at all.
//
// Tests are outside the rules (go list without -test leaves test imports
// out), and so are the table generators: commands (package main) under
// fit/ that run the simulator to make the fitters' tables. A package that
// exists for tests and generators (fit/internal/sample) is not checked on
// its own, but a library package that imports it is caught through it.

// depRule says which packages of the module a set of packages may reach.
type depRule struct {
	// from: the packages the rule applies to (module-relative path
	// prefixes: "fit" means fit and everything under it).
	from []string
	// forbidden: module-relative prefixes none of them may reach...
	forbidden []string
	// ...except these (exact module-relative paths).
	allowed []string
	// exempt: module-relative paths of non-command packages the rule does
	// not start from (test support), with why.
	exempt map[string]string
}

var depRules = []depRule{
	{
		from:      []string{"fit"},
		forbidden: []string{"sim"},
		allowed:   []string{"sim/phys", "sim/optics", "sim/setup"},
		exempt: map[string]string{
			"fit/internal/sample": "simulated samples for tests and the table generators",
		},
	},
	{
		from:      []string{"geom", "pmt"},
		forbidden: []string{"sim"},
	},
}

// listedPackage is the part of `go list -json` output the check reads.
type listedPackage struct {
	ImportPath string
	Name       string
	Imports    []string
	Standard   bool
}

// modulePackages returns the module's path and, for every package of the
// module in the build graph of fit, geom and pmt, its name and its direct
// imports within the module (module-relative paths).
func modulePackages(t *testing.T) (mod string, names map[string]string, imports map[string][]string) {
	t.Helper()
	gobin, err := exec.LookPath("go")
	if err != nil {
		t.Fatalf("the dependency rules need the go command: %v", err)
	}
	out, err := exec.Command(gobin, "list", "-m").Output()
	if err != nil {
		t.Fatalf("go list -m: %v", err)
	}
	mod = strings.TrimSpace(string(out))
	cmd := exec.Command(gobin, "list", "-deps", "-json", mod+"/fit/...", mod+"/geom/...", mod+"/pmt/...")
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err = cmd.Output()
	if err != nil {
		t.Fatalf("go list -deps -json: %v\n%s", err, stderr.String())
	}
	names, imports = map[string]string{}, map[string][]string{}
	rel := func(p string) (string, bool) {
		if p == mod {
			return ".", true
		}
		r, ok := strings.CutPrefix(p, mod+"/")
		return r, ok
	}
	dec := json.NewDecoder(bytes.NewReader(out))
	for {
		var p listedPackage
		if err := dec.Decode(&p); errors.Is(err, io.EOF) {
			break
		} else if err != nil {
			t.Fatalf("decoding go list output: %v", err)
		}
		r, ok := rel(p.ImportPath)
		if p.Standard || !ok {
			continue
		}
		names[r] = p.Name
		imports[r] = []string{}
		for _, imp := range p.Imports {
			if ri, ok := rel(imp); ok {
				imports[r] = append(imports[r], ri)
			}
		}
	}
	return mod, names, imports
}

// under reports whether module-relative path p is prefix or below it.
func under(p, prefix string) bool {
	return p == prefix || strings.HasPrefix(p, prefix+"/")
}

// depViolations applies the rules to an import graph (module-relative
// paths; names gives each package's name, "main" for commands) and returns
// one message per offending package and forbidden package it reaches,
// naming the shortest import chain, e.g. "fit/ring -> sim/gen".
func depViolations(rules []depRule, names map[string]string, imports map[string][]string) []string {
	var msgs []string
	pkgs := make([]string, 0, len(names))
	for p := range names {
		pkgs = append(pkgs, p)
	}
	slices.Sort(pkgs)
	for _, r := range rules {
		for _, start := range pkgs {
			if names[start] == "main" || r.exempt[start] != "" || !slices.ContainsFunc(r.from, func(f string) bool { return under(start, f) }) {
				continue
			}
			// Breadth first, so each chain reported is a shortest one.
			parent := map[string]string{start: ""}
			queue := []string{start}
			for len(queue) > 0 {
				p := queue[0]
				queue = queue[1:]
				for _, imp := range imports[p] {
					if _, seen := parent[imp]; seen {
						continue
					}
					parent[imp] = p
					queue = append(queue, imp)
				}
			}
			var bad []string
			for p := range parent {
				if slices.Contains(r.allowed, p) {
					continue
				}
				if slices.ContainsFunc(r.forbidden, func(f string) bool { return under(p, f) }) {
					bad = append(bad, p)
				}
			}
			slices.Sort(bad)
			for _, b := range bad {
				chain := []string{b}
				for p := parent[b]; p != ""; p = parent[p] {
					chain = append(chain, p)
				}
				slices.Reverse(chain)
				msgs = append(msgs, fmt.Sprintf("%s reaches %s: %s", start, b, strings.Join(chain, " -> ")))
			}
		}
	}
	return msgs
}

func TestDependencyRules(t *testing.T) {
	mod, names, imports := modulePackages(t)
	// The check must have seen the packages it is about.
	for _, p := range []string{"fit", "fit/lowenergy", "fit/ring", "geom", "pmt"} {
		if _, ok := names[p]; !ok {
			t.Fatalf("go list did not report %s/%s", mod, p)
		}
	}
	for _, m := range depViolations(depRules, names, imports) {
		t.Errorf("dependency rule broken (DEVELOPERS.md): %s", m)
	}
}

// TestDepViolations checks the checker on a made-up import graph.
func TestDepViolations(t *testing.T) {
	names := map[string]string{
		"fit": "fit", "fit/ring": "ring", "fit/ring/internal/gentables": "main",
		"fit/internal/sample": "sample", "fit/lowenergy": "lowenergy",
		"geom": "geom", "pmt": "pmt",
		"sim": "sim", "sim/gen": "gen", "sim/phys": "phys", "sim/optics": "optics", "sim/setup": "setup",
	}
	imports := map[string][]string{
		"fit":                         {"pmt", "sim/setup"},
		"fit/ring":                    {"fit", "sim/gen"},
		"fit/ring/internal/gentables": {"sim"},
		"fit/internal/sample":         {"sim"},
		"fit/lowenergy":               {"fit/internal/sample"},
		"sim":                         {"sim/gen", "sim/phys"},
		"sim/gen":                     {"sim/phys"},
		"sim/setup":                   {"sim/optics", "geom"},
		"sim/optics":                  {"sim/phys"},
		"pmt":                         {"sim/phys"},
	}
	got := depViolations(depRules, names, imports)
	want := []string{
		"fit/lowenergy reaches sim: fit/lowenergy -> fit/internal/sample -> sim",
		"fit/lowenergy reaches sim/gen: fit/lowenergy -> fit/internal/sample -> sim -> sim/gen",
		"fit/ring reaches sim/gen: fit/ring -> sim/gen",
		"pmt reaches sim/phys: pmt -> sim/phys",
	}
	if !slices.Equal(got, want) {
		t.Errorf("violations:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
}
