package cherenkov

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"

	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

func testWater(t testing.TB) *optics.Water {
	t.Helper()
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		t.Fatal(err)
	}
	return w
}

func testEmitter(t testing.TB, w *optics.Water, lo, hi, prescale float64) *Emitter {
	t.Helper()
	e, err := NewEmitter(w, lo, hi, prescale)
	if err != nil {
		t.Fatal(err)
	}
	return e
}

// constantIndexEmitter has the same index at every wavelength.
func constantIndexEmitter(t *testing.T, lo, hi, n float64) *Emitter {
	idx := make([]float64, 301)
	for i := range idx {
		idx[i] = n
	}
	e, err := newEmitter(lo, hi, idx, 1)
	if err != nil {
		t.Fatal(err)
	}
	return e
}

func TestFrankTammClosedForm(t *testing.T) {
	// Frank-Tamm with constant n (PDG Review, "Passage of particles
	// through matter", Cherenkov radiation):
	// dN/dx = 2 pi alpha z^2 sin^2(theta) (1/l1 - 1/l2).
	const n, l1, l2 = 1.33, 300.0, 600.0
	e := constantIndexEmitter(t, l1, l2, n)
	k := 2 * math.Pi * phys.FineStructure * (1/l1 - 1/l2) * 1e7
	for _, beta := range []float64{1, 0.95, 0.8} {
		want := k * (1 - 1/(beta*beta*n*n))
		// Linear interpolation in beta errs by at most dBeta^2/8 |Y''|,
		// Y'' = -6 k / (n^2 beta^4).
		tol := e.dBeta*e.dBeta/8*6*k/(n*n*beta*beta*beta*beta) + 1e-12*want
		if got := e.YieldPerCm(beta); math.Abs(got-want) > tol {
			t.Errorf("beta %g: yield %.10g /cm, closed form %.10g (tol %g)", beta, got, want, tol)
		}
	}
	// A few hundred photons per cm for beta = 1 over 300-600 nm (common
	// practice: about 340 /cm in water).
	if y := e.YieldPerCm(1); y < 250 || y > 450 {
		t.Errorf("yield at beta=1: %g /cm", y)
	}
	if e.YieldPerCm(1/n-1e-6) != 0 || e.YieldPerCm(0) != 0 {
		t.Error("yield below threshold is not zero")
	}
}

// bruteYield integrates the Frank-Tamm spectrum with the water's own index
// lookup by Gauss-Legendre quadrature in 1 nm pieces, the piece holding
// the cutoff split there (found by bisection): independent of the
// emitter's tables.
func bruteYield(w *optics.Water, lo, hi, beta float64) float64 {
	f := func(l float64) float64 {
		nb := beta * w.Index(l)
		return math.Max(0, 1-1/(nb*nb)) / (l * l)
	}
	cut := hi
	if beta*w.Index(hi) < 1 {
		a, b := lo, hi
		for range 100 {
			m := (a + b) / 2
			if beta*w.Index(m) >= 1 {
				a = m
			} else {
				b = m
			}
		}
		cut = a
	}
	sum := 0.0
	for a := lo; a < cut; a++ {
		sum += quad.Fixed(f, a, math.Min(a+1, cut), 10, nil, 0)
	}
	return 2 * math.Pi * phys.FineStructure * 1e7 * sum
}

func TestYieldWithDispersion(t *testing.T) {
	w := testWater(t)
	e := testEmitter(t, w, 250, 700, 1)
	// At the table's speeds the yield is the direct integral.
	for _, k := range []int{1, 10, 100, 700, 2048} {
		beta := e.betaLo + float64(k)*e.dBeta
		if k == betaNodes-1 {
			beta = 1
		}
		got, want := e.YieldPerCm(beta), bruteYield(w, 250, 700, beta)
		if math.Abs(got-want) > 1e-7*want+1e-9 {
			t.Errorf("beta %.6f: yield %.9g, quadrature %.9g", beta, got, want)
		}
	}
	// Between table speeds linear interpolation errs by at most
	// dBeta^2/8 |Y''|; Y'' from a second difference of the direct integral.
	for _, beta := range []float64{0.7300123, 0.75, 0.8123, 0.95, 0.99987} {
		h := e.dBeta
		y0, yp, ym := bruteYield(w, 250, 700, beta), bruteYield(w, 250, 700, beta+h), bruteYield(w, 250, 700, beta-h)
		tol := 2*math.Abs(yp-2*y0+ym)/8 + 1e-7*y0
		if d := math.Abs(e.YieldPerCm(beta) - y0); d > tol {
			t.Errorf("beta %g: yield %g vs %g (diff %g > %g)", beta, e.YieldPerCm(beta), y0, d, tol)
		}
	}
}

func TestEmitterAngles(t *testing.T) {
	w := testWater(t)
	e := testEmitter(t, w, 250, 700, 1)
	if math.Abs(e.Threshold()-1/w.MaxIndex()) > 1e-15 {
		t.Errorf("threshold %g, want 1/n_max = %g", e.Threshold(), 1/w.MaxIndex())
	}
	// Maximum Cherenkov angle in water about 41-42 degrees in the
	// visible (common practice): check at 400 nm.
	th, err := e.Angle(400, 1)
	if err != nil {
		t.Fatal(err)
	}
	if deg := th * 180 / math.Pi; deg < 41 || deg > 42 {
		t.Errorf("Cherenkov angle at 400 nm, beta 1: %g deg", deg)
	}
	n589, _ := optics.RefractiveIndex(589, 20)
	if th, _ := e.Angle(589, 0.9); math.Abs(math.Cos(th)-1/(0.9*n589)) > 1e-9 {
		t.Errorf("cos angle at 589 nm, beta 0.9 = %g, want %g", math.Cos(th), 1/(0.9*n589))
	}
	if math.Abs(math.Cos(e.MaxAngle())-1/w.MaxIndex()) > 1e-15 {
		t.Errorf("MaxAngle %g", e.MaxAngle())
	}
	if b, _ := e.ThresholdAt(589); math.Abs(b-1/n589) > 1e-9 {
		t.Errorf("ThresholdAt(589) = %g", b)
	}
	for _, c := range []struct {
		l, b float64
		msg  string
	}{{800, 1, "wavelength 800"}, {400, 1.1, "beta = 1.1"}, {400, math.NaN(), "beta = NaN"}, {400, 0.7, "below the threshold"}} {
		if _, err := e.Angle(c.l, c.b); err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("Angle(%g, %g): %v", c.l, c.b, err)
		}
	}
	if _, err := e.ThresholdAt(100); err == nil {
		t.Error("ThresholdAt(100) gave no error")
	}
	if !math.IsNaN(e.YieldPerCm(1.2)) || !math.IsNaN(e.YieldPerCm(math.NaN())) {
		t.Error("YieldPerCm outside [0, 1] is not NaN")
	}
}

func TestNewEmitterErrors(t *testing.T) {
	w := testWater(t)
	cases := []struct {
		lo, hi, p float64
		msg       string
	}{
		{200, 600, 1, "lo = 200"}, {300, 800, 1, "hi = 800"}, {400, 400, 1, "hi = 400"},
		{math.NaN(), 600, 1, "lo = NaN"}, {300, 600, 0, "prescale = 0"}, {300, 600, 1.5, "prescale = 1.5"},
		{300, 600, math.NaN(), "prescale = NaN"},
	}
	for _, c := range cases {
		if _, err := NewEmitter(w, c.lo, c.hi, c.p); err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("NewEmitter(%g, %g, %g): %v", c.lo, c.hi, c.p, err)
		}
	}
	if _, err := NewEmitter(nil, 300, 600, 1); err == nil {
		t.Error("nil water accepted")
	}
	if _, err := newEmitter(300, 600, []float64{1.33, 1.34}, 1); err == nil {
		t.Error("index rising with wavelength accepted")
	}
}
