package ring

import (
	"cmp"
	"errors"
	"fmt"
	"math"
	"slices"

	"github.com/golang/geo/r3"
	"gonum.org/v1/gonum/mat"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// NumParams is the number of fitted parameters: vertex x, y, z (cm),
// time (ns), two direction angles (rad, along the axes of phys.Basis of
// the fitted direction) and kinetic energy (MeV), in that order in
// Result.Cov.
const NumParams = 7

// Result is the fit of one hypothesis.
type Result struct {
	Hypothesis Hypothesis
	Track      fit.Track
	Momentum   float64 // MeV/c
	// NLL is the negative log likelihood at the fitted track.
	NLL float64
	// Status is fit.Converged when the minimizer converged inside the
	// tank and the energy range of the tables (EkinRange); a converged
	// result holds only finite numbers. fit.AtLimit: the minimum lies on
	// the tank wall or at an end of the energy range; fit.NotConverged:
	// the minimizer stopped without converging. Reason says why for any
	// other status.
	Status fit.Status
	Reason string
	// ErrorsValid says that Errors, Cov and CramerRao hold the
	// uncertainties; when they were wanted but could not be had (the
	// numerical Hessian not positive definite) ErrorsNote says why.
	ErrorsValid bool
	ErrorsNote  string
	// Errors are from the curvature of the likelihood (the inverse of the
	// numerical Hessian), the two angles along the axes of phys.Basis of
	// Track.Dir; Cov is that covariance matrix in the parameter order of
	// NumParams. Fit computes them for the hypothesis with the
	// better likelihood only (FitFrom for its one hypothesis); they are
	// zero for the other, when Config.SkipUncertainties is set or when the
	// fit failed. They are statistical only: see the package
	// documentation on pulls.
	Errors fit.Errors
	Cov    [NumParams][NumParams]float64
	// CramerRao is the Cramer-Rao bound at the fitted track: the
	// inverse expected Fisher information of an ideal sensor that counts
	// photoelectrons without charge smearing (Poisson) and measures the
	// first-photon time with the predicted time spread. No unbiased fit
	// of this model can do better.
	CramerRao   fit.Errors
	Evaluations int
	// Outside is the fraction of the fitted track's light that the
	// emission profile puts beyond the tank wall along the fitted
	// direction: a muon that leaves the tank. Its light inside fixes the
	// track but hardly the energy, so when Outside is more than
	// ExitingFraction the energy and momentum are lower bounds, not
	// measurements, and Exiting reports it; MinEkin is then the kinetic
	// energy whose light would just reach the wall (the lower bound).
	Outside float64
	MinEkin float64
}

// ExitingFraction is the fraction of a track's light beyond the wall above
// which Result.Exiting is true (common practice for calling a track
// partially contained; the choice of 5% is ours).
const ExitingFraction = 0.05

// Exiting reports whether the fitted track leaves the tank with more than
// ExitingFraction of its light: the fitted energy is then a lower bound.
func (r *Result) Exiting() bool { return r.Outside > ExitingFraction }

// Reconstruction is the two-hypothesis fit of an event.
type Reconstruction struct {
	Electron, Muon Result
	// LLR is Muon.NLL - Electron.NLL: positive means electron-like.
	LLR float64
	// Seed is the common start: point-fit vertex and time, ring
	// direction (its energy is the electron seed).
	Seed fit.Track
	// HitsUsed counts the hits in the likelihood (first hit per live
	// sensor, prompt window); HitsDropped the others.
	HitsUsed, HitsDropped int
}

// PIDCut separates e-like from mu-like events by the log-likelihood ratio
// as a function of the fitted momentum: an event is e-like when LLR >
// Offset + Slope*p, p the mean of the two fitted momenta in GeV/c.
// The zero PIDCut compares the likelihoods directly.
type PIDCut struct {
	Offset, Slope float64
}

// PDG returns 11 for an e-like event, 13 for a mu-like one and 0 when
// neither fit converged. When only one converged it is chosen.
func (c PIDCut) PDG(r *Reconstruction) int {
	switch {
	case r.Electron.Status != fit.Converged && r.Muon.Status != fit.Converged:
		return 0
	case r.Muon.Status != fit.Converged:
		return phys.Electron
	case r.Electron.Status != fit.Converged:
		return phys.MuonMinus
	}
	p := 0.5 * (r.Electron.Momentum + r.Muon.Momentum) / 1000
	if r.LLR > c.Offset+c.Slope*p {
		return phys.Electron
	}
	return phys.MuonMinus
}

// Best returns the result of the hypothesis c picks (the electron when
// neither converged).
func (c PIDCut) Best(r *Reconstruction) *Result {
	if c.PDG(r) == phys.MuonMinus {
		return &r.Muon
	}
	return &r.Electron
}

// promptBefore and promptAfter (ns) bound the hits used around the
// point-fit time: before it only dark noise, long after it a decay
// electron or the next event.
const promptBefore = 60

// Fit reconstructs an event from its hits: point seed, ring direction,
// then the electron and the muon fits. win is the readout window (the
// zero Window: the span of the hits). Hits must pass fit.CheckHits with
// the sensor's integration gate. An event the fit cannot use (no hits,
// bad hits) gives an error, with the reason and status (fit.NoHits,
// fit.BadInput) in both results; a fit that fails to converge is
// reported in its Result.
func (f *Fitter) Fit(hits []pmt.Hit, win Window) (Reconstruction, error) {
	w := f.workspace()
	defer f.pool.Put(w)
	return w.fitEvent(hits, win)
}

// fitEvent is Fit on the workspace, which keeps the selected hits loaded.
func (w *workspace) fitEvent(hits []pmt.Hit, win Window) (Reconstruction, error) {
	fail := func(st fit.Status, err error) (Reconstruction, error) {
		return Reconstruction{
			Electron: Result{Hypothesis: Electron, Status: st, Reason: err.Error()},
			Muon:     Result{Hypothesis: Muon, Status: st, Reason: err.Error()},
		}, err
	}
	var rec Reconstruction
	used, dropped, st, err := w.setEvent(hits, win)
	if err != nil {
		return fail(st, err)
	}
	// The ring is the brightest burst of light: a muon's decay electron
	// microseconds later, or a second interaction, in the same readout
	// must not take the point seed.
	tc := w.brightestBurst(w.f.crossingTime())
	dropped += w.restrict(tc-promptBefore, tc+w.f.promptAfter())
	v, t0 := w.pointSeed()
	dropped += w.restrict(t0-promptBefore, t0+w.f.promptAfter())
	// Seen from the point seed, the ring's direct light arrives within
	// the track's length in time and its scattered light a few delay
	// constants later; a muon's decay electron a hundred nanoseconds on
	// stands apart.
	dropped += w.restrictLate(v, t0, w.f.lateResidual())
	used = len(w.hits)
	if used == 0 {
		return fail(fit.NoHits, errors.New("ring: no hit left in the prompt window"))
	}
	rec.HitsUsed, rec.HitsDropped = used, dropped
	u := w.directionSeed(v)
	rec.Seed = fit.Track{Vertex: v, Time: t0, Dir: u, Ekin: w.f.energyLo[Electron]}
	for _, h := range []Hypothesis{Electron, Muon} {
		seed := w.trackSeed(h, v, t0, u)
		if h == Electron {
			rec.Seed.Ekin = seed.Ekin
		}
		res := w.fitLoaded(h, seed)
		if h == Electron {
			rec.Electron = res
		} else {
			rec.Muon = res
		}
	}
	rec.LLR = rec.Muon.NLL - rec.Electron.NLL
	if !finite(rec.LLR) {
		rec.LLR = 0
	}
	// When the ratio is not decisive, or the two fits disagree on the
	// track by far more than their resolutions, the losing hypothesis may
	// sit in a local minimum of its own seed: refit it from the winner's
	// track and keep the better of its two fits.
	if math.Abs(rec.LLR) < crossSeedLLR || rec.Electron.Status != fit.Converged || rec.Muon.Status != fit.Converged || disagree(&rec.Electron.Track, &rec.Muon.Track) {
		from, to := &rec.Electron, &rec.Muon
		if rec.LLR < 0 || rec.Electron.Status != fit.Converged {
			from, to = &rec.Muon, &rec.Electron
		}
		if from.Status == fit.Converged {
			h := to.Hypothesis
			seed := w.trackSeed(h, from.Track.Vertex, from.Track.Time, from.Track.Dir)
			if alt := w.fitLoaded(h, seed); alt.Status == fit.Converged && (to.Status != fit.Converged || alt.NLL < to.NLL) {
				alt.Evaluations += to.Evaluations
				*to = alt
			}
		}
		rec.LLR = rec.Muon.NLL - rec.Electron.NLL
		if !finite(rec.LLR) {
			rec.LLR = 0
		}
	}
	w.addUncertainties(PIDCut{}.Best(&rec))
	return rec, nil
}

// disagree reports whether two fitted tracks of one event differ in
// direction by more than crossSeedAngle: one of the fits is lost (a faint
// ring in a large tank, a poor seed). Their vertices are no guide: the
// electron hypothesis starts the light of a shower a metre or two after
// where the muon hypothesis starts a track.
func disagree(a, b *fit.Track) bool {
	return a.Dir.Dot(b.Dir) < math.Cos(crossSeedAngle)
}

// crossSeedAngle (rad) is several times the direction resolution of
// either fit at a few hundred MeV (the package's regression and
// large-tank studies: 1-4 degrees), while the two fits of one event agree
// to about a degree.
const crossSeedAngle = 0.1

// crossSeedLLR is the log-likelihood ratio below which the losing
// hypothesis is refitted from the winner's track (several times the
// spread of the ratio between fits of one event from different seeds).
const crossSeedLLR = 200

// FitFrom fits one hypothesis from a given seed track, for callers with
// their own seed. Hits are selected as by Fit, with the prompt window
// about the seed time. A seed or event the fit cannot use gives an error,
// with the reason and status in the Result.
func (f *Fitter) FitFrom(hits []pmt.Hit, win Window, h Hypothesis, seed fit.Track) (Result, error) {
	w := f.workspace()
	defer f.pool.Put(w)
	return w.fitFrom(hits, win, h, seed)
}

// fitFrom is FitFrom on the workspace, which keeps the selected hits
// loaded.
func (w *workspace) fitFrom(hits []pmt.Hit, win Window, h Hypothesis, seed fit.Track) (Result, error) {
	f := w.f
	fail := func(st fit.Status, err error) (Result, error) {
		return Result{Hypothesis: h, Status: st, Reason: err.Error()}, err
	}
	if err := f.checkTrack(h, seed); err != nil {
		return fail(fit.BadInput, err)
	}
	if _, _, st, err := w.setEvent(hits, win); err != nil {
		return fail(st, err)
	}
	w.restrict(seed.Time-promptBefore, seed.Time+f.promptAfter())
	if len(w.hits) == 0 {
		return fail(fit.NoHits, errors.New("ring: no hit in the prompt window of the seed"))
	}
	seed.Dir = seed.Dir.Normalize()
	res := w.fitLoaded(h, seed)
	w.addUncertainties(&res)
	return res, nil
}

// crossingTime is the time light takes along the tank's diagonal: the
// spread of the direct-light arrival times of one event.
func (f *Fitter) crossingTime() float64 {
	return math.Hypot(2*f.tankRadius, 2*f.tankHalfZ) * f.resp.invGroup
}

// brightestBurst returns the start of the time window of length width
// that holds the most hit charge.
func (w *workspace) brightestBurst(width float64) float64 {
	type tq struct{ t, q float64 }
	hs := make([]tq, 0, len(w.hits))
	for _, i := range w.hits {
		hs = append(hs, tq{w.hitT[i], w.hitQ[i]})
	}
	slices.SortFunc(hs, func(a, b tq) int { return cmp.Compare(a.t, b.t) })
	best, bt := -1.0, hs[0].t
	var sum float64
	j := 0
	for k := range hs {
		sum += hs[k].q
		for hs[k].t-hs[j].t > width {
			sum -= hs[j].q
			j++
		}
		if sum > best {
			best, bt = sum, hs[j].t
		}
	}
	return bt
}

// lateResidual (ns) is the latest time residual, about the point seed's
// vertex and time, of a hit kept for the track fit: the light of the
// longest track of the tables emitted after the seed point, plus three
// delay constants of the indirect light (which leaves exp(-3), 5%, of
// that light out).
func (f *Fitter) lateResidual() float64 {
	return f.energyHi[Muon]/muonLossPerCm/phys.SpeedOfLight + 3*f.lateTau
}

// muonLossPerCm (MeV/cm) converts the top muon energy of the tables into
// a track length: minimum-ionizing loss in water, about 2 MeV/cm (PDG
// Review, Passage of particles through matter; rounded).
const muonLossPerCm = 2.0

// restrictLate drops the hits whose time residual about a point source at
// v, t0 (t - t0 - |x - v|/v_g) exceeds late, and returns their number. A
// late burst is dimmer than the ring (brightestBurst chose the ring), so
// when the hits to drop are half the hits or hold half the charge, the
// point seed is what is wrong, and nothing is dropped.
func (w *workspace) restrictLate(v r3.Vector, t0, late float64) int {
	isLate := func(i int) bool { return w.arrival(i, v)-t0 > late }
	var all, lateQ float64
	nLate := 0
	for _, i := range w.hits {
		all += w.hitQ[i]
		if isLate(i) {
			lateQ += w.hitQ[i]
			nLate++
		}
	}
	if !(lateQ < 0.5*all) || 2*nLate >= len(w.hits) {
		return 0
	}
	return w.dropHits(isLate)
}

// promptAfter is the longest a ring's light can take after the vertex
// time: a track and its light crossing the tank twice over, plus margin.
func (f *Fitter) promptAfter() float64 {
	return 2*math.Hypot(2*f.tankRadius, 2*f.tankHalfZ)*f.resp.invGroup + 100
}

// trackSeed turns the point seed into a track seed for hypothesis h:
// the energy that matches the total charge and the start point moved back
// along the direction to the best of a few candidates.
func (w *workspace) trackSeed(h Hypothesis, v r3.Vector, t0 float64, u r3.Vector) fit.Track {
	f := w.f
	var q float64
	for _, i := range w.hits {
		q += w.hitQ[i]
	}
	q /= f.charge.m1
	lo, hi := f.EkinRange(h)
	best := fit.Track{Vertex: v, Time: t0, Dir: u, Ekin: math.Sqrt(lo * hi)}
	bestNLL := math.Inf(1)
	// The point fit lands where most light comes from: near the shower
	// maximum of an electron, mid-track for a muon. Try start points
	// behind it, re-aiming the ring at each; the energy that matches the
	// charge hardly depends on the start, so after the first candidate
	// one update from the last energy suffices.
	iters := 3
	for _, back := range []float64{0, 0.33, 0.67, 1.0} {
		tr := fit.Track{Vertex: v, Time: t0, Dir: u, Ekin: best.Ekin}
		for it := 0; it < iters; it++ {
			sh := back * w.lightLength(h, tr.Ekin)
			tr.Vertex = v.Sub(u.Mul(sh))
			if f.det.DistanceToWall(tr.Vertex) < 1 {
				tr.Vertex = v
				sh = 0
			}
			tr.Time = t0 - sh/phys.SpeedOfLight
			if it == 0 {
				tr.Dir = w.refineDirection(tr.Vertex, u)
			}
			w.predict(h, tr)
			var p float64
			for i := range w.muD {
				if !f.dead[i] {
					p += w.muD[i] + w.muI[i]
				}
			}
			if !(p > 0) {
				break
			}
			tr.Ekin = min(max(tr.Ekin*q/p, lo), hi)
		}
		iters = 1
		if n := w.nll(h, tr); n < bestNLL {
			best, bestNLL = tr, n
		}
	}
	return best
}

func (w *workspace) lightLength(h Hypothesis, e float64) float64 {
	w.f.species(h).interpolate(e, &w.prof)
	return w.prof.light90
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
	res.NLL = fx
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
		if ok = ch.Factorize(&curv.hess); ok {
			break
		}
	}
	res.Evaluations = w.evals
	if !ok {
		res.ErrorsNote = "Hessian not positive definite"
		return
	}
	var cov mat.SymDense
	if err := ch.InverseTo(&cov); err != nil {
		res.ErrorsNote = fmt.Sprintf("Hessian inversion: %v", err)
		return
	}
	res.Cov = fr.physCov(&cov)
	res.Errors = errorsFrom(&res.Cov, h, best.Ekin)
	res.CramerRao = w.cramerRao(h, best, curv)
	res.Evaluations = w.evals
	for _, v := range []float64{res.Errors.Vertex.X, res.Errors.Vertex.Y, res.Errors.Vertex.Z, res.Errors.Time,
		res.Errors.Angle[0], res.Errors.Angle[1], res.Errors.Ekin,
		res.CramerRao.Angle[0], res.CramerRao.Angle[1], res.CramerRao.Ekin} {
		if !finite(v) {
			res.ErrorsNote = "uncertainties not finite"
			res.Errors, res.CramerRao, res.Cov = fit.Errors{}, fit.Errors{}, [NumParams][NumParams]float64{}
			return
		}
	}
	res.ErrorsValid = true
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
