package ring

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/stat"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/sim/phys"
)

// PIDCut separates e-like from mu-like events by the log-likelihood ratio
// as a function of the fitted momentum: an event is e-like when LLR >
// Offset + Slope*p, p the mean of the two fitted momenta in GeV/c.
// The zero PIDCut compares the likelihoods directly.
type PIDCut struct {
	Offset, Slope float64
}

// Usable reports whether the likelihood of r can take part in the
// identity: the fit converged, or it stopped at a limit (fit.AtLimit: the
// minimum on the tank wall or at an end of the table energy range, Reason
// says which) with a finite likelihood. A muon that stops beyond the top
// of the tables still has by far the better likelihood of the two
// hypotheses, and calling it an electron because its own fit is at a
// limit would be wrong.
func (r *Result) Usable() bool {
	return (r.Status == fit.Converged || r.Status == fit.AtLimit) && finite(r.NLL)
}

// PDG returns 11 for an e-like event, 13 for a mu-like one and 0 when
// neither fit is usable (Result.Usable: converged, or stopped at a limit
// with a finite likelihood). When only one is usable it is chosen; when
// both are, the likelihood ratio decides, whether or not one stopped at a
// limit (the chosen Result's Status and Reason say so).
func (c PIDCut) PDG(r *Reconstruction) int {
	switch {
	case !r.Electron.Usable() && !r.Muon.Usable():
		return 0
	case !r.Muon.Usable():
		return phys.Electron
	case !r.Electron.Usable():
		return phys.MuonMinus
	}
	p := 0.5 * (r.Electron.Momentum + r.Muon.Momentum) / 1000
	if r.LLR > c.Offset+c.Slope*p {
		return phys.Electron
	}
	return phys.MuonMinus
}

// Best returns the result of the hypothesis c picks (the electron when
// neither is usable). Its Status may be fit.AtLimit, with the reason in
// Result.Reason.
func (c PIDCut) Best(r *Reconstruction) *Result {
	if c.PDG(r) == phys.MuonMinus {
		return &r.Muon
	}
	return &r.Electron
}

// CalibratePID returns the PIDCut line that separates samples of known
// electrons and muons, fitted by both hypotheses: in momentum bins of
// width binWidth (MeV/c; the PIDCut momentum is the mean of the two fitted
// momenta), the midpoint between the electrons' 1% quantile of LLR and
// the muons' 99% quantile, and the least-squares line through the
// midpoints. Events where either fit is not usable (Result.Usable) are
// left out. At least two bins must hold both species.
//
// The 1% and 99% quantiles make the line robust against a stray event
// while it still keeps the tails of both samples on their side; calibrate
// on one half of a sample and count the mis-identification on the other.
func CalibratePID(electrons, muons []Reconstruction, binWidth float64) (PIDCut, error) {
	if !(binWidth > 0) || math.IsInf(binWidth, 0) {
		return PIDCut{}, fmt.Errorf("ring: CalibratePID binWidth = %g must be positive and finite (MeV/c)", binWidth)
	}
	type bin struct{ e, mu []float64 }
	bins := map[int]*bin{}
	add := func(r *Reconstruction, electron bool) {
		if !r.Electron.Usable() || !r.Muon.Usable() || !finite(r.LLR) {
			return
		}
		p := 0.5 * (r.Electron.Momentum + r.Muon.Momentum)
		k := int(math.Floor(p / binWidth))
		b := bins[k]
		if b == nil {
			b = &bin{}
			bins[k] = b
		}
		if electron {
			b.e = append(b.e, r.LLR)
		} else {
			b.mu = append(b.mu, r.LLR)
		}
	}
	for i := range electrons {
		add(&electrons[i], true)
	}
	for i := range muons {
		add(&muons[i], false)
	}
	var xs, ys []float64
	for k, b := range bins {
		if len(b.e) == 0 || len(b.mu) == 0 {
			continue
		}
		sort.Float64s(b.e)
		sort.Float64s(b.mu)
		lo := stat.Quantile(0.01, stat.Empirical, b.e, nil)
		hi := stat.Quantile(0.99, stat.Empirical, b.mu, nil)
		xs = append(xs, (float64(k)+0.5)*binWidth/1000)
		ys = append(ys, 0.5*(lo+hi))
	}
	if len(xs) < 2 {
		return PIDCut{}, errors.New("ring: CalibratePID needs at least two momentum bins holding both electrons and muons")
	}
	offset, slope := stat.LinearRegression(xs, ys, nil, false)
	return PIDCut{Offset: offset, Slope: slope}, nil
}
