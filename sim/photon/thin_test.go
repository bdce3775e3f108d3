package photon

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/stat"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

// TestThinnedEquivalence: thinning at emission by
// SpectralEfficiency(lambda)/P and applying only the angular acceptance
// at the cathode gives the same photoelectrons as pre-scaling by P and
// applying Efficiency/P at the cathode: the same counts per part of the
// sensor surface and per origin (Poisson, difference variance n1 + n2),
// and the same distributions of the detected photons' wavelength and
// arrival time (two-sample Kolmogorov-Smirnov), with absorption,
// Rayleigh and Mie scattering and liner reflections all on.
func TestThinnedEquivalence(t *testing.T) {
	det, m := demo(t)
	w := water(t, 1, 1)
	liner := optics.DefaultLiner()
	p := m.MaxEfficiency()
	old := tracer(t, det, m, w, liner, p)
	thinTr, err := NewTracer(det, m, w, Config{Liner: liner, Prescale: p, Thinned: true})
	if err != nil {
		t.Fatal(err)
	}
	lo, hi := m.QE.Range()
	emOld, err := cherenkov.NewEmitter(w, lo, hi, p)
	if err != nil {
		t.Fatal(err)
	}
	emThin, err := cherenkov.NewThinningEmitter(w, lo, hi, p, func(l float64) float64 { return min(m.SpectralEfficiency(l)/p, 1) })
	if err != nil {
		t.Fatal(err)
	}
	seg := phys.Segment{
		Start: r3.Vector{X: -100, Y: 50, Z: -200}, End: r3.Vector{X: 50, Y: 100, Z: 100},
		T1: 11, Beta0: 0.99, Beta1: 0.98, Charge: -1, PDG: phys.MuonMinus,
	}
	type sample struct {
		surface [4]int
		origin  [3]int
		lambda  []float64
		time    []float64
		traced  int
	}
	run := func(em *cherenkov.Emitter, tr *Tracer, seed uint64) (s sample) {
		rng := rand.New(rand.NewPCG(seed, 5))
		var photons []cherenkov.Photon
		for rep := 0; rep < 8; rep++ {
			photons, err = em.Emit(seg, rng, photons[:0])
			if err != nil {
				t.Fatal(err)
			}
			s.traced += len(photons)
			for _, ph := range photons {
				pe, f := tr.Trace(ph, rng)
				if f != Detected {
					continue
				}
				s.surface[det.Sensor(pe.Sensor).Surface]++
				s.origin[pe.Origin]++
				s.lambda = append(s.lambda, ph.Wavelength)
				s.time = append(s.time, pe.Time)
			}
		}
		return s
	}
	a, b := run(emOld, old, 41), run(emThin, thinTr, 42)
	poisson := func(what string, n1, n2 int) {
		if n1+n2 == 0 {
			t.Fatalf("%s: no photoelectrons", what)
		}
		if d := math.Abs(float64(n1 - n2)); d > 5*math.Sqrt(float64(n1+n2)) {
			t.Errorf("%s: %d pe pre-scaled, %d thinned at emission", what, n1, n2)
		}
	}
	for s := geom.Barrel; s <= geom.Bottom; s++ {
		poisson(s.String(), a.surface[s], b.surface[s])
	}
	for o := pmt.Direct; o <= pmt.Reflected; o++ {
		poisson(o.String(), a.origin[o], b.origin[o])
	}
	for _, c := range []struct {
		what string
		x, y []float64
	}{{"wavelength", a.lambda, b.lambda}, {"arrival time", a.time, b.time}} {
		slices.Sort(c.x)
		slices.Sort(c.y)
		d := stat.KolmogorovSmirnov(c.x, nil, c.y, nil)
		if crit := resolution.KSTwoSampleCritical(len(c.x), len(c.y), 1e-4); d > crit {
			t.Errorf("%s: two-sample KS D = %.4g > %.4g", c.what, d, crit)
		}
	}
	t.Logf("pre-scaled: %d traced, %d pe; thinned: %d traced, %d pe (%.3f of the traced photons)",
		a.traced, len(a.lambda), b.traced, len(b.lambda), float64(b.traced)/float64(a.traced))
}
