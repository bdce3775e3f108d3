package sim

import (
	"context"
	"fmt"
	"math"
	"path/filepath"
	"reflect"
	"runtime"
	"slices"
	"strings"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

// TestRunDescriptionsInWords: the run record's water and option strings
// are settings in words, not Go struct dumps, and name no setting that
// does not act (an attenuation length of 0 cm at 0 nm).
func TestRunDescriptionsInWords(t *testing.T) {
	for _, tc := range []struct {
		name string
		mod  func(*Config)
		want []string
	}{
		{"demo", nil, []string{"absorption of pure water", "no Mie-like scattering", "dark noise on", "extended window off"}},
		{"attenuation", func(c *Config) {
			wc := optics.DefaultWaterConfig()
			wc.AttenuationLength, wc.AttenuationWavelength = 5000, 400
			wc.MieLength = 20000
			w, err := optics.NewWater(wc)
			if err != nil {
				t.Fatal(err)
			}
			c.Water = w
			c.NoDarkNoise = true
			c.ExtendedWindow = 5e5
			c.Muon.NoStraggling = true
		}, []string{"attenuation length 5000 cm at 400 nm", "Mie-like scattering length 20000 cm", "dark noise off",
			"extended window 500000 ns after the primary trigger", "switched off: straggling"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			s := demoSim(t, 1, tc.mod)
			ri, err := s.RunInfo(reproGun(t, s), RunOptions{Count: 1})
			if err != nil {
				t.Fatal(err)
			}
			all := ri.Water + "\n" + ri.Options
			for _, bad := range []string{"{", "}", ":0 ", "0 cm at 0 nm"} {
				if strings.Contains(all, bad) {
					t.Errorf("description holds %q:\n%s", bad, all)
				}
			}
			for _, w := range tc.want {
				if !strings.Contains(all, w) {
					t.Errorf("description lacks %q:\n%s", w, all)
				}
			}
			if w, err := optics.NewWater(ri.Optics.Water); err != nil || !ri.Optics.Recorded ||
				w.Config() != s.Config().Water.Config() || ri.Optics.Liner != s.Config().Liner {
				t.Errorf("RunInfo.Optics = %+v does not rebuild the water %+v and liner %+v (%v)", ri.Optics, s.Config().Water.Config(), s.Config().Liner, err)
			}
			if ri.Setup != s.Config().Name || ri.Setup == "" {
				t.Errorf("RunInfo.Setup = %q, want the setup's name %q", ri.Setup, s.Config().Name)
			}
		})
	}
}

// Published values for the stopped mu- in water (oxygen): the free muon
// mean life phys.MuonLifetime (PDG Review 2024), the total nuclear
// capture rate of mu- on 16O, 102.6e3 /s (Suzuki, Measday and Roalsvig,
// Phys. Rev. C 35 (1987) 2212; from memory), and the Huff factor 0.998
// for the bound decay rate (as used there; from memory). A muon caught by
// hydrogen in water passes to oxygen quickly, so the oxygen values apply
// to every stopped mu-.
const (
	captureRateO16  = 102.6e3 * 1e-9 // per ns
	huffFactorO16   = 0.998
	boundDecayRate  = huffFactorO16 / phys.MuonLifetime // per ns
	lifetimeInWater = 1 / (boundDecayRate + captureRateO16)
	decayFraction   = boundDecayRate / (boundDecayRate + captureRateO16)
)

// TestDecayElectronSubEvent: a 300 MeV mu- stopping in the demo tank
// gives its decay electron as a sub-event. Checked: the fraction of
// stopped muons that decay (truth vertices) against the published
// capture rate; every decay later than the primary readout window
// tagged by a sub-event at the decay time; no sub-event without a decay;
// and the sub-event times after a cut t0 (exponential, memoryless)
// against the mu- lifetime in water, the maximum-likelihood mean life
// with its error tau/sqrt(n).
func TestDecayElectronSubEvent(t *testing.T) {
	n := 3000
	if testing.Short() {
		n = 800
	}
	s := demoSim(t, 1, nil)
	tg := s.Config().Trigger
	t0 := tg.PostTrigger + 300 // ns after the primary trigger: past its readout window
	var stopped, decayed, eligible, tagged, fakes int
	var late []float64
	for i := range n {
		mu := phys.Particle{PDG: phys.MuonMinus, Dir: r3.Vector{Z: 1}, Ekin: 300}
		ev, err := s.Event(uint64(i), []phys.Particle{mu})
		if err != nil {
			t.Fatal(err)
		}
		if !ev.Truth.Triggered {
			t.Fatalf("event %d: the muon did not trigger", i)
		}
		trig := ev.Truth.TriggerTime
		var decay *event.Vertex
		for j := range ev.Truth.Vertices {
			v := &ev.Truth.Vertices[j]
			if v.Track != 1 {
				continue
			}
			switch v.Process {
			case phys.StoppedDecayed:
				stopped++
				decayed++
				decay = v
			case phys.StoppedCaptured:
				stopped++
			case phys.DecayedInFlight:
				decay = v
			}
		}
		if decay != nil && (len(decay.Products) != 1 || decay.Products[0].PDG != phys.Electron) {
			t.Fatalf("event %d: decay vertex products %v, want one electron", i, decay.Products)
		}
		matched := false
		for _, sub := range ev.SubEvents {
			// The electron's light reaches the sensors 0 to ~60 ns after
			// the decay (demo tank), its scattered and reflected light
			// later: a decay at the end of the primary window can leave a
			// sub-event on that tail.
			if dt := trig + sub.Time - decay.Time; decay != nil && dt > -20 && dt < 300 {
				matched = true
				if sub.Time > t0 {
					late = append(late, sub.Time-t0)
				}
			} else {
				fakes++
			}
		}
		if decay != nil && decay.Time-trig > t0 {
			eligible++
			if matched {
				tagged++
			}
		}
	}
	// Truth: the share of stopped muons that decay.
	p := decayFraction
	fd := float64(decayed) / float64(stopped)
	sd := math.Sqrt(p * (1 - p) / float64(stopped))
	t.Logf("stopped mu-: %d, decayed %.4f (published %.4f +- %.4f for this sample)", stopped, fd, p, sd)
	if math.Abs(fd-p) > 3*sd {
		t.Errorf("decayed fraction %.4f, want %.4f +- 3 x %.4f", fd, p, sd)
	}
	// Readout: every decay after the primary window is tagged.
	eff := float64(tagged) / float64(eligible)
	t.Logf("decays after %.0f ns: %d, tagged by a sub-event: %d (%.4f); sub-events without a decay: %d", t0, eligible, tagged, eff, fakes)
	if eligible < n/4 || eff < 0.99 {
		t.Errorf("%d of %d decays after %.0f ns tagged, want at least 99%%", tagged, eligible, t0)
	}
	if fakes > 0 {
		t.Errorf("%d sub-events match no decay", fakes)
	}
	// Time distribution: maximum-likelihood mean life of the sub-event
	// times after t0.
	tau := stat.Mean(late, nil)
	stau := tau / math.Sqrt(float64(len(late)))
	t.Logf("mean life from %d sub-events: %.0f +- %.0f ns (mu- in water %.1f ns, free %.1f ns)", len(late), tau, stau, lifetimeInWater, phys.MuonLifetime)
	if math.Abs(tau-lifetimeInWater) > 3*stau {
		t.Errorf("mean life %.0f +- %.0f ns, want %.1f ns within 3 sigma", tau, stau, lifetimeInWater)
	}
}

// TestNeutronCaptureSubEvent: a positron with a 5 MeV neutron (an inverse
// beta decay-like pair) in the demo tank with a 1 ms extended window.
// Checked: the neutron's capture is a truth vertex with its gamma; a
// capture that triggers is a sub-event at the capture time, and no
// sub-event lacks a capture; the extended window holds every hit up to 1
// ms after the primary trigger: away from the captures, its hit rate is
// the dark rate of the live sensors (Poisson error), and in the 100 ns
// after each capture the hits exceed it.
func TestNeutronCaptureSubEvent(t *testing.T) {
	n := 300
	if testing.Short() {
		n = 100
	}
	const ext = 1e6 // ns
	s := demoSim(t, 1, func(c *Config) { c.ExtendedWindow = ext })
	cfg := s.Config()
	tg := cfg.Trigger
	var captures, inWindow, subs, fakes, captureHits int
	var darkHits int
	var darkTime float64
	for i := range n {
		pos := r3.Vector{X: 100, Y: -50, Z: 30}
		ps := []phys.Particle{
			{PDG: phys.Positron, Pos: pos, Dir: r3.Vector{Z: 1}, Ekin: 20},
			{PDG: phys.NeutronCode, Pos: pos, Dir: r3.Vector{X: 1}, Ekin: 5},
		}
		ev, err := s.Event(uint64(i), ps)
		if err != nil {
			t.Fatal(err)
		}
		if !ev.Truth.Triggered {
			t.Fatalf("event %d: the positron did not trigger", i)
		}
		trig := ev.Truth.TriggerTime
		var capture *event.Vertex
		for j := range ev.Truth.Vertices {
			if v := &ev.Truth.Vertices[j]; v.Track == 2 && v.Process == phys.Captured {
				capture = v
			}
		}
		if capture == nil {
			if ev.Truth.Tracks[1].Fate != phys.Exited {
				t.Fatalf("event %d: neutron fate %v without a capture vertex", i, ev.Truth.Tracks[1].Fate)
			}
			continue
		}
		captures++
		var gamma float64
		for _, p := range capture.Products {
			if p.PDG != phys.Gamma {
				t.Fatalf("event %d: capture product PDG %d, want gammas", i, p.PDG)
			}
			gamma += p.Ekin
		}
		if gamma < 2 || gamma > 9 {
			t.Fatalf("event %d: capture gammas carry %.3f MeV, want 2.2 (H) to 8.5 (Gd)", i, gamma)
		}
		for _, sub := range ev.SubEvents {
			if dt := trig + sub.Time - capture.Time; dt > -20 && dt < 300 {
				subs++
			} else {
				fakes++
			}
		}
		_, end := tg.ReadoutWindow(trig)
		if capture.Time > end+200 && capture.Time < trig+ext-200 {
			inWindow++
			for _, h := range ev.Extended {
				if h.Time >= capture.Time && h.Time < capture.Time+100 {
					captureHits++
				}
			}
			// Dark hits: away from the 100 ns after the capture and the
			// primary's light (its readout window).
			for _, h := range ev.Extended {
				if h.Time < capture.Time-100 || h.Time > capture.Time+1000 {
					darkHits++
				}
			}
			darkTime += trig + ext - end - 1100
		}
		for j, h := range ev.Extended {
			if h.Time <= end || h.Time > trig+ext || (j > 0 && h.Time < ev.Extended[j-1].Time) {
				t.Fatalf("event %d: extended hit %d at %.1f ns outside (%.1f, %.1f] or out of order", i, j, h.Time, end, trig+ext)
			}
		}
	}
	// Dark hits: every dark pulse is one photoelectron, a hit when its
	// charge passes the threshold (SPE.CDF), less the pulses that fall in
	// the gate of an earlier one on the same sensor (a fraction
	// DarkRate*IntegrationWindow of them).
	m := cfg.Sensor
	live := cfg.Detector.NumSensors() - len(cfg.Dead)
	perPulse := (1 - m.SPE.CDF(m.Threshold)) * (1 - m.DarkRate*m.IntegrationWindow*1e-9)
	rate := float64(live) * m.DarkRate * 1e-9 * perPulse // dark hits per ns
	wantDark := rate * darkTime
	t.Logf("%d events: %d captures, %d inside the extended window; capture sub-events %d, others %d", n, captures, inWindow, subs, fakes)
	t.Logf("dark hits away from captures: %d, expected %.0f +- %.0f", darkHits, wantDark, math.Sqrt(wantDark))
	t.Logf("hits within 100 ns after the captures: %.2f per capture, dark alone %.2f", float64(captureHits)/float64(inWindow), rate*100)
	if math.Abs(float64(darkHits)-wantDark) > 3*math.Sqrt(wantDark) {
		t.Errorf("dark hits in the extended window %d, want %.0f +- 3 x %.0f", darkHits, wantDark, math.Sqrt(wantDark))
	}
	if excess := float64(captureHits) - rate*100*float64(inWindow); excess < 5*math.Sqrt(rate*100*float64(inWindow)) {
		t.Errorf("the captures add %.0f hits over the dark ones in their 100 ns, want a clear excess", excess)
	}
	if subs == 0 {
		t.Errorf("no capture gave a sub-event")
	}
	// Sub-events that match no capture are dark-noise triggers in the
	// extended window. For Poisson hits of rate r the rate of hits that
	// complete Threshold hits within Window is r P(N >= Threshold-1),
	// N Poisson of mean r Window (the other hits in the window before a
	// hit are Poisson, independently of it): an upper bound of the
	// trigger rate, which counts a run of such hits once.
	k := tg.Threshold
	upper := rate * darkTime * (1 - distuv.Poisson{Lambda: rate * tg.Window}.CDF(float64(k-2)))
	t.Logf("dark-noise sub-events %d, at most %.1f expected (Palm bound)", fakes, upper)
	if float64(fakes) > upper+3*math.Sqrt(upper)+1 {
		t.Errorf("%d sub-events match no capture, more than dark noise gives (at most %.1f)", fakes, upper)
	}
}

// maxEventBytes bounds the memory one neutron-capture event of the large
// tank with a 1 ms extended window allocates: the hits it keeps (about
// 44 000 dark hits of 24 bytes, 1.1 MB) and their scratch copy, with
// room for the rest of the event. A buffer of every dark pulse of the
// millisecond would be about as large again; one of the photoelectrons
// of the whole capture time at every sensor, unbounded.
const maxEventBytes = 4 << 20

// TestExtendedWindowMemory: a 20 MeV positron (the primary trigger) with
// a 5 MeV neutron in the large tank with a 1 ms
// extended window (dark pulses over the whole millisecond at 4 kHz on
// every sensor) allocates less than maxEventBytes per event once the
// worker's scratch is grown, and the photoelectron buffer never holds
// more than one readout window's or one dark chunk's pulses.
func TestExtendedWindowMemory(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the large tank")
	}
	cfg, err := LargeConfig(7)
	if err != nil {
		t.Fatal(err)
	}
	cfg.Workers, cfg.ExtendedWindow = 1, 1e6
	s, err := New(cfg)
	if err != nil {
		t.Fatal(err)
	}
	w, err := s.newWorker()
	if err != nil {
		t.Fatal(err)
	}
	neutron := []phys.Particle{
		{PDG: phys.Positron, Pos: r3.Vector{X: 300}, Dir: r3.Vector{Z: 1}, Ekin: 20},
		{PDG: phys.NeutronCode, Pos: r3.Vector{X: 300}, Dir: r3.Vector{Z: 1}, Ekin: 5},
	}
	run := func(number uint64) *event.Event {
		ev, err := w.simulate(number, EventStream(cfg.Seed, number), neutron)
		if err != nil {
			t.Fatal(err)
		}
		return ev
	}
	for i := range 3 { // grow the scratch
		run(uint64(100 + i))
	}
	var before, after runtime.MemStats
	const events = 5
	var kept, sub, triggered int
	runtime.ReadMemStats(&before)
	for i := range events {
		ev := run(uint64(i))
		kept += len(ev.Extended) + len(ev.Hits)
		if ev.Truth.Triggered {
			triggered++
		}
		sub += len(ev.SubEvents)
	}
	runtime.ReadMemStats(&after)
	perEvent := float64(after.TotalAlloc-before.TotalAlloc) / events
	m := cfg.Sensor
	nSensors := cfg.Detector.NumSensors()
	darkPerChunk := float64(nSensors) * m.DarkRate * darkChunk * 1e-9
	t.Logf("large tank, %d sensors at %g Hz, 1 ms extended window: %.0f hits kept per event, %d sub-events in %d events; %.2f MB allocated per event; photoelectron buffer %d (one dark chunk: %.0f)",
		nSensors, m.DarkRate, float64(kept)/events, sub, events, perEvent/(1<<20), cap(w.piece), darkPerChunk)
	if triggered != events {
		t.Fatalf("%d of %d events triggered: the extended window was not exercised", triggered, events)
	}
	if perEvent > maxEventBytes {
		t.Errorf("%.2f MB allocated per event, want at most %.2f MB", perEvent/(1<<20), float64(maxEventBytes)/(1<<20))
	}
	// A readout window of the neutron's own light holds far fewer dark
	// pulses than a chunk; slices grow by at most a factor 2.
	if lim := 4 * (darkPerChunk + 10*math.Sqrt(darkPerChunk) + float64(len(w.pes))); float64(cap(w.piece)) > lim {
		t.Errorf("photoelectron buffer holds %d, want at most %.0f", cap(w.piece), lim)
	}
}

// TestOneClusterReadoutUnchanged: an event whose light forms one cluster
// is read out exactly as one readout of the whole event was before
// sub-events existed (dark pulses over the signal span plus the margins,
// one digitization, the first trigger's window), bit for bit: the same
// random stream is replayed through that procedure, written out here.
func TestOneClusterReadoutUnchanged(t *testing.T) {
	s := demoSim(t, 1, func(c *Config) { c.KeepUntriggered = true; c.Dead = []int{3, 50} })
	w, err := s.newWorker()
	if err != nil {
		t.Fatal(err)
	}
	cfg := s.Config()
	tg := cfg.Trigger
	nSensors := cfg.Detector.NumSensors()
	single := map[int]int{}
	for i := range 40 {
		pdg, ekin := phys.Electron, 15.0
		if i%2 == 1 {
			pdg, ekin = phys.MuonPlus, 300
		}
		prims := []phys.Particle{{PDG: pdg, Pos: r3.Vector{X: float64(i) * 7, Z: -100}, Dir: r3.Vector{X: 0.6, Z: 0.8}, Ekin: ekin}}
		ev, err := w.simulate(uint64(i), EventStream(cfg.Seed, uint64(i)), prims)
		if err != nil {
			t.Fatal(err)
		}
		if len(w.spans) != 1 {
			continue
		}
		single[pdg]++
		// The single readout, on a replay of the event's stream.
		rng := EventStream(cfg.Seed, uint64(i))
		w.rng, w.err, w.nPrimaries, w.secs = rng, nil, 1, w.secs[:0]
		w.pes = w.pes[:0]
		w.visible = append(w.visible[:0], 0)
		if _, err := w.tracker.Run(prims, cfg.Detector, rng, w); err != nil {
			t.Fatal(err)
		}
		t0, t1 := prims[0].Time, prims[0].Time
		for _, pe := range w.pes {
			t0, t1 = math.Min(t0, pe.Time), math.Max(t1, pe.Time)
		}
		t0 -= tg.PreTrigger + tg.Window
		t1 += tg.PostTrigger
		pes, err := cfg.Sensor.AddDark(slices.Clone(w.pes), nSensors, t0, t1, rng)
		if err != nil {
			t.Fatal(err)
		}
		hits, err := cfg.Sensor.Digitize(pes, nSensors, rng, nil)
		if err != nil {
			t.Fatal(err)
		}
		hits = slices.DeleteFunc(hits, func(h pmt.Hit) bool { return h.Sensor == 3 || h.Sensor == 50 })
		tt, ok, err := tg.Find(hits)
		if err != nil {
			t.Fatal(err)
		}
		want := hits
		if ok {
			want = tg.Readout(hits, tt, nil)
		}
		if ok != ev.Truth.Triggered || tt != ev.Truth.TriggerTime || !slices.Equal(want, ev.Hits) {
			t.Errorf("event %d (PDG %d): the readout differs from the single readout (trigger %v at %v, %d hits; want %v at %v, %d hits)",
				i, pdg, ev.Truth.Triggered, ev.Truth.TriggerTime, len(ev.Hits), ok, tt, len(want))
		}
	}
	t.Logf("events of one cluster compared: %v (by PDG)", single)
	if single[phys.Electron] < 15 || single[phys.MuonPlus] == 0 {
		t.Errorf("too few one-cluster events compared: %v", single)
	}
}

// TestInteractionLabPosition: the lab position and time a generator file
// gives reach the event's interaction record; without them it stays zero.
func TestInteractionLabPosition(t *testing.T) {
	info := gen.Info{Neutrino: phys.MuonNeu, NeutrinoEtot: 800, HasLabPos: true,
		LabPos: r3.Vector{X: 1e5, Y: -2e4, Z: 30}, LabTime: 1.5e9}
	in := InteractionTruth(fileGen{isoElectrons{6}}, info)
	if !in.HasLabPos || in.LabPos != info.LabPos || in.LabTime != info.LabTime {
		t.Errorf("InteractionTruth lab position = %v, %v, %v; want %v, %v, true", in.LabPos, in.LabTime, in.HasLabPos, info.LabPos, info.LabTime)
	}
	info.HasLabPos, info.LabPos, info.LabTime = false, r3.Vector{}, 0
	if in := InteractionTruth(fileGen{isoElectrons{6}}, info); in.HasLabPos || in.LabPos != (r3.Vector{}) || in.LabTime != 0 {
		t.Errorf("without a lab position InteractionTruth gives %v, %v, %v", in.LabPos, in.LabTime, in.HasLabPos)
	}
}

// TestSubEventsInFile: a run with dead sensors and an extended window
// writes its sub-events, extended hits and vertices, the setup name, the
// dead sensors (sorted) and the window to the event file, and reads them
// back unchanged.
func TestSubEventsInFile(t *testing.T) {
	s := demoSim(t, 2, func(c *Config) { c.Dead = []int{50, 3}; c.ExtendedWindow = 2e4 })
	g := reproGun(t, s)
	opt := RunOptions{Count: 6}
	want := runEvents(t, s, g, opt)
	path := filepath.Join(t.TempDir(), "sub.root")
	if _, err := s.WriteRun(context.Background(), g, opt, path); err != nil {
		t.Fatal(err)
	}
	r, err := event.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	ri := r.Run()
	if ri.Setup != "demo" || !slices.Equal(ri.Dead, []int{3, 50}) || ri.ExtendedWindow != 2e4 {
		t.Errorf("run record: setup %q, dead %v, extended window %v; want demo, [3 50], 20000", ri.Setup, ri.Dead, ri.ExtendedWindow)
	}
	var got []*event.Event
	for e, err := range r.Events() {
		if err != nil {
			t.Fatal(err)
		}
		got = append(got, &e)
	}
	var subs, ext, vtx int
	for _, e := range want {
		subs, ext, vtx = subs+len(e.SubEvents), ext+len(e.Extended), vtx+len(e.Truth.Vertices)
	}
	if subs == 0 || ext == 0 || vtx == 0 {
		t.Fatalf("nothing to compare: %d sub-events, %d extended hits, %d vertices", subs, ext, vtx)
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("the file's events differ from the run's")
	}
}

// TestSecondaryDecayVertices: the decays of secondary particles are in
// the truth. A 100 MeV pi+ in the demo tank that decays gives a mu+ (the
// product of the pion's decay vertex) whose own decay vertex holds its
// positron; the mu+ decay times after the pion's follow the free muon
// mean life phys.MuonLifetime (PDG Review 2024; maximum-likelihood mean
// with error tau/sqrt(n)).
func TestSecondaryDecayVertices(t *testing.T) {
	n := 1500
	if testing.Short() {
		n = 400
	}
	s := demoSim(t, 1, nil)
	var dts []float64
	var piDecays, missing int
	for i := range n {
		ev, err := s.Event(uint64(i), []phys.Particle{{PDG: phys.PionPlusCode, Dir: r3.Vector{Z: 1}, Ekin: 100}})
		if err != nil {
			t.Fatal(err)
		}
		vs := ev.Truth.Vertices
		for _, v := range vs {
			if v.Track != 1 || (v.Process != phys.StoppedDecayed && v.Process != phys.DecayedInFlight) {
				continue
			}
			if len(v.Products) != 1 || v.Products[0].PDG != phys.MuonPlus {
				continue // pi+ -> e+ nu
			}
			piDecays++
			mu := v.Products[0].Track
			found := false
			for _, u := range vs {
				if u.Track == mu {
					found = true
					if u.PDG != phys.MuonPlus || len(u.Products) != 1 || u.Products[0].PDG != phys.Positron || u.Time < v.Time {
						t.Errorf("event %d: mu+ vertex %+v after the pion's at %v", i, u, v.Time)
					}
					dts = append(dts, u.Time-v.Time)
				}
			}
			if !found {
				missing++
			}
		}
	}
	tau := stat.Mean(dts, nil)
	stau := tau / math.Sqrt(float64(len(dts)))
	t.Logf("%d pi+: %d decays to mu+, mu+ decay vertex missing for %d; mean mu+ life %.0f +- %.0f ns (free %.1f ns)", n, piDecays, missing, tau, stau, phys.MuonLifetime)
	if piDecays < n/2 || missing > 0 {
		t.Errorf("%d pion decays, %d without the muon's decay vertex", piDecays, missing)
	}
	if math.Abs(tau-phys.MuonLifetime) > 3*stau {
		t.Errorf("mu+ mean life %.0f +- %.0f ns, want %.1f ns within 3 sigma", tau, stau, phys.MuonLifetime)
	}
}

// TestSecondaryVertexReading: the reading of a decay or capture from
// the sink (secondaryVertex, used for secondary particles) agrees with
// the transport's own record for primaries, where both exist: same
// process, time, place and products, for stopped and decaying muons,
// pions and neutrons; and it finds none where the record has none. The
// kinds it cannot read (a mu- capture, a mu- decay in flight) are
// counted apart.
func TestSecondaryVertexReading(t *testing.T) {
	n := 200
	if testing.Short() {
		n = 60
	}
	s := demoSim(t, 1, nil)
	w, err := s.newWorker()
	if err != nil {
		t.Fatal(err)
	}
	cfg := s.Config()
	for _, tc := range []struct {
		pdg  int
		ekin float64
	}{{phys.MuonMinus, 200}, {phys.MuonPlus, 200}, {phys.PionPlusCode, 100}, {phys.PionMinusCode, 100}, {phys.NeutronCode, 20}} {
		agree, unreadable := map[phys.Fate]int{}, 0
		for i := range n {
			prims := []phys.Particle{{PDG: tc.pdg, Dir: r3.Vector{Z: 1}, Ekin: tc.ekin}}
			ev, err := w.simulate(uint64(i), EventStream(cfg.Seed, uint64(i)), prims)
			if err != nil {
				t.Fatal(err)
			}
			var rec *event.Vertex
			for j := range ev.Truth.Vertices {
				if ev.Truth.Vertices[j].Track == 1 {
					rec = &ev.Truth.Vertices[j]
				}
			}
			var own []phys.Particle
			for _, p := range w.secs {
				if p.Parent == 1 {
					own = append(own, p)
				}
			}
			got, ok := event.Vertex{}, false
			if len(own) > 0 {
				got, ok = w.secondaryVertex(1, own)
			}
			if rec != nil && tc.pdg == phys.MuonMinus && (rec.Process == phys.StoppedCaptured || rec.Process == phys.DecayedInFlight) {
				unreadable++
				if ok {
					t.Errorf("%d event %d: read %+v where the record has %v", tc.pdg, i, got, rec.Process)
				}
				continue
			}
			switch {
			case rec == nil && ok:
				t.Errorf("%d event %d: read %+v where the record has no vertex", tc.pdg, i, got)
			case rec != nil && !ok:
				t.Errorf("%d event %d: read nothing where the record has %+v", tc.pdg, i, *rec)
			case rec != nil && !reflect.DeepEqual(got, *rec):
				t.Errorf("%d event %d: read %+v, the record has %+v", tc.pdg, i, got, *rec)
			case rec != nil:
				agree[rec.Process]++
			}
		}
		t.Logf("PDG %d, %g MeV: read as recorded %v; not readable (mu- capture or decay in flight) %d", tc.pdg, tc.ekin, agree, unreadable)
	}
}

// BenchmarkCaptureEvent is a 20 MeV positron with a 5 MeV neutron in the
// large tank on one core, without and with a 1 ms extended window: the
// cost of the window (dark pulses of 10 918 sensors at 4 kHz over 1 ms,
// digitized and kept) against the event without it, the floor. B/op is
// the memory the event allocates.
func BenchmarkCaptureEvent(b *testing.B) {
	for _, ext := range []float64{0, 1e6} {
		cfg := largeConfig(b)
		cfg.Workers, cfg.ExtendedWindow = 1, ext
		s, err := New(cfg)
		if err != nil {
			b.Fatal(err)
		}
		prims := []phys.Particle{
			{PDG: phys.Positron, Pos: r3.Vector{X: 300}, Dir: r3.Vector{Z: 1}, Ekin: 20},
			{PDG: phys.NeutronCode, Pos: r3.Vector{X: 300}, Dir: r3.Vector{Z: 1}, Ekin: 5},
		}
		b.Run(fmt.Sprintf("extended=%gns", ext), func(b *testing.B) {
			b.ReportAllocs()
			hits := 0
			for i := 0; i < b.N; i++ {
				ev, err := s.Event(uint64(i), prims)
				if err != nil {
					b.Fatal(err)
				}
				hits += len(ev.Hits) + len(ev.Extended)
			}
			b.ReportMetric(float64(hits)/float64(b.N), "hits/event")
		})
	}
}
