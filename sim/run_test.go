package sim

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// isoElectrons is a test generator: one electron of ekin MeV at a random
// point within 200 cm of the centre, isotropic.
type isoElectrons struct{ ekin float64 }

func (g isoElectrons) String() string { return "test electrons" }

func (g isoElectrons) Generate(_ uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, gen.Info, error) {
	c := 2*rng.Float64() - 1
	phi := 2 * math.Pi * rng.Float64()
	s := math.Sqrt(1 - c*c)
	pos := r3.Vector{X: 400*rng.Float64() - 200, Y: 400*rng.Float64() - 200, Z: 400*rng.Float64() - 200}
	return append(dst, phys.Particle{PDG: phys.Electron, Pos: pos, Dir: r3.Vector{X: s * math.Cos(phi), Y: s * math.Sin(phi), Z: c}, Ekin: g.ekin}), gen.Info{}, nil
}

func demoSim(t testing.TB, workers int, mod func(*Config)) *Simulator {
	t.Helper()
	cfg, err := DemoConfig(42)
	if err != nil {
		t.Fatal(err)
	}
	cfg.Workers = workers
	if mod != nil {
		mod(&cfg)
	}
	s, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

func collect(t *testing.T, s *Simulator, opt RunOptions) []*event.Event {
	t.Helper()
	var evs []*event.Event
	err := s.Run(context.Background(), isoElectrons{8}, opt, func(o *event.Event) error {
		evs = append(evs, o)
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return evs
}

func TestRunWorkerIndependence(t *testing.T) {
	// Bit-identical output for 1 and 4 workers: every event depends on
	// (seed, number) alone.
	opt := RunOptions{First: 100, Count: 24}
	a := collect(t, demoSim(t, 1, nil), opt)
	b := collect(t, demoSim(t, 4, nil), opt)
	if len(a) == 0 {
		t.Fatal("no events kept")
	}
	if !reflect.DeepEqual(a, b) {
		t.Fatalf("1 and 4 workers differ (%d vs %d events)", len(a), len(b))
	}
	for i := 1; i < len(a); i++ {
		if a[i].Number <= a[i-1].Number {
			t.Fatalf("events out of order: %d after %d", a[i].Number, a[i-1].Number)
		}
	}
}

func TestRunShards(t *testing.T) {
	// Three shards, contiguous blocks of event numbers, hold exactly the
	// events of the unsplit run.
	s := demoSim(t, 2, func(c *Config) { c.KeepUntriggered = true })
	all := collect(t, s, RunOptions{Count: 20})
	var merged []*event.Event
	for k := 0; k < 3; k++ {
		merged = append(merged, collect(t, s, RunOptions{Count: 20, Shard: k, Shards: 3})...)
	}
	if len(merged) != len(all) {
		t.Fatalf("shards hold %d events, the run %d", len(merged), len(all))
	}
	byNumber := map[uint64]*event.Event{}
	for _, o := range merged {
		byNumber[o.Number] = o
	}
	for _, o := range all {
		if !reflect.DeepEqual(o, byNumber[o.Number]) {
			t.Fatalf("event %d differs between the run and its shard", o.Number)
		}
	}
	// Event on its own, with the generator drawing first from the same
	// stream, gives the same event as the run.
	o := all[7]
	rng := EventStream(s.Config().Seed, o.Number)
	prims, _, _ := isoElectrons{8}.Generate(o.Number, rng, nil)
	w, err := s.newWorker()
	if err != nil {
		t.Fatal(err)
	}
	alone, err := w.simulate(o.Number, rng, prims)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(alone, o) {
		t.Errorf("event %d simulated alone differs from the run", o.Number)
	}
	if err := s.Run(context.Background(), isoElectrons{8}, RunOptions{Count: 3, Shard: 3, Shards: 3}, func(*event.Event) error { return nil }); err == nil {
		t.Error("Shard = Shards accepted")
	}
}

func TestRunCancelAndErrors(t *testing.T) {
	s := demoSim(t, 2, func(c *Config) { c.KeepUntriggered = true })
	ctx, cancel := context.WithCancel(context.Background())
	var got []uint64
	err := s.Run(ctx, isoElectrons{5}, RunOptions{Count: 1000}, func(o *event.Event) error {
		got = append(got, o.Number)
		if len(got) == 5 {
			cancel()
		}
		return nil
	})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled run returned %v", err)
	}
	// What was handed out is an in-order prefix.
	for i, n := range got {
		if n != uint64(i) {
			t.Fatalf("cancelled run gave event %d at position %d", n, i)
		}
	}
	if len(got) >= 1000 {
		t.Fatal("cancellation did not stop the run")
	}
	stop := errors.New("disk full")
	err = s.Run(context.Background(), isoElectrons{5}, RunOptions{Count: 50}, func(o *event.Event) error { return stop })
	if !errors.Is(err, stop) {
		t.Fatalf("output error not returned: %v", err)
	}
	var reports []Progress
	_ = collect(t, s, RunOptions{Count: 4, Progress: func(p Progress) { reports = append(reports, p) }})
	if err := s.Run(context.Background(), isoElectrons{5}, RunOptions{Count: 4, Progress: func(p Progress) { reports = append(reports, p) }}, func(*event.Event) error { return nil }); err != nil {
		t.Fatal(err)
	}
	if last := reports[len(reports)-1]; last.Done != 4 || last.Total != 4 {
		t.Errorf("final progress %+v", last)
	}
}

func TestRunNeutrinoTruth(t *testing.T) {
	// A quasi-elastic nu_mu run keeps the generator's neutrino truth with
	// each event, and the charged lepton is the primary.
	qe, err := gen.NewQE(gen.QEConfig{Neutrino: phys.MuonNeu, Etot: gen.FixedEnergy(600),
		Beam: r3.Vector{X: 1}, Vertex: gen.AtPoint(r3.Vector{})})
	if err != nil {
		t.Fatal(err)
	}
	s := demoSim(t, 2, func(c *Config) { c.KeepUntriggered = true })
	n := 0
	err = s.Run(context.Background(), qe, RunOptions{Count: 6}, func(ev *event.Event) error {
		n++
		nu := ev.Truth.Interaction
		if nu.PDG != phys.MuonNeu || nu.Etot != 600 || nu.Q2 <= 0 || nu.Dir != (r3.Vector{X: 1}) ||
			nu.Process != 200 || nu.Weight != 1 || nu.FromFile || nu.Target == 0 || nu.Nucleon.PDG != phys.ProtonCode {
			t.Errorf("event %d: neutrino truth %+v", ev.Number, nu)
		}
		if len(ev.Truth.Primaries) != 1 || ev.Truth.Primaries[0].PDG != phys.MuonMinus {
			t.Errorf("event %d: primaries %+v", ev.Number, ev.Truth.Primaries)
		}
		return nil
	})
	if err != nil || n != 6 {
		t.Fatalf("run: %v, %d events", err, n)
	}
}

// panickyGen panics at event 3.
type panickyGen struct{ isoElectrons }

func (g panickyGen) Generate(number uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, gen.Info, error) {
	if number == 3 {
		panic("broken generator")
	}
	return g.isoElectrons.Generate(number, rng, dst)
}

func TestRunGeneratorPanic(t *testing.T) {
	// A panic in a user's generator ends the run with an error naming the
	// event, after the events before it were handed out in order.
	s := demoSim(t, 2, func(c *Config) { c.KeepUntriggered = true })
	var got []uint64
	err := s.Run(context.Background(), panickyGen{isoElectrons{5}}, RunOptions{Count: 10}, func(ev *event.Event) error {
		got = append(got, ev.Number)
		return nil
	})
	if err == nil || !strings.Contains(err.Error(), "event 3") || !strings.Contains(err.Error(), "panicked") {
		t.Fatalf("error %v", err)
	}
	if !reflect.DeepEqual(got, []uint64{0, 1, 2}) {
		t.Errorf("events before the panic: %v", got)
	}
}
