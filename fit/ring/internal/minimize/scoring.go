package minimize

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// Problem is an objective of Dim variables: the sum of NumTerms
// independent terms plus a penalty.
type Problem interface {
	// Eval returns the objective at x, penalty included, and writes each
	// term into terms when it is not nil. A Problem may keep state of the
	// last evaluation (FastScore reads it).
	Eval(x, terms []float64) float64
	// Penalty returns the penalty part of the objective at x, which no
	// term carries.
	Penalty(x []float64) float64
	// FastScore may compute the forward-difference scores of variable j
	// with step h at x from the state of the last Eval, which was at x,
	// without a full evaluation: it then writes (term(x + h e_j) -
	// term(x)) / h into scores, returns their sum and true. It returns
	// false for a variable it cannot do so for.
	FastScore(j int, h float64, scores []float64) (g float64, ok bool)
	// Reanchor may move the origin of the variables to x (when they
	// degenerate far from it); it returns true when it did, and the
	// minimizer continues from the new origin.
	Reanchor(x []float64) bool
}

// Settings are the minimizer's tolerances, in the problem's variables
// (scaled to about one standard deviation) and objective units (negative
// log likelihood).
type Settings struct {
	// ScoreStep is the forward-difference step of the scores.
	ScoreStep float64
	// DecrementTol stops the search when the expected gain of a full
	// step is below it.
	DecrementTol float64
	// FloorGain stops it after two accepted steps in a row that each
	// gained less than it.
	FloorGain float64
	// MaxDamping gives up on a point where no step damped by up to this
	// factor descends.
	MaxDamping float64
	// MaxIterations bounds the accepted steps, MaxEvaluations the
	// evaluations of the objective.
	MaxIterations, MaxEvaluations int
	// MaxStep caps the length of a step.
	MaxStep float64
}

// Scratch is the per-term memory of the minimizer: the terms at the
// current point, at a trial point and at the forward step of each
// variable. Keep one per goroutine and reuse it.
type Scratch struct {
	center, trial []float64
	step          [][]float64
}

func (s *Scratch) ensure(dim, terms int) {
	if len(s.center) == terms && len(s.step) == dim {
		return
	}
	s.center, s.trial = make([]float64, terms), make([]float64, terms)
	s.step = make([][]float64, dim)
	for j := range s.step {
		s.step[j] = make([]float64, terms)
	}
}

// Result is where a search ended.
type Result struct {
	// X is the point reached, in the problem's variables after its last
	// re-anchoring, and F the objective there.
	X []float64
	F float64
	// OK is true when X is a minimum; Reason says why not otherwise.
	OK     bool
	Reason string
	// Evaluations counts the evaluations of the objective.
	Evaluations int
}

// Scoring minimizes p over dim variables from the origin, with terms
// terms, using sc for the per-term memory. The problem's last evaluation
// on return is of some point of the search.
func Scoring(p Problem, dim, terms int, s Settings, sc *Scratch) Result {
	sc.ensure(dim, terms)
	evals := 0
	eval := func(x, t []float64) float64 {
		evals++
		return p.Eval(x, t)
	}
	stop := func(x []float64, fx float64, ok bool, why string) Result {
		return Result{X: x, F: fx, OK: ok, Reason: why, Evaluations: evals}
	}
	x := make([]float64, dim)
	xt := make([]float64, dim)
	xs := make([]float64, dim)
	g := make([]float64, dim)
	d := make([]float64, dim)
	B := mat.NewSymDense(dim, nil)
	A := mat.NewSymDense(dim, nil)
	var chol mat.Cholesky
	gv := mat.NewVecDense(dim, g)
	dv := mat.NewVecDense(dim, d)
	fast := make([]bool, dim)
	penCurv := make([]float64, dim)
	sec := newSecant(dim)

	fx := eval(x, sc.center)
	if !finite(fx) {
		return stop(x, fx, false, "likelihood not finite at the seed")
	}
	h := s.ScoreStep
	lambda := 1e-3
	needB := true // B from the scores at the next point, not updated
	xPrev := make([]float64, dim)
	gPrev := make([]float64, dim)
	smallGains := 0
	for iter := 0; ; iter++ {
		if evals >= s.MaxEvaluations {
			return stop(x, fx, false, fmt.Sprintf("evaluation limit %d reached", s.MaxEvaluations))
		}
		if iter == s.MaxIterations {
			return stop(x, fx, false, fmt.Sprintf("iteration limit %d reached", s.MaxIterations))
		}
		// Scores. The fast ones first, on the state of the evaluation
		// at x, before any other evaluation replaces it.
		for j := 0; j < dim; j++ {
			g[j], fast[j] = p.FastScore(j, h, sc.step[j])
		}
		pen0 := p.Penalty(x)
		clear(penCurv)
		copy(xs, x)
		for j := 0; j < dim; j++ {
			if fast[j] {
				continue
			}
			xs[j] = x[j] + h
			fj := eval(xs, sc.step[j])
			xs[j] = x[j]
			g[j] = (fj - fx) / h
			st := sc.step[j]
			for i := 0; i < terms; i++ {
				st[i] = (st[i] - sc.center[i]) / h
			}
			// The penalty's own curvature, which no term carries.
			xs[j] = x[j] - h
			pm := p.Penalty(xs)
			xs[j] = x[j] + h
			pp := p.Penalty(xs)
			xs[j] = x[j]
			penCurv[j] = (pp - 2*pen0 + pm) / (h * h)
		}
		if !allFinite(g) {
			return stop(x, fx, false, "gradient not finite")
		}
		if needB {
			for a := 0; a < dim; a++ {
				sa := sc.step[a]
				for b := a; b < dim; b++ {
					sb := sc.step[b]
					var v float64
					for i := 0; i < terms; i++ {
						v += sa[i] * sb[i]
					}
					if a == b {
						v += penCurv[a]
					}
					B.SetSym(a, b, v)
				}
			}
			needB = false
		} else {
			sec.update(B, x, xPrev, g, gPrev)
		}
		// Damped steps until one descends.
		accepted := false
		var fnew float64
		for !accepted {
			A.CopySym(B)
			for a := 0; a < dim; a++ {
				A.SetSym(a, a, B.At(a, a)*(1+lambda)+1e-9)
			}
			if !chol.Factorize(A) {
				lambda *= 10
				if lambda > s.MaxDamping {
					return stop(x, fx, false, "information matrix singular")
				}
				continue
			}
			if err := chol.SolveVecTo(dv, gv); err != nil {
				return stop(x, fx, false, fmt.Sprintf("step: %v", err))
			}
			slope := 0.0
			for a := range d {
				d[a] = -d[a]
				slope += g[a] * d[a]
			}
			if -slope < 2*s.DecrementTol && lambda <= 1e-3 {
				// The full step would gain less than DecrementTol.
				return stop(x, fx, true, "")
			}
			if l := floats.Norm(d, 2); l > s.MaxStep {
				// Far from the minimum the local information is no guide
				// to the step length.
				floats.Scale(s.MaxStep/l, d)
				slope *= s.MaxStep / l
			}
			for a := range xt {
				xt[a] = x[a] + d[a]
			}
			ft := eval(xt, sc.trial)
			// Parabola along d through fx (alpha 0, slope) and ft (alpha 1).
			curv := 2 * (ft - fx - slope)
			alpha := 1.0
			if curv > 0 {
				alpha = -slope / curv
			}
			switch {
			case ft < fx && alpha > 1.5:
				// B overestimated the curvature: go further.
				alpha = math.Min(alpha, 10)
			case ft >= fx && curv > 0:
				alpha = math.Max(alpha, 0.1)
			default:
				alpha = 1
			}
			if alpha != 1 {
				for a := range xs {
					xs[a] = x[a] + alpha*d[a]
				}
				if f2 := eval(xs, sc.step[0]); f2 < math.Min(ft, fx) {
					copy(xt, xs)
					ft = f2
					sc.trial, sc.step[0] = sc.step[0], sc.trial
				} else if ft < fx {
					// back to the unit step's state
					eval(xt, sc.trial)
				}
			}
			if ft < fx {
				accepted = true
				fnew = ft
				lambda = math.Max(lambda/10, 1e-3)
				break
			}
			lambda *= 10
			if lambda > s.MaxDamping {
				// No damped step descends: the minimum of the tabulated
				// objective to within its noise when the expected gain is
				// small.
				if -slope < 1 {
					return stop(x, fx, true, "")
				}
				return stop(x, fx, false, fmt.Sprintf("no descending step (expected gain %.3g)", -slope/2))
			}
			if evals >= s.MaxEvaluations {
				return stop(x, fx, false, fmt.Sprintf("evaluation limit %d reached", s.MaxEvaluations))
			}
		}
		sc.center, sc.trial = sc.trial, sc.center
		gain := fx - fnew
		copy(xPrev, x)
		copy(gPrev, g)
		copy(x, xt)
		fx = fnew
		if gain < s.FloorGain {
			smallGains++
			if smallGains == 2 {
				// At the noise floor of the tabulated objective.
				return stop(x, fx, true, "")
			}
		} else {
			smallGains = 0
		}
		if p.Reanchor(x) {
			// The new origin's variables differ, so B starts again from
			// the scores; the terms at the point are unchanged.
			clear(x)
			fx = p.Penalty(x)
			for _, v := range sc.center {
				fx += v
			}
			needB = true
		}
	}
}

// secant holds the vectors of the secant update.
type secant struct{ s, y, bs, r []float64 }

func newSecant(n int) *secant {
	return &secant{s: make([]float64, n), y: make([]float64, n), bs: make([]float64, n), r: make([]float64, n)}
}

// update corrects B, the estimate of the Hessian, along the last step s =
// x - xPrev so that B s matches the change of the gradient y = g - gPrev
// (the BFGS update of the Hessian), damped after Powell so that B stays
// positive definite when the change shows little or negative curvature
// (Nocedal and Wright, Numerical Optimization, 2nd ed., procedure 18.2).
// The scores' outer product starts B near the Fisher information; where
// the model's spread is wrong it misjudges the curvature, and the updates
// learn the real one along the directions the search moves in.
func (sc *secant) update(B *mat.SymDense, x, xPrev, g, gPrev []float64) {
	n := len(x)
	s, y, bs, r := sc.s, sc.y, sc.bs, sc.r
	for i := 0; i < n; i++ {
		s[i] = x[i] - xPrev[i]
		y[i] = g[i] - gPrev[i]
		bs[i] = 0
	}
	var sBs, sy float64
	for i := 0; i < n; i++ {
		for j := 0; j < n; j++ {
			bs[i] += B.At(i, j) * s[j]
		}
		sBs += s[i] * bs[i]
		sy += s[i] * y[i]
	}
	if !(sBs > 0) {
		return
	}
	theta := 1.0
	if sy < 0.2*sBs {
		theta = 0.8 * sBs / (sBs - sy)
	}
	var sr float64
	for i := 0; i < n; i++ {
		r[i] = theta*y[i] + (1-theta)*bs[i]
		sr += s[i] * r[i]
	}
	if !(sr > 0) {
		return
	}
	for i := 0; i < n; i++ {
		for j := i; j < n; j++ {
			B.SetSym(i, j, B.At(i, j)-bs[i]*bs[j]/sBs+r[i]*r[j]/sr)
		}
	}
}

func finite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }

func allFinite(v []float64) bool {
	for _, x := range v {
		if !finite(x) {
			return false
		}
	}
	return true
}
