package photon

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

// demo returns the demo tank at 30% coverage with the medium sensor class.
func demo(t testing.TB) (*geom.Detector, *pmt.Model) {
	t.Helper()
	det, err := geom.Layout(geom.DemoTank(), pmt.Medium().CathodeDiameter, 0.30)
	if err != nil {
		t.Fatal(err)
	}
	m := pmt.Medium()
	return det, &m
}

func water(t testing.TB, absScale, rayScale float64) *optics.Water {
	t.Helper()
	cfg := optics.DefaultWaterConfig()
	cfg.AbsorptionScale = absScale
	cfg.RayleighScale = rayScale
	w, err := optics.NewWater(cfg)
	if err != nil {
		t.Fatal(err)
	}
	return w
}

func tracer(t testing.TB, det *geom.Detector, m *pmt.Model, w *optics.Water, liner optics.Liner, prescale float64) *Tracer {
	t.Helper()
	tr, err := NewTracer(det, m, w, Config{Liner: liner, Prescale: prescale})
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// binomialCheck fails when k successes of n differ from probability p by
// more than 5 binomial standard deviations.
func binomialCheck(t *testing.T, what string, k, n int, p float64) {
	t.Helper()
	sd := math.Sqrt(float64(n) * p * (1 - p))
	if d := math.Abs(float64(k) - float64(n)*p); d > 5*sd+1 {
		t.Errorf("%s: %d of %d, expected %.1f +- %.1f (5 sigma)", what, k, n, float64(n)*p, sd)
	}
}

// horizontal returns a unit vector in the x-y plane at azimuth phi.
func horizontal(phi float64) r3.Vector {
	s, c := math.Sincos(phi)
	return r3.Vector{X: c, Y: s}
}

func TestFlightAbsorptionOnly(t *testing.T) {
	// Closed form: from the tank centre, a horizontal photon reaches the
	// barrel (distance R) with probability exp(-R/L_abs) when the water
	// only absorbs (Beer-Lambert law).
	det, m := demo(t)
	// Scale the pure-water absorption up so that L_abs is comparable to R.
	const lambda = 400.0
	w := water(t, 20, 0)
	tr := tracer(t, det, m, w, optics.Liner{}, 1)
	R := det.Tank().SensorRadius()
	p := math.Exp(-R / w.AbsorptionLength(lambda))
	rng := rand.New(rand.NewPCG(11, 12))
	const n = 100000
	reached := 0
	for i := 0; i < n; i++ {
		a := tr.flightAt(r3.Vector{}, horizontal(2*math.Pi*rng.Float64()), 0, lambda, rng)
		if !a.absorbed && !a.lost {
			reached++
			if a.surf != geom.Barrel {
				t.Fatalf("horizontal photon reached %v", a.surf)
			}
		}
	}
	binomialCheck(t, "photons reaching the barrel", reached, n, p)
}

func TestFlightScatteringOnly(t *testing.T) {
	// Closed form: with scattering only, the fraction of photons that reach
	// the wall unscattered is exp(-R/L_scat); and with no absorption every
	// photon reaches the wall eventually.
	det, m := demo(t)
	const lambda = 350.0
	w := water(t, 0, 30)
	tr := tracer(t, det, m, w, optics.Liner{}, 1)
	R := det.Tank().SensorRadius()
	p := math.Exp(-R / w.ScatteringLength(lambda))
	rng := rand.New(rand.NewPCG(13, 14))
	const n = 100000
	direct := 0
	for i := 0; i < n; i++ {
		a := tr.flightAt(r3.Vector{}, horizontal(2*math.Pi*rng.Float64()), 0, lambda, rng)
		if a.absorbed || a.lost {
			t.Fatalf("photon absorbed or lost in water with no absorption: %+v", a)
		}
		if a.scatters == 0 {
			direct++
		}
	}
	binomialCheck(t, "unscattered photons", direct, n, p)
}

func TestDirectArrivalTime(t *testing.T) {
	// Closed form: direct light arrives after path x n_g / c (group
	// velocity; DESIGN section 3).
	det, m := demo(t)
	w := water(t, 0, 0)
	tr := tracer(t, det, m, w, optics.Liner{}, 1)
	rng := rand.New(rand.NewPCG(15, 16))
	for _, lambda := range []float64{300, 400, 550} {
		for i := 0; i < 100; i++ {
			u := r3.Vector{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()}.Normalize()
			start := r3.Vector{X: 100, Y: -50, Z: 200}
			a := tr.flightAt(start, u, 3, lambda, rng)
			path := a.pos.Sub(start).Norm()
			want := 3 + path*w.GroupIndex(lambda)/phys.SpeedOfLight
			if math.Abs(a.time-want) > 1e-6*want {
				t.Fatalf("lambda %g: arrival %g ns, want %g", lambda, a.time, want)
			}
			if math.Abs(path-det.DistanceAlong(start, u)) > 1e-6 {
				t.Fatalf("path %g, distance to wall %g", path, det.DistanceAlong(start, u))
			}
		}
	}
}

func TestDetectionProbability(t *testing.T) {
	// Photons aimed at a sensor centre from the tank centre are detected
	// with probability Efficiency(lambda, cos) when every photon is traced
	// (prescale 1) and Efficiency/P when the emitter pre-scaled by P.
	det, m := demo(t)
	w := water(t, 0, 0)
	const lambda = 390.0
	var target geom.Sensor
	for _, s := range det.Sensors() {
		if s.Surface == geom.Barrel {
			target = s
			break
		}
	}
	u := target.Pos.Normalize()
	eff := m.Efficiency(lambda, -u.Dot(target.Dir))
	for _, prescale := range []float64{1, m.MaxEfficiency()} {
		tr := tracer(t, det, m, w, optics.Liner{}, prescale)
		rng := rand.New(rand.NewPCG(17, 18))
		const n = 50000
		k := 0
		for i := 0; i < n; i++ {
			pe, f := tr.Trace(cherenkov.Photon{Dir: u, Wavelength: lambda}, rng)
			if f == Detected {
				if pe.Sensor != target.Index || pe.Origin != pmt.Direct {
					t.Fatalf("detected on sensor %d origin %v, want %d direct", pe.Sensor, pe.Origin, target.Index)
				}
				k++
			}
		}
		binomialCheck(t, "detected photons", k, n, eff/prescale)
	}
}

func TestPrescaleEquivalence(t *testing.T) {
	// Statistical expectation: pre-scaling at emission by P and keeping
	// Efficiency/P at the sensor gives the same mean photoelectron counts
	// per part of the sensor surface as tracing every photon. Counts are
	// Poisson, so their difference has variance n1 + n2.
	det, m := demo(t)
	w := water(t, 1, 1)
	liner := optics.DefaultLiner()
	full := tracer(t, det, m, w, liner, 1)
	pre := tracer(t, det, m, w, liner, m.MaxEfficiency())
	lo, hi := w.Band()
	emFull, err := cherenkov.NewEmitter(w, lo, hi, 1)
	if err != nil {
		t.Fatal(err)
	}
	emPre, err := cherenkov.NewEmitter(w, lo, hi, m.MaxEfficiency())
	if err != nil {
		t.Fatal(err)
	}
	seg := phys.Segment{
		Start: r3.Vector{X: -100, Y: 50, Z: -200}, End: r3.Vector{X: 50, Y: 100, Z: 100},
		T1: 11, Beta0: 0.99, Beta1: 0.98, Charge: -1, PDG: phys.MuonMinus,
	}
	count := func(em *cherenkov.Emitter, tr *Tracer, seed uint64) (n [4]int) {
		rng := rand.New(rand.NewPCG(seed, 1))
		var photons []cherenkov.Photon
		var pes []pmt.Photoelectron
		for rep := 0; rep < 5; rep++ {
			photons, err = em.Emit(seg, rng, photons[:0])
			if err != nil {
				t.Fatal(err)
			}
			pes = tr.TraceAll(photons, rng, pes[:0], nil)
			for _, pe := range pes {
				n[det.Sensor(pe.Sensor).Surface]++
			}
		}
		return n
	}
	a, b := count(emFull, full, 19), count(emPre, pre, 20)
	for s := geom.Barrel; s <= geom.Bottom; s++ {
		if a[s]+b[s] == 0 {
			t.Fatalf("%v: no photoelectrons", s)
		}
		if d := math.Abs(float64(a[s] - b[s])); d > 5*math.Sqrt(float64(a[s]+b[s])) {
			t.Errorf("%v: full tracing %d pe, pre-scaled %d pe", s, a[s], b[s])
		}
	}
}

func TestLinerReflection(t *testing.T) {
	// Horizontal photons from the centre that miss every photocathode meet
	// the liner; with no water attenuation a fraction equal to the liner's
	// reflectivity must be reflected (it is a Bernoulli trial per contact),
	// so the tally of liner absorptions is (1 - r) of the first contacts.
	det, m := demo(t)
	w := water(t, 0, 0)
	const r = 0.3
	tr := tracer(t, det, m, w, optics.Liner{Reflectivity: r, DiffuseFraction: 1}, 1)
	rng := rand.New(rand.NewPCG(21, 22))
	const n = 50000
	missed, reflected := 0, 0
	for i := 0; i < n; i++ {
		u := horizontal(2 * math.Pi * rng.Float64())
		a := tr.flightAt(r3.Vector{}, u, 0, 400, rng)
		if det.SensorAt(a.pos, a.surf) >= 0 {
			continue
		}
		missed++
		if _, ok := tr.liner.Reflect(a.dir, tr.inwardNormal(a.pos, a.surf), rng); ok {
			reflected++
		}
	}
	binomialCheck(t, "liner reflections", reflected, missed, r)
	// The inward normal must point into the water at every part.
	for _, q := range []struct {
		p r3.Vector
		s geom.Surface
	}{{r3.Vector{X: 500}, geom.Barrel}, {r3.Vector{Z: 520}, geom.Top}, {r3.Vector{Z: -520}, geom.Bottom}} {
		if nrm := tr.inwardNormal(q.p, q.s); nrm.Dot(q.p) >= 0 {
			t.Errorf("normal at %v on %v points out: %v", q.p, q.s, nrm)
		}
	}
}

func TestNewTracerErrors(t *testing.T) {
	det, m := demo(t)
	w := water(t, 1, 1)
	cases := []struct {
		cfg  Config
		want string
	}{
		{Config{Prescale: 0}, "Prescale = 0"},
		{Config{Prescale: math.NaN()}, "Prescale = NaN"},
		{Config{Prescale: 0.01}, "below the sensor's maximum efficiency"},
		{Config{Prescale: 1, Liner: optics.Liner{Reflectivity: 2}}, "Reflectivity = 2"},
		{Config{Prescale: 1, MaxInteractions: -1}, "MaxInteractions = -1"},
	}
	for _, c := range cases {
		_, err := NewTracer(det, m, w, c.cfg)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("NewTracer(%+v) error %v, want it to mention %q", c.cfg, err, c.want)
		}
	}
	if _, err := NewTracer(nil, m, w, Config{Prescale: 1}); err == nil {
		t.Error("nil detector accepted")
	}
	// A photon outside the band or outside the tank is Lost, not a panic.
	tr := tracer(t, det, m, w, optics.Liner{}, 1)
	rng := rand.New(rand.NewPCG(1, 1))
	for _, ph := range []cherenkov.Photon{
		{Dir: r3.Vector{X: 1}, Wavelength: 100},
		{Dir: r3.Vector{X: 1}, Wavelength: math.NaN()},
		{Pos: r3.Vector{X: 1e5}, Dir: r3.Vector{X: 1}, Wavelength: 400},
		{Pos: r3.Vector{X: math.NaN()}, Dir: r3.Vector{X: 1}, Wavelength: 400},
	} {
		if _, f := tr.Trace(ph, rng); f != Lost {
			t.Errorf("photon %+v: fate %v, want lost", ph, f)
		}
	}
}

// flightAt is flight for a photon of wavelength lambda (nm).
func (t *Tracer) flightAt(pos, dir r3.Vector, time, lambda float64, rng *rand.Rand) wallArrival {
	fl := t.flightConstants(lambda)
	return t.flight(pos, dir, time, &fl, rng)
}
