package ring

import (
	"fmt"
	"math"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/mat"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/fit/ring/internal/minimize"
	"github.com/conelight/conelight/sim/phys"
)

// addUncertainties fills the covariance, errors and Cramer-Rao bound of
// a converged result of the loaded event, or marks it unconverged when
// the Hessian is not positive definite.
func (w *workspace) addUncertainties(res *Result) {
	if res.Status != fit.Converged || w.f.cfg.SkipUncertainties {
		return
	}
	f := w.f
	h := res.Hypothesis
	best := res.Track
	lo, hi := f.EkinRange(h)
	w.evals = res.Evaluations
	// Hessian in the scaled variables about the fitted track.
	fr := newFrame(best, lo, hi)
	// The tables are linear between nodes, so the curvature is measured
	// over steps of a fraction of a standard deviation; a wider stencil
	// is tried when kinks spoil the first.
	var curv *curvature
	var ch mat.Cholesky
	ok := false
	for _, step := range []float64{0.25, 0.6} {
		curv = w.curvatureAt(h, &fr, step)
		curv.step = step
		if ok = ch.Factorize(curv.hess); ok {
			break
		}
	}
	res.Evaluations = w.evals
	if !ok {
		res.Reason = "Hessian not positive definite"
		return
	}
	var hinv mat.SymDense
	if err := ch.InverseTo(&hinv); err != nil {
		res.Reason = fmt.Sprintf("Hessian inversion: %v", err)
		return
	}
	cov := minimize.Sandwich(&hinv, w.sensorScores(h, &fr, curv.step))
	res.Cov = fr.physCov(cov)
	w.addIntrinsic(h, best, &res.Cov)
	res.Errors = errorsFrom(&res.Cov, h, best.Ekin)
	res.CramerRao = w.cramerRao(h, best, curv)
	res.Evaluations = w.evals
	for _, v := range []float64{res.Errors.Vertex.X, res.Errors.Vertex.Y, res.Errors.Vertex.Z, res.Errors.Time,
		res.Errors.Angle[0], res.Errors.Angle[1], res.Errors.Ekin,
		res.CramerRao.Angle[0], res.CramerRao.Angle[1], res.CramerRao.Ekin} {
		if !finite(v) {
			res.Reason = "uncertainties not finite"
			res.Errors, res.CramerRao, res.Cov = fit.Errors{}, fit.Errors{}, [NumParams][NumParams]float64{}
			return
		}
	}
	res.ErrorsValid = true
}

// curvature is the numerical Hessian of the objective at the origin of a
// frame, with the derivatives of every sensor's prediction that come with
// it for the Cramer-Rao bound.
type curvature struct {
	hess *mat.SymDense
	step float64 // the stencil's step, scaled units
	// dmu[j][i] and dt[j][i] are the central-difference derivatives of
	// sensor i's mean pe and direct-light time in variable j.
	dmu, dt [NumParams][]float64
}

// curvatureAt measures the Hessian of the objective of hypothesis h at
// the origin of fr with steps of size step (scaled units) by
// minimize.Curvature, and the central-difference derivatives of every
// sensor's prediction on the same points. A step in the time moves every
// predicted time and nothing else, so the points that step the time
// reuse the prediction of the point without it and evaluate only the
// time terms of the hits.
func (w *workspace) curvatureAt(h Hypothesis, fr *frame, step float64) *curvature {
	n := w.f.n
	c := &curvature{}
	for j := range c.dmu {
		c.dmu[j], c.dt[j] = make([]float64, n), make([]float64, n)
	}
	// Every sensor's time derivative enters the Cramer-Rao bound.
	w.allTimes = true
	defer func() { w.allTimes = false }()
	// The time derivative of every prediction: only the times move.
	for i := 0; i < n; i++ {
		c.dt[timeParam][i] = scaleTime
	}
	c.hess = minimize.Curvature(&curvatureProblem{w: w, h: h, fr: fr}, NumParams, step, func(j int, sgn float64) {
		for i := 0; i < n; i++ {
			c.dmu[j][i] += sgn * (w.muD[i] + w.muI[i]) / (2 * step)
			c.dt[j][i] += sgn * w.tDir[i] / (2 * step)
		}
	})
	return c
}

// addIntrinsic adds to cov, the covariance of the fit of hypothesis h at
// track tr, that of the event-to-event fluctuations of the emission as a
// whole, which the likelihood of the mean profile cannot see: the
// direction of an event's light axis about the particle's initial
// direction (a muon's multiple scattering, a shower's early spread), the
// start of its light along the track (where a shower begins to radiate)
// with the time that moves with it at c, and its photon count (shower and
// delta-ray fluctuations, straggling) turned into kinetic energy by
// dlnPhotons/dlnE. The generator measures each on the simulated particles
// of every table node (profile.Node); they are independent of the
// measurement noise and add to its covariance.
func (w *workspace) addIntrinsic(h Hypothesis, tr fit.Track, cov *[NumParams][NumParams]float64) {
	p := &w.prof
	w.f.species(h).interpolate(tr.Ekin, p)
	u := [3]float64{tr.Dir.X, tr.Dir.Y, tr.Dir.Z}
	v := p.startSD * p.startSD
	c := phys.SpeedOfLight
	for a := 0; a < 3; a++ {
		for b := 0; b < 3; b++ {
			cov[a][b] += v * u[a] * u[b]
		}
		cov[a][3] += v * u[a] / c
		cov[3][a] += v * u[a] / c
	}
	cov[3][3] += v / (c * c)
	cov[4][4] += p.axisVar
	cov[5][5] += p.axisVar
	if p.photonSlope > 0 {
		se := tr.Ekin * p.photonsSD / p.photonSlope
		cov[6][6] += se * se
	}
}

// sensorScores returns every sensor's score at the origin of fr, the
// central-difference derivative of its term of the negative log
// likelihood in each scaled variable, with step step; scores[j][i] is
// sensor i's in variable j (zero for dead sensors and for unhit sensors
// where the term does not change).
func (w *workspace) sensorScores(h Hypothesis, fr *frame, step float64) [][]float64 {
	n := w.f.n
	scores := make([][]float64, NumParams)
	plus, minus := make([]float64, n), make([]float64, n)
	x := make([]float64, NumParams)
	for j := range scores {
		x[j] = step
		w.evalTerms(h, fr, x, plus)
		x[j] = -step
		w.evalTerms(h, fr, x, minus)
		x[j] = 0
		s := make([]float64, n)
		for i := range s {
			s[i] = (plus[i] - minus[i]) / (2 * step)
		}
		scores[j] = s
	}
	return scores
}

// curvatureProblem is the objective of hypothesis h in the variables of
// fr for minimize.Curvature.
type curvatureProblem struct {
	w  *workspace
	h  Hypothesis
	fr *frame
}

func (p *curvatureProblem) Eval(x []float64) float64 { return p.w.evalTerms(p.h, p.fr, x, nil) }

// Shifted serves the time: the value with every predicted time later by
// scaleTime*d, from the stored prediction.
func (p *curvatureProblem) Shifted(j int, f, d float64) (float64, bool) {
	if j != timeParam {
		return 0, false
	}
	return f - p.w.timeShiftNLL(0) + p.w.timeShiftNLL(scaleTime*d), true
}

// physCov converts a covariance of the minimizer's variables about the
// reference track of fr into one of the physical parameters (x, y, z, t,
// the two angles along phys.Basis of the reference direction, Ekin) by
// the Jacobian of frame.track at its origin.
func (fr *frame) physCov(c *mat.SymDense) [NumParams][NumParams]float64 {
	u := fr.ref.Dir
	var J [NumParams][NumParams]float64 // J[physical][scaled]
	for k, e := range []r3.Vector{u, fr.e1, fr.e2} {
		J[0][k], J[1][k], J[2][k] = scaleVertex*e.X, scaleVertex*e.Y, scaleVertex*e.Z
	}
	J[3][0] = scaleVertex / phys.SpeedOfLight
	J[3][3] = scaleTime
	J[4][4], J[5][5] = scaleAngle, scaleAngle
	J[6][6] = scaleLogE * fr.ref.Ekin
	var out [NumParams][NumParams]float64
	for i := 0; i < NumParams; i++ {
		for j := 0; j < NumParams; j++ {
			var s float64
			for a := 0; a < NumParams; a++ {
				if J[i][a] == 0 {
					continue
				}
				for b := 0; b < NumParams; b++ {
					s += J[i][a] * c.At(a, b) * J[j][b]
				}
			}
			out[i][j] = s
		}
	}
	return out
}

func errorsFrom(cov *[NumParams][NumParams]float64, h Hypothesis, e float64) fit.Errors {
	sq := func(v float64) float64 { return math.Sqrt(math.Max(v, 0)) }
	p := phys.Momentum(e, h.Mass())
	dpde := (e + h.Mass()) / p
	return fit.Errors{
		Vertex:   r3.Vector{X: sq(cov[0][0]), Y: sq(cov[1][1]), Z: sq(cov[2][2])},
		Time:     sq(cov[3][3]),
		Angle:    [2]float64{sq(cov[4][4]), sq(cov[5][5])},
		Ekin:     sq(cov[6][6]),
		Momentum: sq(cov[6][6]) * dpde,
	}
}

// cramerRao returns the Cramer-Rao bound at tr: the inverse of the
// expected Fisher information sum_i (dmu_i/dtheta)^T (dmu_i/dtheta) / mu_i
// of Poisson photoelectron counts plus, for each sensor in proportion to
// its hit probability, (dt_i/dtheta)^T (dt_i/dtheta) / sigma_i^2 of its
// time, with the derivatives of the predictions that came with the
// Hessian c.
func (w *workspace) cramerRao(h Hypothesis, tr fit.Track, c *curvature) fit.Errors {
	f := w.f
	fr := newFrame(tr, f.energyLo[h], f.energyHi[h])
	n := f.n
	dmu, dt := c.dmu, c.dt
	w.allTimes = true
	w.predict(h, tr)
	w.allTimes = false
	info := mat.NewSymDense(NumParams, nil)
	for i := 0; i < n; i++ {
		if f.dead[i] {
			continue
		}
		mu := w.muD[i] + w.muI[i] + f.darkGate
		ph := -math.Expm1(-w.muD[i])
		s2 := w.sgT[i] * w.sgT[i]
		for a := 0; a < NumParams; a++ {
			for b := a; b < NumParams; b++ {
				v := info.At(a, b) + dmu[a][i]*dmu[b][i]/mu + ph*dt[a][i]*dt[b][i]/s2
				info.SetSym(a, b, v)
			}
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(info) {
		return fit.Errors{}
	}
	var cov mat.SymDense
	if ch.InverseTo(&cov) != nil {
		return fit.Errors{}
	}
	pc := fr.physCov(&cov)
	return errorsFrom(&pc, h, tr.Ekin)
}
