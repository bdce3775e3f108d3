package muon

import (
	"math"
	"strings"
	"testing"

	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
)

func TestDeterministic(t *testing.T) {
	p := newWater(t, Config{})
	a, _ := p.Track(muonAlongZ(phys.MuonMinus, 500), ball{R: 1e4}, phystest.NewRNG(1, 1), &countSink{})
	b, _ := p.Track(muonAlongZ(phys.MuonMinus, 500), ball{R: 1e4}, phystest.NewRNG(1, 1), &countSink{})
	if a != b {
		t.Errorf("same seed, different truth:\n%+v\n%+v", a, b)
	}
}

func TestBadInput(t *testing.T) {
	// The checks are heavy.Physics.Track's; the messages name the muon.
	p := newWater(t, Config{})
	good := muonAlongZ(phys.MuonMinus, 100)
	for _, c := range []struct {
		part phys.Particle
		want string
	}{
		{func() phys.Particle { q := good; q.PDG = 11; return q }(), "muon: Particle.PDG = 11"},
		{func() phys.Particle { q := good; q.Ekin = math.NaN(); return q }(), "muon: Particle.Ekin = NaN"},
	} {
		_, err := p.Track(c.part, ball{R: 10}, phystest.NewRNG(1, 2), &countSink{})
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("Track(%+v): error %v, want it to mention %q", c.part, err, c.want)
		}
	}
}
