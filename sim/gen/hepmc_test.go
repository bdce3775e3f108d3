package gen

import (
	"math"
	"math/rand/v2"
	"os"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

const hepmcFile = "../../testdata/gen/two_events.hepmc"

// TestHepMCFile reads the hand-written file (testdata/gen/README.md) and
// checks each primary against the values written in it, converted by hand:
// GeV -> MeV, mm -> cm, c t (mm) -> ns; MeV and cm used as they are.
func TestHepMCFile(t *testing.T) {
	h, err := OpenHepMC(hepmcFile, HepMCOptions{})
	if err != nil {
		t.Fatal(err)
	}
	defer h.Close()
	if h.Len() != 2 || !strings.Contains(h.String(), "(2 events)") {
		t.Fatalf("Len %d, String %q", h.Len(), h.String())
	}
	ekin := func(p r3.Vector, m float64) float64 { return math.Sqrt(p.Norm2()+m*m) - m }
	vtx := r3.Vector{X: 10, Y: -20, Z: 30}
	t0 := 1.5 / phys.SpeedOfLight
	vtx2 := r3.Vector{X: 10.05, Y: -20, Z: 30}
	t2 := 1.55 / phys.SpeedOfLight
	want := [][]struct {
		pdg  int
		p    r3.Vector // MeV/c
		m    float64
		pos  r3.Vector
		time float64
	}{
		{
			{phys.MuonMinus, r3.Vector{X: 100, Y: 200, Z: 500}, phys.MuonMass, vtx, t0},
			{phys.Gamma, r3.Vector{X: -30, Y: 40, Z: 120}, 0, vtx2, t2},
			{phys.Gamma, r3.Vector{X: -10, Y: -30, Z: 60}, 0, vtx2, t2},
		},
		{{phys.Positron, r3.Vector{Z: 20}, phys.ElectronMass, r3.Vector{X: 1, Y: 2, Z: 3}, 0}},
	}
	// Event 7 has a beam nu_mu of 1 GeV along z and an oxygen target
	// (status 4, the pre-NuHepMC-0.9 way), one weight and no process ID;
	// event 8 no incoming neutrino and no weight.
	wantInfo := []Info{
		{SourceEvent: 7, Skipped: 1, Neutrino: phys.MuonNeu, NeutrinoEtot: 1000, NeutrinoDir: r3.Vector{Z: 1},
			Target: Oxygen16Code, Weight: 1, HasWeight: true},
		{SourceEvent: 8, Skipped: 2, SkippedNeutrinos: 1},
	}
	for i := range want {
		ps, info, err := h.Generate(uint64(i), nil, nil)
		if err != nil {
			t.Fatal(err)
		}
		got := info
		got.Q2, got.FinalNucleon = 0, phys.Particle{}
		if got != wantInfo[i] {
			t.Errorf("event %d: info %+v, want %+v", i, got, wantInfo[i])
		}
		if i == 0 {
			// Q2 = -(k - k_mu)^2 with k = (0, 0, 1000; 1000) MeV and the
			// muon's listed momentum and energy; the proton is the nucleon.
			kmu, emu := r3.Vector{X: 100, Y: 200, Z: 500}, 557.82048394918149
			q2 := r3.Vector{Z: 1000}.Sub(kmu).Norm2() - (1000-emu)*(1000-emu)
			if math.Abs(info.Q2-q2) > 1e-9*q2 || info.FinalNucleon.PDG != phys.ProtonCode ||
				math.Abs(info.FinalNucleon.Ekin-ekin(r3.Vector{X: -50, Z: 200}, phys.ProtonMass)) > 1e-9 {
				t.Errorf("event 7: Q2 %v (want %v), nucleon %+v", info.Q2, q2, info.FinalNucleon)
			}
		}
		if len(ps) != len(want[i]) {
			t.Fatalf("event %d: %d primaries %v, want %d", i, len(ps), ps, len(want[i]))
		}
		for j, w := range want[i] {
			p := ps[j]
			if p.PDG != w.pdg || math.Abs(p.Ekin-ekin(w.p, w.m)) > 1e-9*p.Ekin ||
				p.Dir.Sub(w.p.Normalize()).Norm() > 1e-12 || p.Pos.Sub(w.pos).Norm() > 1e-12 ||
				math.Abs(p.Time-w.time) > 1e-12 {
				t.Errorf("event %d primary %d: %+v, want %+v", i, j, p, w)
			}
		}
	}
	if _, _, err := h.Generate(2, nil, nil); err == nil || !strings.Contains(err.Error(), "event 2 requested, the file has 2") {
		t.Errorf("out of range: %v", err)
	}
}

// TestHepMCVertexOverride: the signal vertex moves to the drawn point and
// time, the displaced pi0 vertex keeps its 0.05 cm offset.
func TestHepMCVertexOverride(t *testing.T) {
	b, err := os.ReadFile(hepmcFile)
	if err != nil {
		t.Fatal(err)
	}
	target := r3.Vector{X: -100, Y: 50, Z: 7}
	h, err := ReadHepMC(strings.NewReader(string(b)), "mem", HepMCOptions{Vertex: AtPoint(target), Time: 3})
	if err != nil {
		t.Fatal(err)
	}
	ps, _, err := h.Generate(0, rand.New(rand.NewPCG(1, 1)), nil)
	if err != nil {
		t.Fatal(err)
	}
	if ps[0].Pos != target || ps[0].Time != 3 ||
		ps[1].Pos.Sub(target.Add(r3.Vector{X: 0.05})).Norm() > 1e-12 || math.Abs(ps[1].Time-3-0.05/phys.SpeedOfLight) > 1e-12 {
		t.Errorf("override: %+v", ps)
	}
	if _, err := NewHepMC(strings.NewReader(string(b)), int64(len(b)), "x", HepMCOptions{Vertex: AtPoint(r3.Vector{X: math.NaN()})}); err == nil {
		t.Error("NaN override vertex accepted")
	}
}

// TestHepMCMalformed: bad files give errors naming the file (and event),
// never panics.
func TestHepMCMalformed(t *testing.T) {
	good, err := os.ReadFile(hepmcFile)
	if err != nil {
		t.Fatal(err)
	}
	g := string(good)
	scanErrs := map[string]string{
		"empty":          "",
		"no listing":     "E 1 -1 0 0 0 0 0 0 0 0 0 0\n",
		"truncated":      strings.Replace(g, "HepMC::IO_GenEvent-END_EVENT_LISTING", "", 1),
		"junk before E":  strings.Replace(g, "START_EVENT_LISTING\n", "START_EVENT_LISTING\nX 1 2\n", 1),
		"pdt listing":    "HepMC::IO_Ascii-PARTICLE_DATA-START_EVENT_LISTING\nHepMC::IO_Ascii-PARTICLE_DATA-END_EVENT_LISTING\n",
		"long line":      "HepMC::IO_GenEvent-START_EVENT_LISTING\nE " + strings.Repeat("1 ", maxHepMCLine/2) + "\nHepMC::IO_GenEvent-END_EVENT_LISTING\n",
		"no events":      "HepMC::IO_GenEvent-START_EVENT_LISTING\nHepMC::IO_GenEvent-END_EVENT_LISTING\n",
		"double listing": strings.Replace(g, "U GEV MM", "HepMC::IO_GenEvent-START_EVENT_LISTING", 1),
	}
	for name, text := range scanErrs {
		_, err := ReadHepMC(strings.NewReader(text), name+".hepmc", HepMCOptions{})
		t.Logf("%s: %v", name, err)
		if err == nil || !strings.Contains(err.Error(), name+".hepmc") {
			t.Errorf("%s: error %v", name, err)
		}
	}
	decodeErrs := map[string]string{
		"bad number":      strings.Replace(g, "P 3 13 1.0000000000000000e-01", "P 3 13 x", 1),
		"missing fields":  strings.Replace(g, "P 6 22 -3.0000000000000000e-02 4.0000000000000000e-02", "P 6 22", 1),
		"short E line":    strings.Replace(g, "E 7 -1 -1.0000000000000000e+00", "E 7", 1),
		"too few vertex":  strings.Replace(g, "0 -1 2 1 2 0 1 1.0", "0 -1 3 1 2 0 1 1.0", 1),
		"too many vertex": strings.Replace(g, "0 -1 2 1 2 0 1 1.0", "0 -1 1 1 2 0 1 1.0", 1),
		"bad unit":        strings.Replace(g, "U GEV MM", "U GEV FURLONG", 1),
		"nan momentum":    strings.Replace(g, "P 3 13 1.0000000000000000e-01", "P 3 13 nan", 1),
		"bad signal vtx":  strings.Replace(g, "0 -1 2 1 2 0 1 1.0", "0 -9 2 1 2 0 1 1.0", 1),
	}
	for name, text := range decodeErrs {
		h, err := ReadHepMC(strings.NewReader(text), name+".hepmc", HepMCOptions{})
		if err != nil {
			t.Errorf("%s: scan error %v", name, err)
			continue
		}
		_, _, err = h.Generate(0, nil, nil)
		t.Logf("%s: %v", name, err)
		if err == nil || !strings.Contains(err.Error(), name+".hepmc line ") || !strings.Contains(err.Error(), "(event 0, number 7 in the file)") {
			t.Errorf("%s: error %v", name, err)
		}
		if _, _, err := h.Generate(1, nil, nil); err != nil { // the other event is fine
			t.Errorf("%s: event 1: %v", name, err)
		}
	}
}
