// Package cli gives the example programs one way to describe themselves
// on -h and to read their command line: every program says what it does,
// what it reads and writes, and shows one command line, and no program
// silently ignores an argument it did not expect (the standard flag
// package stops at the first non-flag argument, so "prog extra -n 2"
// would otherwise run with every flag at its default).
package cli

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"strings"
)

// Usage describes a program for its -h text.
type Usage struct {
	// Name is the program's name.
	Name string
	// Does says what the program does, in a sentence or two.
	Does string
	// Reads and Writes name the program's inputs and outputs (files,
	// folders, standard output).
	Reads, Writes string
	// Args names the positional arguments, e.g. "SHARD.root ...". Empty
	// means the program takes none and refuses any.
	Args string
	// MinArgs is the least number of positional arguments when Args is
	// set.
	MinArgs int
	// Example is one command line that runs the program.
	Example string
}

// Write writes the -h text of a program with flag set fs to w.
func (u Usage) Write(w io.Writer, fs *flag.FlagSet) {
	line := "usage: " + u.Name + " [flags]"
	if u.Args != "" {
		line += " " + u.Args
	}
	fmt.Fprintln(w, line)
	fmt.Fprintln(w)
	for _, p := range []struct{ head, text string }{{"", u.Does}, {"reads: ", u.Reads}, {"writes: ", u.Writes}} {
		if p.text != "" {
			fmt.Fprintln(w, p.head+p.text)
		}
	}
	if u.Example != "" {
		fmt.Fprintln(w, "\nexample:\n  "+u.Example)
	}
	fmt.Fprintln(w, "\nflags:")
	out := fs.Output()
	fs.SetOutput(w)
	fs.PrintDefaults()
	fs.SetOutput(out)
}

// ArgError is a command line the flags parsed but the program refuses:
// a stray or missing positional argument.
type ArgError struct{ Msg string }

func (e *ArgError) Error() string { return e.Msg }

// ParseArgs parses args (without the program name) into fs and returns
// the positional arguments. It refuses positional arguments the usage
// does not name, flags after them, and fewer than MinArgs, with an
// *ArgError that names them. On -h it writes the usage text to fs's
// output and returns flag.ErrHelp.
func ParseArgs(fs *flag.FlagSet, u Usage, args []string) ([]string, error) {
	fs.Usage = func() { u.Write(fs.Output(), fs) }
	if err := fs.Parse(args); err != nil {
		return nil, err
	}
	rest := fs.Args()
	if u.Args == "" && len(rest) > 0 {
		return nil, &ArgError{fmt.Sprintf("%s: unexpected argument %q: this program takes flags only, and they must come first (see -h)", u.Name, rest[0])}
	}
	for _, a := range rest {
		if strings.HasPrefix(a, "-") && a != "-" {
			return nil, &ArgError{fmt.Sprintf("%s: flag %q after the arguments: flags must come first (see -h)", u.Name, a)}
		}
	}
	if len(rest) < u.MinArgs {
		return nil, &ArgError{fmt.Sprintf("%s: needs at least %d argument(s) %s, got %d (see -h)", u.Name, u.MinArgs, u.Args, len(rest))}
	}
	return rest, nil
}

// Parse parses the command line of the running program into the default
// flag set and returns its positional arguments. It exits with status 0
// after -h and with status 2 on a bad command line, after saying why.
func Parse(u Usage) []string {
	flag.CommandLine.Init(u.Name, flag.ContinueOnError)
	rest, err := ParseArgs(flag.CommandLine, u, os.Args[1:])
	var ae *ArgError
	switch {
	case errors.Is(err, flag.ErrHelp):
		os.Exit(0)
	case errors.As(err, &ae):
		fmt.Fprintln(os.Stderr, ae)
		os.Exit(2)
	case err != nil:
		// The flag package has printed the error and the usage.
		os.Exit(2)
	}
	return rest
}
