package resolution

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"
)

// The quantile of 0..99 by the n p - 1/2 rank rule, and its stated error
// against the spread of repeated estimates from an exponential sample
// (the binomial order-statistics interval should give the true standard
// error; 400 repetitions estimate a standard deviation to 1/sqrt(800)
// = 3.5% relative, allow 4 of those plus 5% for the discreteness of the
// rank interval).
func TestQuantile(t *testing.T) {
	x := make([]float64, 100)
	for i := range x {
		x[i] = float64(99 - i)
	}
	q, err := Quantile(x, 0.68)
	if err != nil {
		t.Fatal(err)
	}
	if q.Value != 67.5 {
		t.Errorf("68%% quantile of 0..99 = %v, want 67.5", q.Value)
	}
	if x[0] != 99 {
		t.Error("Quantile sorted its input")
	}
	rng := rand.New(rand.NewPCG(1, 2))
	const reps, n = 400, 500
	var vals, errs []float64
	for range reps {
		s := make([]float64, n)
		for i := range s {
			s[i] = rng.ExpFloat64()
		}
		q, _ := Quantile(s, 0.68)
		vals = append(vals, q.Value)
		errs = append(errs, q.Err)
	}
	m, _ := Mean(vals)
	sd := m.Err * math.Sqrt(reps)
	me, _ := Mean(errs)
	// Exponential 68% quantile: -ln(0.32) = 1.1394 (closed form).
	if math.Abs(m.Value+math.Log(0.32)) > 4*m.Err {
		t.Errorf("mean quantile %v, want %v", m, -math.Log(0.32))
	}
	if rel := me.Value/sd - 1; math.Abs(rel) > 4/math.Sqrt(2*reps)+0.05 {
		t.Errorf("stated error %v, observed spread %v", me.Value, sd)
	}
	for _, bad := range [][]float64{{1}, {1, math.NaN()}} {
		if _, err := Quantile(bad, 0.5); err == nil {
			t.Errorf("Quantile(%v) accepted", bad)
		}
	}
	if _, err := Quantile(x, 1); err == nil {
		t.Error("p = 1 accepted")
	}
}

// The core fit of a normal sample with 10% wide outliers recovers the
// normal's mean and width within 4 stated errors, and the stated width
// error matches normal theory.
func TestGaussianCore(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	x := make([]float64, 0, 4000)
	for range 3600 {
		x = append(x, 2+0.5*rng.NormFloat64())
	}
	for range 400 {
		x = append(x, 2+10*rng.NormFloat64())
	}
	g, err := GaussianCore(x, 2)
	if err != nil {
		t.Fatal(err)
	}
	// The outliers put about 400 * 2 sigma_core / (sqrt(2 pi) 10 sigma)
	// = 0.4 * 0.08 ~ 3% extra values in the core, flat, widening it by
	// about 1%: within the 4-error band (error ~0.6%) plus 2%.
	if math.Abs(g.Mean.Value-2) > 4*g.Mean.Err {
		t.Errorf("mean %v, want 2", g.Mean)
	}
	if math.Abs(g.Sigma.Value-0.5) > 4*g.Sigma.Err+0.01 {
		t.Errorf("sigma %v, want 0.5", g.Sigma)
	}
	if _, err := GaussianCore([]float64{1, 1, 1, 1, 1, 1}, 2); err == nil {
		t.Error("no-spread sample accepted")
	}
	if _, err := GaussianCore(x, 0.5); err == nil {
		t.Error("nSigma 0.5 accepted")
	}
}

// Summarize on constructed samples: a known offset, known angles and a
// known energy spread.
func TestSummarize(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	var fit, truth []Sample
	for i := range 2000 {
		v := r3.Vector{X: float64(i), Y: 0, Z: 0}
		u := r3.Vector{Z: 1}
		// Direction tilted by exactly 10 degrees, vertex moved 5 cm along
		// the true direction, energy with 10% normal spread.
		a := 10 * math.Pi / 180
		fit = append(fit, Sample{Vertex: v.Add(u.Mul(5)), Dir: r3.Vector{X: math.Sin(a), Z: math.Cos(a)}, Energy: 10 * (1 + 0.1*rng.NormFloat64())})
		truth = append(truth, Sample{Vertex: v, Dir: u, Energy: 10})
	}
	s, err := Summarize(fit, truth)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(s.Vertex68.Value-5) > 1e-9 || math.Abs(s.LongitudinalBias.Value-5) > 1e-9 || math.Abs(s.Bias[2].Value-5) > 1e-9 {
		t.Errorf("vertex %v, longitudinal bias %v, z bias %v, want 5", s.Vertex68, s.LongitudinalBias, s.Bias[2])
	}
	if math.Abs(s.Direction68.Value-10) > 1e-6 {
		t.Errorf("direction 68%% %v, want 10", s.Direction68)
	}
	if math.Abs(s.EnergyResolution.Value-0.1) > 4*s.EnergyResolution.Err {
		t.Errorf("energy resolution %v, want 0.1", s.EnergyResolution)
	}
	if _, err := Summarize(fit[:3], truth[:3]); err == nil {
		t.Error("3 samples accepted")
	}
	if _, err := Summarize(fit, truth[:10]); err == nil {
		t.Error("length mismatch accepted")
	}
	truth[7].Energy = 0
	if _, err := Summarize(fit, truth); err == nil {
		t.Error("zero true energy accepted")
	}
}

// A positive, heavy-tailed small sample: the symmetric error of the 68%
// quantile exceeds its value, the interval's lower bound stays positive
// and inside the sample, and both agree with the order statistics.
func TestQuantileInterval(t *testing.T) {
	x := []float64{0.3, 0.5, 0.8, 1.0, 1.2, 1.4, 1.6, 1.7, 2.5, 9, 14, 30}
	q, err := QuantileInterval(x, 0.68)
	if err != nil {
		t.Fatal(err)
	}
	e, _ := Quantile(x, 0.68)
	// n p - 1/2 = 7.66, d = sqrt(n p (1-p)) = 1.616: ranks 7.66 and
	// 7.66 -/+ d (0-based), interpolated by hand.
	d := math.Sqrt(12 * 0.68 * 0.32)
	want := Interval{Value: 1.7 + 0.66*0.8, Lo: 1.6 + (7.66-d-6)*0.1, Hi: 9 + (7.66+d-9)*5}
	if math.Abs(q.Value-want.Value) > 1e-9 || math.Abs(q.Lo-want.Lo) > 1e-9 || math.Abs(q.Hi-want.Hi) > 1e-9 {
		t.Errorf("QuantileInterval = %v, want %v", q, want)
	}
	if e.Value != q.Value || math.Abs(e.Err-(q.Hi-q.Lo)/2) > 1e-12 || !(e.Err > 0.5*e.Value) {
		t.Errorf("Quantile %v does not match the interval %v", e, q)
	}
	if !(q.Lo > 0) || q.String() != "2.228 +8.2/-0.62" {
		t.Errorf("interval %v (%q)", q, q.String())
	}
}
