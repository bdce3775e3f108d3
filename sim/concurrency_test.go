package sim

import (
	"context"
	"os"
	"reflect"
	"sync"
	"testing"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
)

// TestConcurrentUse shares one Simulator and one file-reading generator
// between goroutines: four call Event directly (drawing scratch from the
// pool at once) while two Runs go on, each with two workers. Every result
// must equal the serial one. Run under -race (as CI does) this is also the
// check that Simulator, the HepMC generator and what they share (detector,
// sensor model, water, emitter, tracer, transport tables) are safe for
// concurrent use.
func TestConcurrentUse(t *testing.T) {
	f, err := os.Open("../testdata/gen/two_events.hepmc")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	hep, err := gen.ReadHepMC(f, "two_events.hepmc", gen.HepMCOptions{Vertex: gen.InFiducial(demoSim(t, 1, nil).Config().Detector.Tank(), 100)})
	if err != nil {
		t.Fatal(err)
	}
	mod := func(c *Config) { c.KeepUntriggered = true }
	s := demoSim(t, 2, mod)
	gun := reproGun(t, s)
	const n = 6
	opt := RunOptions{Count: 2}
	serialRun := map[string][]*event.Event{
		"gun": runEvents(t, demoSim(t, 1, mod), gun, RunOptions{Count: n}),
		"hep": runEvents(t, demoSim(t, 1, mod), hep, opt),
	}
	serialEvent := make([]*event.Event, n)
	for i := range n {
		ps, _, err := gun.Generate(uint64(i), EventStream(1, uint64(i)), nil)
		if err != nil {
			t.Fatal(err)
		}
		if serialEvent[i], err = demoSim(t, 1, mod).Event(uint64(i), ps); err != nil {
			t.Fatal(err)
		}
	}

	var wg sync.WaitGroup
	got := make([]*event.Event, n)
	errs := make(chan error, n+2)
	for g := range 4 {
		wg.Go(func() {
			for i := g; i < n; i += 4 {
				var err error
				if got[i], err = s.Event(uint64(i), serialEvent[i].Truth.Primaries); err != nil {
					errs <- err
				}
			}
		})
	}
	runs := map[string][]*event.Event{}
	var mu sync.Mutex
	for name, g := range map[string]gen.Generator{"gun": gun, "hep": hep} {
		wg.Go(func() {
			o := opt
			if name == "gun" {
				o.Count = n
			}
			var evs []*event.Event
			if err := s.Run(context.Background(), g, o, func(e *event.Event) error { evs = append(evs, e); return nil }); err != nil {
				errs <- err
			}
			mu.Lock()
			runs[name] = evs
			mu.Unlock()
		})
	}
	wg.Wait()
	close(errs)
	for err := range errs {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got, serialEvent) {
		t.Error("concurrent Event calls differ from serial ones")
	}
	if !reflect.DeepEqual(runs, serialRun) {
		t.Error("concurrent Runs differ from serial ones")
	}
}
