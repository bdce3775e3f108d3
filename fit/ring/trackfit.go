package ring

import (
	"fmt"
	"math"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/ring/internal/minimize"
	"github.com/conelight/conelight/sim/phys"
)

// fitLoaded fits hypothesis h to the loaded event from seed.
func (w *workspace) fitLoaded(h Hypothesis, seed fit.Track) Result {
	f := w.f
	res := Result{Hypothesis: h, Status: fit.NotConverged}
	w.evals = 0
	lo, hi := f.EkinRange(h)
	seed.Ekin = min(max(seed.Ekin, lo), hi)
	if f.det.DistanceToWall(seed.Vertex) < 0 {
		res.Reason = fmt.Sprintf("seed vertex %v outside the tank", seed.Vertex)
		res.Track = seed
		return res
	}
	fr := newFrame(seed, lo, hi)
	m := w.minimizeScoring(h, &fr)
	x, fx, ok, why := m.X, m.F, m.OK, m.Reason
	res.Evaluations = w.evals
	best, eOut := fr.track(x)
	res.Track = best
	res.Momentum = phys.Momentum(best.Ekin, h.Mass())
	// The likelihood without the walls, at the track inside the allowed
	// region that the objective evaluated (energy clamped to the tables,
	// vertex pulled inside): a fit stopped at a limit still gives the
	// identity its likelihood.
	_, pen := w.penalty(&fr, x)
	res.NLL = fx - pen
	switch {
	case !finite(fx):
		res.Reason = "likelihood not finite"
		return res
	case eOut > 0 || best.Ekin <= lo*(1+1e-6) || best.Ekin >= hi*(1-1e-6):
		res.Status = fit.AtLimit
		res.Reason = fmt.Sprintf("energy %g MeV at the edge of the table range %g-%g MeV", best.Ekin, lo, hi)
		return res
	case f.det.DistanceToWall(best.Vertex) < 0:
		res.Status = fit.AtLimit
		res.Reason = fmt.Sprintf("vertex %v outside the tank", best.Vertex)
		return res
	case !ok:
		res.Reason = "minimizer: " + why
		return res
	}
	res.NLL = w.nll(h, best)
	res.Status = fit.Converged
	res.Evaluations = w.evals
	res.Outside = w.outsideFraction(h, best)
	if res.Exiting() {
		res.MinEkin = w.rangeEnergy(h, f.det.DistanceAlong(best.Vertex, best.Dir))
	}
	return res
}

// timeParam is the index of the time among the minimizer's variables.
const timeParam = 3

// Parameter scales: a unit step of the minimizer's variables.
const (
	scaleVertex = 10.0 // cm
	scaleTime   = 1.0  // ns
	scaleAngle  = 0.02 // rad
	scaleLogE   = 0.02
)

// frame maps the minimizer's variables, offsets from a reference track
// in scaled units, to tracks.
type frame struct {
	ref    fit.Track
	e1, e2 r3.Vector
	lo, hi float64
}

func newFrame(ref fit.Track, lo, hi float64) frame {
	e1, e2 := phys.Basis(ref.Dir)
	return frame{ref: ref, e1: e1, e2: e2, lo: lo, hi: hi}
}

// track returns the track at x and the squared excursion beyond the
// energy range in log units (0 inside), clamping the energy.
func (fr *frame) track(x []float64) (fit.Track, float64) {
	r := fr.ref
	// x[0] moves the vertex along the reference direction and the time
	// with it at c, x[1] and x[2] across it: the start of a track is
	// poorly fixed along it, but light times fix where the track passes.
	l := scaleVertex * x[0]
	v := r.Vertex.Add(r.Dir.Mul(l)).Add(fr.e1.Mul(scaleVertex * x[1])).Add(fr.e2.Mul(scaleVertex * x[2]))
	u := r.Dir.Add(fr.e1.Mul(scaleAngle * x[4])).Add(fr.e2.Mul(scaleAngle * x[5])).Normalize()
	le := math.Log(r.Ekin) + scaleLogE*x[6]
	e := math.Exp(le)
	var out float64
	switch {
	case e < fr.lo:
		out = math.Log(fr.lo) - le
		e = fr.lo
	case e > fr.hi:
		out = le - math.Log(fr.hi)
		e = fr.hi
	}
	return fit.Track{Vertex: v, Time: r.Time + l/phys.SpeedOfLight + scaleTime*x[3], Dir: u, Ekin: e}, out * out
}

// objective is the likelihood with smooth walls at the tank surface and
// the ends of the energy range.
func (w *workspace) objective(h Hypothesis, fr *frame, x []float64) float64 {
	return w.evalTerms(h, fr, x, nil)
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

// pullInside moves p onto the sensor surface's inside along the line to
// the tank centre.
func (w *workspace) pullInside(p r3.Vector) r3.Vector {
	f := w.f
	s := 1.0
	if rho := math.Hypot(p.X, p.Y); rho > f.tankRadius-0.5 {
		s = (f.tankRadius - 0.5) / rho
	}
	q := r3.Vector{X: p.X * s, Y: p.Y * s, Z: p.Z}
	q.Z = min(max(q.Z, -f.tankHalfZ+0.5), f.tankHalfZ-0.5)
	return q
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

// rangeEnergy returns the kinetic energy of hypothesis h whose light
// ends (90% of it emitted, light90) at distance l, by bisection in log
// energy over the table range; the ends of the range when l lies beyond.
func (w *workspace) rangeEnergy(h Hypothesis, l float64) float64 {
	lo, hi := w.f.EkinRange(h)
	if w.lightLength(h, lo) >= l {
		return lo
	}
	if w.lightLength(h, hi) <= l {
		return hi
	}
	a, b := math.Log(lo), math.Log(hi)
	for range 40 {
		m := 0.5 * (a + b)
		if w.lightLength(h, math.Exp(m)) < l {
			a = m
		} else {
			b = m
		}
	}
	return math.Exp(0.5 * (a + b))
}

// outsideFraction is the fraction of the light of track tr that its
// emission profile puts beyond the wall along its direction.
func (w *workspace) outsideFraction(h Hypothesis, tr fit.Track) float64 {
	p := &w.prof
	w.f.species(h).interpolate(tr.Ekin, p)
	lexit := w.f.det.DistanceAlong(tr.Vertex, tr.Dir)
	var in, all float64
	for k := 0; k < nSteps; k++ {
		a, b := float64(k)*p.ds, float64(k+1)*p.ds
		all += p.total[k]
		switch {
		case b <= lexit:
			in += p.total[k]
		case a < lexit:
			in += p.total[k] * (lexit - a) / p.ds
		}
	}
	if !(all > 0) {
		return 0
	}
	return 1 - in/all
}
