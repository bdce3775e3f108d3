package ring

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"

	"github.com/conelight/conelight/fit"
)

// The track fit minimizes the likelihood by Levenberg-Marquardt-damped
// scoring: the likelihood is a sum of independent sensor terms, so one
// forward-difference pass over the parameters gives every sensor's score
// s_i = d(term_i)/dx as well as the gradient g = sum_i s_i, and the outer
// product B = sum_i s_i s_i^T (Berndt-Hall-Hall-Hausman) estimates the
// Fisher information, which the expectation of the Hessian equals when
// the model is right. The step solves (B + lambda diag B) d = -g; a
// parabola through the value, the slope along d and the value at the step
// corrects the step length when B misjudges the curvature (it does where
// the model's spread is wrong, as in the time term), and damped BFGS
// secant updates (secantUpdate) correct B itself along the steps taken,
// B starting again from the scores when the frame is re-anchored. A
// quasi-Newton method starting from the identity has to learn this matrix
// over many iterations; with it the fit converges in a handful.

// Settings of the scoring minimizer, in the scaled variables of frame.
const (
	// scoreStep is the forward-difference step of the scores: a small
	// fraction of a standard deviation, wide enough to average over the
	// kinks of the linearly interpolated tables.
	scoreStep = 0.02
	// decrementTol stops the fit when the expected gain of a full step,
	// g^T B^-1 g / 2, is below it (log-likelihood units).
	decrementTol = 0.05
	// floorGain stops it after two accepted steps in a row that each
	// gained less than this: the noise floor of the linearly
	// interpolated tables, where the secant updates no longer learn.
	floorGain = 0.05
	// maxAngleOffset (scaled units, 0.1 rad) re-anchors the frame.
	maxAngleOffset = 5
	// maxDamping gives up on a point where no damped step descends.
	maxDamping = 1e4
	// maxIterations bounds the accepted steps of one fit: a fit that
	// still descends after that many started far from its minimum (a
	// wrong ring from the seed, or the wrong hypothesis), and the
	// caller refits it from a better start.
	maxIterations = 100
	// maxStep caps the length of a step (scaled units: 3 m of vertex or
	// 0.6 rad of direction alone).
	maxStep = 30
)

// scoreScratch is the minimizer's per-workspace memory: the per-sensor
// terms at the current point and at its NumParams forward steps.
type scoreScratch struct {
	center []float64
	trial  []float64
	step   [NumParams][]float64
}

func (w *workspace) scratch() *scoreScratch {
	s := &w.score
	if s.center == nil {
		n := w.f.n
		s.center, s.trial = make([]float64, n), make([]float64, n)
		for j := range s.step {
			s.step[j] = make([]float64, n)
		}
	}
	return s
}

// penalty is the smooth wall of the objective at the tank surface and the
// ends of the energy range, and the track to evaluate the likelihood at.
func (w *workspace) penalty(fr *frame, x []float64) (fit.Track, float64) {
	tr, eOut := fr.track(x)
	pen := 1e4 * eOut
	if d := w.f.det.DistanceToWall(tr.Vertex); d < 0 {
		// Evaluate at the nearest point inside and add a steep wall.
		tr.Vertex = w.pullInside(tr.Vertex)
		pen += 1e3 * (1 + d*d)
	}
	return tr, pen
}

// evalTerms evaluates the objective at x, leaving the prediction in the
// workspace and the per-sensor terms in terms.
func (w *workspace) evalTerms(h Hypothesis, fr *frame, x, terms []float64) float64 {
	for _, xi := range x {
		if !finite(xi) {
			return math.MaxFloat64 / 4
		}
	}
	tr, pen := w.penalty(fr, x)
	w.evals++
	w.predict(h, tr)
	return w.sensorTerms(terms) + pen
}

// minimizeScoring minimizes the objective of hypothesis h from the origin
// of fr, moving fr's reference to each accepted point. It returns the
// point reached (in the final fr), the objective there, whether the point
// is a minimum and, if not, why. The workspace's prediction on
// return is of some point of the search.
func (w *workspace) minimizeScoring(h Hypothesis, fr *frame) (x []float64, fx float64, ok bool, why string) {
	sc := w.scratch()
	n := w.f.n
	x = make([]float64, NumParams)
	xt := make([]float64, NumParams)
	xs := make([]float64, NumParams)
	g := make([]float64, NumParams)
	d := make([]float64, NumParams)
	B := mat.NewSymDense(NumParams, nil)
	A := mat.NewSymDense(NumParams, nil)
	var chol mat.Cholesky
	gv := mat.NewVecDense(NumParams, g)
	dv := mat.NewVecDense(NumParams, d)

	fx = w.evalTerms(h, fr, x, sc.center)
	if !finite(fx) {
		return x, fx, false, "likelihood not finite at the seed"
	}
	lambda := 1e-3
	needB := true // B from the scores at the next point, not updated
	xPrev := make([]float64, NumParams)
	gPrev := make([]float64, NumParams)
	smallGains := 0
	for iter := 0; ; iter++ {
		if w.evals >= w.f.maxEval {
			return x, fx, false, fmt.Sprintf("evaluation limit %d reached", w.f.maxEval)
		}
		if iter == maxIterations {
			return x, fx, false, fmt.Sprintf("iteration limit %d reached", maxIterations)
		}
		// Scores. The time first, on the stored prediction at x: a time
		// step moves only the predicted times, hence only the hit terms.
		muN := w.darkMean()
		ts := sc.step[timeParam]
		for i := range ts {
			ts[i] = 0
		}
		gt := 0.0
		for _, i := range w.hits {
			dt := w.hitT[i] - w.tDir[i]
			a := w.timeNLL(dt-scaleTime*scoreStep, w.sgT[i], w.muD[i], w.muI[i], muN)
			b := w.timeNLL(dt, w.sgT[i], w.muD[i], w.muI[i], muN)
			ts[i] = (a - b) / scoreStep
			gt += ts[i]
		}
		g[timeParam] = gt
		_, pen0 := w.penalty(fr, x)
		var penCurv [NumParams]float64
		copy(xs, x)
		for j := 0; j < NumParams; j++ {
			if j == timeParam {
				continue
			}
			xs[j] = x[j] + scoreStep
			fj := w.evalTerms(h, fr, xs, sc.step[j])
			xs[j] = x[j]
			g[j] = (fj - fx) / scoreStep
			s := sc.step[j]
			for i := 0; i < n; i++ {
				s[i] = (s[i] - sc.center[i]) / scoreStep
			}
			// The penalty's own curvature, which no sensor carries.
			xs[j] = x[j] - scoreStep
			_, pm := w.penalty(fr, xs)
			xs[j] = x[j] + scoreStep
			_, pp := w.penalty(fr, xs)
			xs[j] = x[j]
			penCurv[j] = (pp - 2*pen0 + pm) / (scoreStep * scoreStep)
		}
		if !floatsFinite(g) {
			return x, fx, false, "gradient not finite"
		}
		if needB {
			for a := 0; a < NumParams; a++ {
				sa := sc.step[a]
				for b := a; b < NumParams; b++ {
					sb := sc.step[b]
					var v float64
					for i := 0; i < n; i++ {
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
			secantUpdate(B, x, xPrev, g, gPrev)
		}
		// Damped steps until one descends.
		accepted := false
		var fnew float64
		for !accepted {
			A.CopySym(B)
			for a := 0; a < NumParams; a++ {
				A.SetSym(a, a, B.At(a, a)*(1+lambda)+1e-9)
			}
			if !chol.Factorize(A) {
				lambda *= 10
				if lambda > maxDamping {
					return x, fx, false, "information matrix singular"
				}
				continue
			}
			if err := chol.SolveVecTo(dv, gv); err != nil {
				return x, fx, false, fmt.Sprintf("step: %v", err)
			}
			slope := 0.0
			for a := range d {
				d[a] = -d[a]
				slope += g[a] * d[a]
			}
			if -slope < 2*decrementTol && lambda <= 1e-3 {
				// The full step would gain less than decrementTol.
				return x, fx, true, ""
			}
			if l := floats.Norm(d, 2); l > maxStep {
				// Far from the minimum the local information is no guide
				// to the step length.
				floats.Scale(maxStep/l, d)
				slope *= maxStep / l
			}
			for a := range xt {
				xt[a] = x[a] + d[a]
			}
			ft := w.evalTerms(h, fr, xt, sc.trial)
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
				if f2 := w.evalTerms(h, fr, xs, sc.step[0]); f2 < math.Min(ft, fx) {
					copy(xt, xs)
					ft = f2
					sc.trial, sc.step[0] = sc.step[0], sc.trial
				} else if ft < fx {
					// back to the unit step's prediction
					w.evalTerms(h, fr, xt, sc.trial)
				}
			}
			if ft < fx {
				accepted = true
				fnew = ft

				lambda = math.Max(lambda/10, 1e-3)
				break
			}
			lambda *= 10
			if lambda > maxDamping {
				// No damped step descends: the minimum of the tabulated
				// likelihood to within its noise when the expected gain is
				// small.
				if -slope < 1 {
					return x, fx, true, ""
				}
				return x, fx, false, fmt.Sprintf("no descending step (expected gain %.3g)", -slope/2)
			}
			if w.evals >= w.f.maxEval {
				return x, fx, false, fmt.Sprintf("evaluation limit %d reached", w.f.maxEval)
			}
		}
		sc.center, sc.trial = sc.trial, sc.center
		gain := fx - fnew
		copy(xPrev, x)
		copy(gPrev, g)
		copy(x, xt)
		fx = fnew
		if gain < floorGain {
			smallGains++
			if smallGains == 2 {
				// At the noise floor of the tabulated likelihood.
				return x, fx, true, ""
			}
		} else {
			smallGains = 0
		}
		if math.Abs(x[4]) > maxAngleOffset || math.Abs(x[5]) > maxAngleOffset {
			// Re-anchor the frame at the new point: the direction angles
			// are tangent-plane offsets, which degenerate far from the
			// reference direction. The new frame's axes differ, so B
			// starts again from the scores.
			tr, _ := fr.track(x)
			*fr = newFrame(tr, fr.lo, fr.hi)
			clear(x)
			_, pen := w.penalty(fr, x)
			fx = pen
			for _, v := range sc.center {
				fx += v
			}
			needB = true
		}
	}
}

// secantUpdate corrects B, the estimate of the Hessian, along the last
// step s = x - xPrev so that B s matches the change of the gradient y =
// g - gPrev (the BFGS update of the Hessian), damped after Powell so that B
// stays positive definite when the change shows little or negative
// curvature (Nocedal and Wright, Numerical Optimization, 2nd ed.,
// procedure 18.2). The scores' outer product starts B near the Fisher
// information; where the model's spread is wrong (the time term) it
// misjudges the curvature, and the updates learn the real one along the
// directions the fit moves in.
func secantUpdate(B *mat.SymDense, x, xPrev, g, gPrev []float64) {
	n := len(x)
	var s, y, bs [NumParams]float64
	for i := 0; i < n; i++ {
		s[i] = x[i] - xPrev[i]
		y[i] = g[i] - gPrev[i]
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
	var r [NumParams]float64
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

func floatsFinite(v []float64) bool {
	for _, x := range v {
		if !finite(x) {
			return false
		}
	}
	return true
}
