package cli

import (
	"bytes"
	"errors"
	"flag"
	"strings"
	"testing"
)

func newSet() (*flag.FlagSet, *int, *bytes.Buffer) {
	fs := flag.NewFlagSet("prog", flag.ContinueOnError)
	var buf bytes.Buffer
	fs.SetOutput(&buf)
	n := fs.Int("n", 1, "events")
	return fs, n, &buf
}

var u = Usage{Name: "prog", Does: "Simulates things.", Reads: "nothing", Writes: "a table on standard output", Example: "prog -n 5"}

func TestStrayArgumentRefused(t *testing.T) {
	fs, n, _ := newSet()
	_, err := ParseArgs(fs, u, []string{"extra", "-n", "2"})
	var ae *ArgError
	if !errors.As(err, &ae) || !strings.Contains(err.Error(), `"extra"`) {
		t.Fatalf("stray argument: got %v, want an ArgError naming it", err)
	}
	if *n != 1 {
		t.Errorf("n = %d after a refused command line", *n)
	}
}

func TestPositional(t *testing.T) {
	pu := u
	pu.Args, pu.MinArgs = "FILE ...", 1
	fs, n, _ := newSet()
	rest, err := ParseArgs(fs, pu, []string{"-n", "3", "a", "b"})
	if err != nil || len(rest) != 2 || *n != 3 {
		t.Fatalf("got %v %v n=%d", rest, err, *n)
	}
	fs, _, _ = newSet()
	if _, err := ParseArgs(fs, pu, nil); err == nil || !strings.Contains(err.Error(), "at least 1") {
		t.Errorf("missing argument: got %v", err)
	}
	fs, _, _ = newSet()
	if _, err := ParseArgs(fs, pu, []string{"a", "-n", "3"}); err == nil || !strings.Contains(err.Error(), `"-n"`) {
		t.Errorf("flag after arguments: got %v", err)
	}
}

func TestHelpText(t *testing.T) {
	fs, _, buf := newSet()
	_, err := ParseArgs(fs, u, []string{"-h"})
	if !errors.Is(err, flag.ErrHelp) {
		t.Fatalf("-h: got %v", err)
	}
	for _, want := range []string{"usage: prog [flags]", u.Does, "reads: nothing", "writes: a table", "example:\n  prog -n 5", "-n int"} {
		if !strings.Contains(buf.String(), want) {
			t.Errorf("-h text lacks %q:\n%s", want, buf)
		}
	}
}
