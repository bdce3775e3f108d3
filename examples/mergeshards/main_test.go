package main

import (
	"context"
	"math/rand/v2"
	"path/filepath"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// electrons makes one 5 MeV electron at the tank centre going up.
type electrons struct{}

func (electrons) String() string { return "5 MeV electrons" }

func (electrons) Generate(_ uint64, _ *rand.Rand, dst []phys.Particle) ([]phys.Particle, gen.Info, error) {
	return append(dst, phys.Particle{PDG: phys.Electron, Dir: r3.Vector{Z: 1}, Ekin: 5}), gen.Info{}, nil
}

func TestMergePartial(t *testing.T) {
	// Two of three shards: refused naming the absent shard's events,
	// merged with -partial and the gap reported.
	cfg, err := sim.DemoConfig(3)
	if err != nil {
		t.Fatal(err)
	}
	cfg.KeepUntriggered = true
	s, err := sim.New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	var g electrons
	dir := t.TempDir()
	var parts []string
	for _, k := range []int{0, 2} {
		p := filepath.Join(dir, []string{"a.root", "b.root", "c.root"}[k])
		if _, err := s.WriteRun(context.Background(), g, sim.RunOptions{Count: 9, Shard: k, Shards: 3}, p); err != nil {
			t.Fatal(err)
		}
		parts = append(parts, p)
	}
	out := filepath.Join(dir, "all.root")
	var b strings.Builder
	err = merge(&b, out, false, parts)
	if err == nil || !strings.Contains(err.Error(), "shards 1 of 3 are absent") || !strings.Contains(err.Error(), "events 3 to 5 missing") {
		t.Fatalf("incomplete set: error %v", err)
	}
	if err := merge(&b, out, true, parts); err != nil {
		t.Fatal(err)
	}
	if got := b.String(); !strings.Contains(got, "6 events stored of event numbers 0 to 8") || !strings.Contains(got, "PARTIAL run") || !strings.Contains(got, "events 3 to 5 missing") {
		t.Errorf("summary %q", got)
	}
}
