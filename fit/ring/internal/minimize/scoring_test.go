package minimize

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/optimize"
)

// poisson is a Poisson regression: counts n_i with means
// exp(c_i . (x + off)), term i = mu_i - n_i log mu_i. Variable 2 scales
// every mean alike, which FastScore uses when fast is set.
type poisson struct {
	c     [][3]float64
	n     []float64
	off   [3]float64
	fast  bool
	lastX [3]float64
	pen   float64 // wall: pen * x0^2 beyond x0 > 2
}

func (p *poisson) mu(i int, x []float64) float64 {
	var s float64
	for k := range 3 {
		s += p.c[i][k] * (x[k] + p.off[k])
	}
	return math.Exp(s)
}

func (p *poisson) Eval(x, terms []float64) float64 {
	copy(p.lastX[:], x)
	sum := p.Penalty(x)
	for i := range p.n {
		m := p.mu(i, x)
		v := m - p.n[i]*math.Log(m)
		sum += v
		if terms != nil {
			terms[i] = v
		}
	}
	return sum
}

func (p *poisson) Penalty(x []float64) float64 {
	if d := x[0] + p.off[0] - 2; d > 0 {
		return p.pen * d * d
	}
	return 0
}

func (p *poisson) FastScore(j int, h float64, scores []float64) (float64, bool) {
	if !p.fast || j != 2 {
		return 0, false
	}
	// c_i[2] = 1 for every term: a step h multiplies every mean by e^h.
	var g float64
	for i := range p.n {
		m := p.mu(i, p.lastX[:])
		scores[i] = (m*math.Expm1(h) - p.n[i]*h) / h
		g += scores[i]
	}
	return g, true
}

func (p *poisson) Reanchor(x []float64) bool {
	if math.Abs(x[1]) < 0.1 {
		return false
	}
	for k := range 3 {
		p.off[k] += x[k]
	}
	return true
}

func newPoisson(rng *rand.Rand, n int) *poisson {
	p := &poisson{pen: 1e3}
	truth := [3]float64{0.5, -0.3, 2}
	for range n {
		c := [3]float64{rng.Float64()*2 - 1, rng.Float64()*2 - 1, 1}
		var s float64
		for k := range 3 {
			s += c[k] * truth[k]
		}
		p.c = append(p.c, c)
		p.n = append(p.n, float64(poissonDraw(rng, math.Exp(s))))
	}
	return p
}

func poissonDraw(rng *rand.Rand, mu float64) int {
	l, k, q := math.Exp(-mu), 0, 1.0
	for {
		q *= rng.Float64()
		if q < l {
			return k
		}
		k++
	}
}

var tight = Settings{ScoreStep: 1e-6, DecrementTol: 1e-10, FloorGain: 1e-12, MaxDamping: 1e4,
	MaxIterations: 200, MaxEvaluations: 10000, MaxStep: 30}

// TestScoringPoisson compares the minimum of a Poisson regression with
// the one gonum's BFGS finds from the same start, with and without the
// fast score of one variable and with re-anchoring of the variables.
func TestScoringPoisson(t *testing.T) {
	for _, fast := range []bool{false, true} {
		p := newPoisson(rand.New(rand.NewPCG(3, 4)), 400)
		var sc Scratch
		r := Scoring(p, 3, len(p.n), tight, &sc)
		if !r.OK {
			t.Fatalf("fast %v: not converged: %s", fast, r.Reason)
		}
		got := [3]float64{}
		for k := range 3 {
			got[k] = r.X[k] + p.off[k]
		}
		q := newPoisson(rand.New(rand.NewPCG(3, 4)), 400)
		ref, err := optimize.Minimize(optimize.Problem{
			Func: func(x []float64) float64 { return q.Eval(x, nil) },
			Grad: func(g, x []float64) {
				for k := range g {
					g[k] = 0
				}
				for i := range q.n {
					m := q.mu(i, x)
					for k := range 3 {
						g[k] += (m - q.n[i]) * q.c[i][k]
					}
				}
			},
		}, []float64{0, 0, 0}, &optimize.Settings{GradientThreshold: 1e-6}, &optimize.BFGS{})
		if err != nil {
			t.Fatal(err)
		}
		for k := range 3 {
			if math.Abs(got[k]-ref.X[k]) > 1e-5 {
				t.Errorf("fast %v: x[%d] = %v, BFGS %v", fast, k, got[k], ref.X[k])
			}
		}
		if math.Abs(r.F-ref.F) > 1e-8*math.Abs(ref.F) {
			t.Errorf("fast %v: minimum %v, BFGS %v", fast, r.F, ref.F)
		}
	}
}

// TestScoringLimits: the evaluation and iteration limits stop the
// search with a reason, and a non-finite start is refused.
func TestScoringLimits(t *testing.T) {
	p := newPoisson(rand.New(rand.NewPCG(5, 6)), 100)
	s := tight
	s.MaxEvaluations = 3
	var sc Scratch
	if r := Scoring(p, 3, len(p.n), s, &sc); r.OK || r.Reason != "evaluation limit 3 reached" {
		t.Errorf("evaluation limit: ok %v reason %q", r.OK, r.Reason)
	}
	s = tight
	s.MaxIterations = 1
	p = newPoisson(rand.New(rand.NewPCG(5, 6)), 100)
	if r := Scoring(p, 3, len(p.n), s, &sc); r.OK || r.Reason != "iteration limit 1 reached" {
		t.Errorf("iteration limit: ok %v reason %q", r.OK, r.Reason)
	}
	p = newPoisson(rand.New(rand.NewPCG(5, 6)), 100)
	p.off[0] = math.NaN()
	if r := Scoring(p, 3, len(p.n), tight, &sc); r.OK {
		t.Error("NaN objective accepted")
	}
}
