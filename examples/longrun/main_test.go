package main

import (
	"bytes"
	"context"
	"errors"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

func TestRunTiny(t *testing.T) {
	// The long run at a tiny size, so that it cannot rot: a few events
	// written, read back and counted, with progress lines.
	dir := t.TempDir()
	var out, progress bytes.Buffer
	o := options{n: 5, particle: "e-", energy: 10, seed: 2, out: filepath.Join(dir, "e.root"), every: time.Hour, check: true}
	n, err := run(context.Background(), &out, &progress, o)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(out.String(), "read back") || !strings.Contains(progress.String(), "5/5 events") {
		t.Errorf("output %q, progress %q", out.String(), progress.String())
	}
	if n == 0 {
		t.Error("no event kept")
	}
	// A run cancelled before it starts still closes a complete, empty
	// file under the final name.
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	o.out = filepath.Join(dir, "cancelled.root")
	n, err = run(ctx, &out, &progress, o)
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled run: %d events, error %v", n, err)
	}
	if err := check(&out, o.out, n); err != nil {
		t.Errorf("cancelled run's file: %v", err)
	}
	if _, err := run(context.Background(), &out, &progress, options{n: 1, particle: "pion", out: o.out}); err == nil || !strings.Contains(err.Error(), "pion") {
		t.Errorf("unknown particle: %v", err)
	}
}
