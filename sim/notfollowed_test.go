package sim

import (
	"context"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// TestRunNotFollowed: a NuHepMC file's pions and nucleons are simulated;
// its residual nuclei are recorded in the truth as primaries of fate
// NotFollowed and counted in the run's progress (events 101 and 104 of
// the library-written file hold one each; 104, neutral current, has
// nothing else to track and is counted as empty).
func TestRunNotFollowed(t *testing.T) {
	s := demoSim(t, 2, func(c *Config) { c.KeepUntriggered = true })
	h, err := gen.OpenHepMC("../testdata/gen/hepmc3/nuhepmc_v1_gev_mm.hepmc3", gen.HepMCOptions{Vertex: gen.AtPoint(r3.Vector{})})
	if err != nil {
		t.Fatal(err)
	}
	defer h.Close()
	var evs []*event.Event
	var last Progress
	err = s.Run(context.Background(), h, RunOptions{Count: 5, Progress: func(p Progress) { last = p }},
		func(ev *event.Event) error { evs = append(evs, ev); return nil })
	if err != nil {
		t.Fatal(err)
	}
	if last.Done != 5 || last.Empty != 1 || last.NotFollowed != 2 {
		t.Errorf("progress %+v, want 5 done, 1 empty, 2 not followed", last)
	}
	if len(evs) != 4 {
		t.Fatalf("%d events kept, want 4", len(evs))
	}
	// Event 101: mu-, p followed; the 15O last, not followed.
	tt := evs[0].Truth
	want := []int{phys.MuonMinus, phys.ProtonCode, 1000080150}
	if len(tt.Primaries) != len(want) || len(tt.Tracks) != len(want) {
		t.Fatalf("event 101: primaries %+v, tracks %+v", tt.Primaries, tt.Tracks)
	}
	for i, pdg := range want {
		notFollowed := tt.Tracks[i].Fate == phys.NotFollowed
		if tt.Primaries[i].PDG != pdg || tt.Tracks[i].PDG != pdg || notFollowed != (i == 2) {
			t.Errorf("event 101 primary %d: %+v, track %+v; want PDG %d", i, tt.Primaries[i], tt.Tracks[i], pdg)
		}
	}
	// Event 102: the proton and neutron are followed (the neutron to its
	// capture or exit).
	for i, tr := range evs[1].Truth.Tracks {
		if tr.Fate == phys.NotFollowed || tr.Fate == phys.NoFate {
			t.Errorf("event 102 track %d: %+v", i, tr)
		}
	}
}
