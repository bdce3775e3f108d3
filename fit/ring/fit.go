package ring

import (
	"math"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/pmt"
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
	// other status, or why ErrorsValid is false for a converged fit whose
	// uncertainties were wanted.
	Status fit.Status
	Reason string
	// ErrorsValid says that Errors, Cov and CramerRao hold the
	// uncertainties; when they were wanted but could not be had (the
	// numerical Hessian not positive definite) Reason says why.
	ErrorsValid bool
	// Errors are the square roots of the diagonal of Cov, the two angles
	// along the axes of phys.Basis of Track.Dir; Cov is the covariance
	// matrix in the parameter order of NumParams: the measurement part
	// (the sandwich of the likelihood's Hessian and the sensors' scores)
	// plus the intrinsic fluctuation of the emission as a whole (see the
	// package documentation, Uncertainties). Fit computes them for the
	// hypothesis with the better likelihood only (FitFrom for its one
	// hypothesis); they are zero for the other, when
	// Config.SkipUncertainties is set or when the fit failed.
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
// The hits pass through the fit once: hit selection with the point seed
// (selectEvent, hits.go), the ring direction and the track seeds
// (seed.go), the fit of each hypothesis (fitLoaded, trackfit.go) and the
// uncertainties of the better one (uncertainty.go).
func (w *workspace) fitEvent(hits []pmt.Hit, win Window) (Reconstruction, error) {
	fail := func(st fit.Status, err error) (Reconstruction, error) {
		return Reconstruction{
			Electron: Result{Hypothesis: Electron, Status: st, Reason: err.Error()},
			Muon:     Result{Hypothesis: Muon, Status: st, Reason: err.Error()},
		}, err
	}
	var rec Reconstruction
	v, t0, used, dropped, st, err := w.selectEvent(hits, win)
	if err != nil {
		return fail(st, err)
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
		if rec.LLR < 0 || !rec.Electron.Usable() {
			from, to = &rec.Muon, &rec.Electron
		}
		if from.Usable() {
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
	if st, err := w.selectAround(hits, win, seed.Time); err != nil {
		return fail(st, err)
	}
	seed.Dir = seed.Dir.Normalize()
	res := w.fitLoaded(h, seed)
	w.addUncertainties(&res)
	return res, nil
}

// NLLParts returns the negative log likelihood of hypothesis h with track
// tr for an event, split into the charge terms of every live sensor and
// the time terms of the hit ones, on the hits Fit would use with the
// prompt window about tr.Time: for likelihood scans that find which part
// of the model pulls a fit (examples/ringstudy -scan).
func (f *Fitter) NLLParts(hits []pmt.Hit, win Window, h Hypothesis, tr fit.Track) (charge, time float64, err error) {
	if err := f.checkTrack(h, tr); err != nil {
		return 0, 0, err
	}
	w := f.workspace()
	defer f.pool.Put(w)
	if _, err := w.selectAround(hits, win, tr.Time); err != nil {
		return 0, 0, err
	}
	tr.Dir = tr.Dir.Normalize()
	all := w.nll(h, tr)
	time = w.timeShiftNLL(0)
	return all - time, time, nil
}
