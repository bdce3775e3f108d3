// Package detflag gives every example program the same -detector flag:
// the detector a program simulates or fits is a description file
// (sim/setup format, e.g. testdata/setup/example.toml), the name of a
// built-in description ("demo", "large"), read by the one parser of
// sim/setup, or an event file (.root) whose detector, sensor and run trees
// give the detector of the production that wrote it.
package detflag

import (
	"errors"
	"flag"
	"fmt"
	"io/fs"
	"os"
	"slices"
	"strings"

	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/setup"
)

// Usage is the help text of the -detector flag.
const Usage = "detector: a description file (TOML, see testdata/setup/example.toml), a built-in name (demo, large), or an event file (.root) whose production to reproduce"

// Register adds -detector to fs with the default value def (a built-in
// name or a file) and returns the flag's value, for Load.
func Register(fs *flag.FlagSet, def string) *string {
	return fs.String("detector", def, Usage)
}

// Default is the built-in description an empty -detector value means.
const Default = "demo"

// Load returns the detector that a -detector value names: the file at
// spec if there is one (an event file if its name ends in .root, else a
// description file), otherwise the built-in description of that name;
// the empty value means Default.
// The error names the value and, when it is neither, the built-in names.
func Load(spec string) (setup.Setup, error) {
	if spec == "" {
		spec = Default
	}
	if _, err := os.Stat(spec); err == nil {
		if IsEventFile(spec) {
			return fromEventFile(spec)
		}
		return setup.Load(spec)
	} else if !errors.Is(err, fs.ErrNotExist) {
		return setup.Setup{}, fmt.Errorf("-detector %s: %w", spec, err)
	}
	if slices.Contains(setup.BuiltinNames(), spec) {
		return setup.Builtin(spec)
	}
	return setup.Setup{}, fmt.Errorf("-detector %q: no such file, and not a built-in description (%s)", spec, strings.Join(setup.BuiltinNames(), ", "))
}

// Config returns the simulator configuration of the detector spec names
// (see Load) with the given run seed.
func Config(spec string, seed uint64) (sim.Config, error) {
	s, err := Load(spec)
	if err != nil {
		return sim.Config{}, err
	}
	return SimConfig(s, seed), nil
}

// SimConfig returns the simulator configuration of detector s with the
// given run seed and the simulator's defaults for everything else. It is
// the one place the examples turn a description into a sim.Config.
func SimConfig(s setup.Setup, seed uint64) sim.Config {
	return sim.Config{Setup: s, Seed: seed}
}
