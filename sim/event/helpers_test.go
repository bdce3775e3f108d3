package event

import (
	"bytes"
	"errors"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/golang/geo/r3"
	"go-hep.org/x/hep/groot"
	"go-hep.org/x/hep/groot/rtree"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// setup is a detector with the sensor model that goes with it.
type setup struct {
	det   *geom.Detector
	model pmt.Model
}

// demoSetup is the demo tank at 20% coverage with large tubes.
func demoSetup(t testing.TB) setup {
	t.Helper()
	m := pmt.Large()
	d, err := geom.Layout(geom.DemoTank(), m.CathodeDiameter, 0.2)
	if err != nil {
		t.Fatal(err)
	}
	return setup{d, m}
}

// smallSetup is a hand-placed layout in a small tank with small tubes: two
// barrel sensors and one on each cap.
func smallSetup(t testing.TB) setup {
	t.Helper()
	m := pmt.Small()
	tank := geom.Tank{Radius: 110, Height: 230, SensorOffset: 10}
	r, h := tank.SensorRadius(), tank.SensorHalfHeight()
	sensors := []geom.Sensor{
		{Pos: r3.Vector{X: r, Y: 0, Z: 0}, Dir: r3.Vector{X: -1}},
		{Pos: r3.Vector{X: 0, Y: r, Z: 40}, Dir: r3.Vector{Y: -1}},
		{Pos: r3.Vector{X: 20, Y: -30, Z: h}, Dir: r3.Vector{Z: -1}},
		{Pos: r3.Vector{X: 0, Y: 0, Z: -h}, Dir: r3.Vector{Z: 1}},
	}
	d, err := geom.NewDetector(tank, m.CathodeDiameter, sensors)
	if err != nil {
		t.Fatal(err)
	}
	return setup{d, m}
}

func testRun(first, n uint64) RunInfo {
	return RunInfo{
		Seed:       12345,
		Generator:  "muons: 1 GeV, isotropic, uniform in the fiducial volume",
		Version:    "test",
		Water:      "pure water, 20 C, absorption scale 1",
		Options:    "liner reflectivity 0.1",
		ShardCount: 1,
		FirstEvent: first,
		Events:     n,
		Run:        Span{First: first, N: n},
		Trigger:    pmt.Trigger{Threshold: 10, Window: 200, PreTrigger: 400, PostTrigger: 800},
	}
}

func randomVector(rng *rand.Rand, scale float64) r3.Vector {
	return r3.Vector{X: scale * rng.NormFloat64(), Y: scale * rng.NormFloat64(), Z: scale * rng.NormFloat64()}
}

func randomParticle(rng *rand.Rand) phys.Particle {
	codes := []int{phys.Electron, phys.Positron, phys.MuonMinus, phys.MuonPlus, phys.Gamma, phys.ProtonCode}
	return phys.Particle{
		PDG:    codes[rng.IntN(len(codes))],
		Pos:    randomVector(rng, 300),
		Dir:    randomVector(rng, 1).Normalize(),
		Time:   rng.Float64() * 10,
		Ekin:   rng.ExpFloat64() * 500,
		Parent: rng.IntN(3),
		Track:  rng.IntN(1000),
	}
}

// randomEvent fills every field of an event with random content; each
// list is empty (nil) with probability 1/4. maxHits bounds the hit count.
func randomEvent(rng *rand.Rand, number uint64, nSensors, maxHits int) Event {
	n := func(max int) int {
		if rng.IntN(4) == 0 {
			return 0
		}
		return 1 + rng.IntN(max)
	}
	e := Event{Number: number}
	t := &e.Truth
	if k := n(3); k > 0 {
		t.Primaries = make([]phys.Particle, k)
		for i := range t.Primaries {
			t.Primaries[i] = randomParticle(rng)
		}
	}
	if k := n(3); k > 0 {
		t.Tracks = make([]Track, k)
		for i := range t.Tracks {
			t.Tracks[i] = Track{
				PDG: randomParticle(rng).PDG, Length: rng.Float64() * 500, Range: rng.Float64() * 400,
				Fate: phys.Fate(rng.IntN(int(phys.Interacted) + 1)), DecayTime: rng.ExpFloat64() * 2000,
				VisiblePhotons: rng.Float64() * 1e5, Secondaries: rng.IntN(50),
			}
		}
	}
	if k := n(maxHits); k > 0 {
		e.Hits = make([]pmt.Hit, k)
		for i := range e.Hits {
			e.Hits[i] = pmt.Hit{Sensor: rng.IntN(nSensors), Time: rng.NormFloat64() * 50, Charge: rng.ExpFloat64()}
		}
	}
	t.Photons = rng.IntN(1 << 40)
	t.PEDirect, t.PEScattered, t.PEReflected = rng.IntN(1000), rng.IntN(100), rng.IntN(100)
	t.Photoelectrons = t.PEDirect + t.PEScattered + t.PEReflected
	t.DarkPE = rng.IntN(30)
	if rng.IntN(2) == 0 {
		t.Triggered, t.TriggerTime = true, rng.Float64()*100
	}
	if rng.IntN(2) == 0 {
		// The fields added in format version 2 follow from the event
		// number, so that the random draws stay those of version 1's
		// golden file.
		t.Interaction = Interaction{
			PDG: phys.MuonNeu, Etot: rng.Float64() * 1000, Dir: randomVector(rng, 1).Normalize(),
			Q2: rng.Float64() * 1e5, Target: 1000080160, Nucleon: randomParticle(rng),
			Process: 200 + int(number%97), Weight: 1 + float64(number%13)/7,
			SourceEvent: int64(number*3) - 5, FromFile: number%5 != 0,
		}
		if !t.Interaction.FromFile {
			t.Interaction.SourceEvent = 0
		}
	}
	return e
}

// asVersion1 returns events as a file of format version 1 holds them:
// without the interaction fields that version lacked.
func asVersion1(events []Event) []Event {
	out := slices.Clone(events)
	for i := range out {
		in := &out[i].Truth.Interaction
		in.Process, in.Weight, in.SourceEvent, in.FromFile = 0, 0, 0, false
	}
	return out
}

// writeFile writes events to a new file at path.
func writeFile(t testing.TB, path string, s setup, run RunInfo, events []Event) {
	t.Helper()
	writeFileChunked(t, path, s, run, events, defaultChunkSize)
}

// writeFileChunked is writeFile with the given integrity chunk size.
func writeFileChunked(t testing.TB, path string, s setup, run RunInfo, events []Event, chunk int64) {
	t.Helper()
	w, err := create(path, s.det, s.model, run, chunk)
	if err != nil {
		t.Fatal(err)
	}
	defer w.Abort()
	for i := range events {
		if err := w.Write(&events[i]); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
}

// randomEvents returns n random events numbered first, first+1, ...
func randomEvents(seed uint64, first uint64, n, nSensors, maxHits int) []Event {
	rng := rand.New(rand.NewPCG(seed, 7))
	events := make([]Event, n)
	for i := range events {
		events[i] = randomEvent(rng, first+uint64(i), nSensors, maxHits)
	}
	return events
}

// readAll reads every event of the file at path.
func readAll(t testing.TB, path string) (*Reader, []Event) {
	t.Helper()
	r, err := Open(path)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { r.Close() })
	var events []Event
	for e, err := range r.Events() {
		if err != nil {
			t.Fatal(err)
		}
		events = append(events, e)
	}
	return r, events
}

// memFile is an in-memory riofs.Reader over a byte slice, so that many
// damaged copies of a file can be read without touching the disk.
type memFile struct{ *bytes.Reader }

func (memFile) Close() error { return nil }

// readBytes opens data as an event file and reads all of it, returning the
// first error.
func readBytes(data []byte) (*Reader, []Event, error) {
	r, err := newReader("damaged.root", memFile{bytes.NewReader(data)}, int64(len(data)))
	if err != nil {
		return nil, nil, err
	}
	var events []Event
	for e, err := range r.Events() {
		if err != nil {
			return r, events, err
		}
		events = append(events, e)
	}
	return r, events, nil
}

func readFileBytes(t testing.TB, path string) []byte {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	data, err := io.ReadAll(f)
	if err != nil {
		t.Fatal(err)
	}
	return data
}

// dirEntries lists the names in dir.
func dirEntries(t testing.TB, dir string) []string {
	t.Helper()
	es, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range es {
		names = append(names, e.Name())
	}
	return names
}

func tempPath(t testing.TB, name string) string { return filepath.Join(t.TempDir(), name) }

func nan() float64 { return math.NaN() }
func inf() float64 { return math.Inf(1) }

func vec(x, y, z float64) r3.Vector { return r3.Vector{X: x, Y: y, Z: z} }

func writeBytes(path string, data []byte) error { return os.WriteFile(path, data, 0o644) }

// writeForeignROOT writes a valid ROOT file that is not an event file: one
// tree named "other".
func writeForeignROOT(path string) error {
	f, err := groot.Create(path)
	if err != nil {
		return err
	}
	var x float64
	tw, err := rtree.NewWriter(f, "other", []rtree.WriteVar{{Name: "x", Value: &x}})
	if err != nil {
		return err
	}
	if _, err := tw.Write(); err != nil {
		return err
	}
	return errors.Join(tw.Close(), f.Close())
}

// unsetenv removes an environment variable for the test (after a
// t.Setenv of it, which restores it at the end).
func unsetenv(t testing.TB, key string) {
	t.Helper()
	if err := os.Unsetenv(key); err != nil {
		t.Fatal(err)
	}
}
