package ring

import (
	"math"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/ring/internal/minimize"
)

// Settings of the scoring minimizer (internal/minimize), in the scaled
// variables of frame.
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

// trackProblem is the fit of hypothesis h in the variables of fr as a
// problem of the scoring minimizer: the sensors' terms plus the walls.
type trackProblem struct {
	w  *workspace
	h  Hypothesis
	fr *frame
}

func (p *trackProblem) Eval(x, terms []float64) float64 { return p.w.evalTerms(p.h, p.fr, x, terms) }

func (p *trackProblem) Penalty(x []float64) float64 {
	_, pen := p.w.penalty(p.fr, x)
	return pen
}

// FastScore does the time: a time step moves only the predicted times,
// hence only the hit terms, so the scores come from the stored
// prediction.
func (p *trackProblem) FastScore(j int, h float64, scores []float64) (float64, bool) {
	if j != timeParam {
		return 0, false
	}
	w := p.w
	muN := w.darkMean()
	for i := range scores {
		scores[i] = 0
	}
	g := 0.0
	for _, i := range w.hits {
		dt := w.hitT[i] - w.tDir[i]
		a := w.timeNLL(dt-scaleTime*h, w.sgT[i], w.muD[i], w.muI[i], muN)
		b := w.timeNLL(dt, w.sgT[i], w.muD[i], w.muI[i], muN)
		scores[i] = (a - b) / h
		g += scores[i]
	}
	return g, true
}

// Reanchor moves the frame to x when the direction angles, tangent-plane
// offsets that degenerate far from the reference direction, exceed
// maxAngleOffset.
func (p *trackProblem) Reanchor(x []float64) bool {
	if math.Abs(x[4]) <= maxAngleOffset && math.Abs(x[5]) <= maxAngleOffset {
		return false
	}
	tr, _ := p.fr.track(x)
	*p.fr = newFrame(tr, p.fr.lo, p.fr.hi)
	return true
}

// minimizeScoring minimizes the objective of hypothesis h from the origin
// of fr, moving fr's reference when the minimizer re-anchors. The
// workspace's prediction on return is of some point of the search.
func (w *workspace) minimizeScoring(h Hypothesis, fr *frame) minimize.Result {
	p := &trackProblem{w: w, h: h, fr: fr}
	return minimize.Scoring(p, NumParams, w.f.n, minimize.Settings{
		ScoreStep: scoreStep, DecrementTol: decrementTol, FloorGain: floorGain,
		MaxDamping: maxDamping, MaxIterations: maxIterations, MaxEvaluations: w.f.maxEval,
		MaxStep: maxStep,
	}, &w.score)
}
