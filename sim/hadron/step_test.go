package hadron

import (
	"testing"

	"github.com/conelight/conelight/sim/heavy"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
)

// orderSink fails the test on a step that ends before it starts.
type orderSink struct {
	phystest.CountSink
	t   *testing.T
	bad int
}

func (o *orderSink) Segment(s phys.Segment) {
	o.CountSink.Segment(s)
	if s.T1 < s.T0 || s.End.Sub(s.Start).Norm2() < 0 {
		o.bad++
	}
}

// TestNoNegativeSteps tracks many pions through their decays and
// interactions: the step limits use the rates at a step's start while
// the accumulated proper time and depth add the step's mean rate, so an
// accumulator could pass its target by a hair and the next step come
// out of negative length (a segment ending before it starts, about 1 in
// 1000 pion events). No step may.
func TestNoNegativeSteps(t *testing.T) {
	p := newPhysics(t, heavy.Config{})
	rng := phystest.NewRNG(3, 4)
	sink := &orderSink{t: t}
	const n = 20000
	for i := range n {
		ekin := 50 + float64(i%8)*50
		if _, err := p.TrackPion(along(phys.PionPlusCode, ekin), ball{R: 1e4}, rng, sink); err != nil {
			t.Fatal(err)
		}
	}
	if sink.bad > 0 {
		t.Errorf("%d of %d segments of %d pions end before they start", sink.bad, sink.Segments, n)
	}
}
