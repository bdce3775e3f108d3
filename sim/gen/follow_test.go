package gen

import (
	"math"
	"os"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
	"github.com/conelight/conelight/sim/transport"
)

// TestFollowedMatchesTransport: Followed says yes exactly for the codes
// the transport follows, for every code the library knows: the transport
// marks the others Skipped with fate NotFollowed. A new transport code
// without a matching line in Followed (or the reverse) fails here.
func TestFollowedMatchesTransport(t *testing.T) {
	p, err := transport.New(material.Water(), em.DefaultConfig(), muon.DefaultConfig())
	if err != nil {
		t.Fatal(err)
	}
	tr, err := transport.NewTracker(p)
	if err != nil {
		t.Fatal(err)
	}
	rng := phystest.NewRNG(3, 4)
	for _, pdg := range phys.KnownPDG() {
		prim := phys.Particle{PDG: pdg, Ekin: 50, Dir: r3.Vector{Z: 1}}
		res, err := tr.Run([]phys.Particle{prim}, phystest.Ball{R: 100}, rng, &phystest.CountSink{})
		if err != nil {
			t.Fatalf("PDG %d: %v", pdg, err)
		}
		followed := !res[0].Skipped && res[0].Fate != phys.NotFollowed
		if followed != Followed(pdg) {
			t.Errorf("PDG %d: transport follows it %v, Followed says %v", pdg, followed, Followed(pdg))
		}
	}
}

// TestGunHadrons: the gun passes on every particle the transport follows,
// with its own energy and direction.
func TestGunHadrons(t *testing.T) {
	codes := []int{phys.PionPlusCode, phys.PionMinusCode, phys.NeutralPionCode, phys.ProtonCode, phys.NeutronCode}
	var parts []GunParticle
	for i, pdg := range codes {
		parts = append(parts, GunParticle{PDG: pdg, Ekin: FixedEnergy(float64(100 * (i + 1))), Direction: Along(r3.Vector{X: 1})})
	}
	g, err := NewGun(GunConfig{Particles: parts, Vertex: AtPoint(r3.Vector{Z: 5})})
	if err != nil {
		t.Fatal(err)
	}
	ps, _, err := g.Generate(0, phystest.NewRNG(1, 2), nil)
	if err != nil || len(ps) != len(codes) {
		t.Fatalf("%v %v", ps, err)
	}
	for i, p := range ps {
		if p.PDG != codes[i] || p.Ekin != float64(100*(i+1)) || p.Dir != (r3.Vector{X: 1}) || p.Pos != (r3.Vector{Z: 5}) {
			t.Errorf("primary %d: %+v", i, p)
		}
	}
	if s := g.String(); !strings.Contains(s, "pi+") || !strings.Contains(s, "pi0") || !strings.Contains(s, " n ") {
		t.Errorf("String() = %q", s)
	}
}

// TestHepMCUnfollowed: a final-state kaon (which no code follows) is an
// error naming its line by default; with CountUnfollowed it is listed in
// Info.NotFollowed with the file's energy, and the event's other
// particles are still primaries. A nucleus fast enough to shine is an
// error too, a slow one is not.
func TestHepMCUnfollowed(t *testing.T) {
	b, err := os.ReadFile(hepmcFile)
	if err != nil {
		t.Fatal(err)
	}
	// Event 8 (MeV, cm): the nu_e of 5 MeV becomes a K+ with E = 500 MeV.
	kaon := strings.Replace(string(b),
		"P 2 12 0.0000000000000000e+00 5.0000000000000000e+00 0.0000000000000000e+00 5.0000000000000000e+00 0.0000000000000000e+00",
		"P 2 321 0.0000000000000000e+00 5.0000000000000000e+00 0.0000000000000000e+00 5.0000000000000000e+02 4.9367700000000000e+02", 1)
	if kaon == string(b) {
		t.Fatal("test file changed: the kaon line was not put in")
	}
	h, err := ReadHepMC(strings.NewReader(kaon), "kaon", HepMCOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := h.Generate(1, nil, nil); err == nil || !strings.Contains(err.Error(), "line 19") || !strings.Contains(err.Error(), "PDG code 321") {
		t.Errorf("kaon by default: %v, want an error naming line 19 and the code", err)
	}
	h, err = ReadHepMC(strings.NewReader(kaon), "kaon", HepMCOptions{CountUnfollowed: true})
	if err != nil {
		t.Fatal(err)
	}
	ps, info, err := h.Generate(1, nil, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(ps) != 2 || ps[0].PDG != phys.Positron || ps[1].PDG != phys.NeutronCode {
		t.Errorf("primaries %+v, want e+ and n", ps)
	}
	if info.Skipped != 1 || info.SkippedNeutrinos != 0 || len(info.NotFollowed) != 1 {
		t.Fatalf("info %+v, want the kaon alone not followed", info)
	}
	if k := info.NotFollowed[0]; k.PDG != 321 || math.Abs(k.Ekin-(500-493.677)) > 1e-9 || k.Dir != (r3.Vector{Y: 1}) || k.Pos != (r3.Vector{X: 1, Y: 2, Z: 3}) {
		t.Errorf("kaon %+v", k)
	}

	// Event 7 (GeV, mm): the residual 16O as a final-state particle, slow
	// (beta 0.07) or fast (beta 0.9, above any water's threshold).
	slow := strings.Replace(string(b), "1.4895080000000000e+01 4 0 0 -1 0", "1.4895080000000000e+01 1 0 0 -1 0", 1)
	slow = strings.Replace(slow, "P 2 1000080160 0.0000000000000000e+00", "P 2 1000080160 1.0000000000000000e+00", 1)
	fast := strings.Replace(slow, "P 2 1000080160 1.0000000000000000e+00 0.0000000000000000e+00 0.0000000000000000e+00 1.4895080000000000e+01",
		"P 2 1000080160 3.0000000000000000e+01 0.0000000000000000e+00 0.0000000000000000e+00 3.3333333333333336e+01", 1)
	if slow == string(b) || fast == slow {
		t.Fatal("test file changed: the nucleus lines were not put in")
	}
	for _, c := range []struct {
		name, file string
		ok         bool
	}{{"slow nucleus", slow, true}, {"fast nucleus", fast, false}} {
		h, err := ReadHepMC(strings.NewReader(c.file), c.name, HepMCOptions{})
		if err != nil {
			t.Fatal(err)
		}
		_, info, err := h.Generate(0, nil, nil)
		if c.ok && (err != nil || len(info.NotFollowed) != 1 || info.NotFollowed[0].PDG != Oxygen16Code) {
			t.Errorf("%s: %v, not followed %+v", c.name, err, info.NotFollowed)
		}
		if !c.ok && (err == nil || !strings.Contains(err.Error(), "PDG code 1000080160")) {
			t.Errorf("%s: %v, want an error naming the nucleus", c.name, err)
		}
	}
}
