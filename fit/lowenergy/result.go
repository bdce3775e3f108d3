package lowenergy

import (
	"github.com/golang/geo/r3"
)

// Status says how a fit ended.
type Status int

const (
	// Converged: the vertex optimizer converged and every reported value
	// is finite.
	Converged Status = iota
	// NoHits: the event has no hits.
	NoHits
	// TooFewHits: fewer hits in the selection window than the four
	// vertex parameters need (at least five).
	TooFewHits
	// TooFewSensors: the selected hits are on fewer than five distinct
	// sensors (for example all on one sensor), so the vertex is not
	// determined.
	TooFewSensors
	// NotConverged: the optimizer stopped without meeting its
	// convergence criterion (iteration limit or failed line search).
	NotConverged
	// BadCurvature: the likelihood's curvature at the maximum is not
	// positive definite, so no uncertainty can be given.
	BadCurvature
	// BadInput: a hit has a sensor index outside the detector or a
	// non-finite time or charge; Fit also returns an error.
	BadInput
)

func (s Status) String() string {
	switch s {
	case Converged:
		return "converged"
	case NoHits:
		return "no hits"
	case TooFewHits:
		return "too few hits"
	case TooFewSensors:
		return "too few sensors"
	case NotConverged:
		return "not converged"
	case BadCurvature:
		return "curvature not positive definite"
	case BadInput:
		return "bad input"
	}
	return "unknown status"
}

// Result is the outcome of a fit. Units: cm, ns, MeV, radians.
type Result struct {
	// Vertex and Time are the fitted light-emission point and time.
	Vertex r3.Vector
	Time   float64
	// VertexErr holds the 1-sigma uncertainties of the vertex coordinates
	// and TimeErr that of the time, from the inverse of the curvature
	// (observed information) of the time likelihood at its maximum.
	VertexErr r3.Vector
	TimeErr   float64
	// Cov is the covariance of (x, y, z, t) in cm and ns.
	Cov [4][4]float64

	// Dir is the fitted track direction (unit) and DirErr the 1-sigma
	// angular uncertainty per transverse axis (radians) from the curvature
	// of the direction likelihood.
	Dir    r3.Vector
	DirErr float64

	// Energy is the kinetic energy from the calibrated effective hit count
	// and EnergyErr its 1-sigma uncertainty (the calibrated spread of the
	// effective hit count at that energy over the slope of the
	// calibration).
	Energy, EnergyErr float64
	// Neff is the effective hit count the energy is calibrated from.
	Neff float64
	// Shift (cm) is how far Vertex was moved back along Dir from the
	// maximum of the time likelihood (the light-weighted centre of the
	// track) to the track start, from the calibration at Energy; Time was
	// moved back by Shift/c with it. Vertex + Shift*Dir is the light point.
	Shift float64

	// LogLikelihood is the time log-likelihood at the maximum and
	// DirLogLikelihood the direction log-likelihood.
	LogLikelihood, DirLogLikelihood float64
	// Goodness is the standardized time log-likelihood,
	// (logL - N E[log f]) / sqrt(N Var[log f]) under the fitted density:
	// near 0 for hits that follow the model, strongly negative for hits
	// that do not.
	Goodness float64

	// VertexCRB holds the Cramer-Rao bounds of the vertex coordinates
	// (1-sigma, cm): the square roots of the diagonal of the inverse Fisher
	// information of the time likelihood for this hit set at the fitted
	// vertex.
	VertexCRB r3.Vector

	// Hits is the number of hits of the event, Selected those in the
	// selection window that the vertex fit used, Prompt those in the
	// prompt residual window that the direction and energy use.
	Hits, Selected, Prompt int
	// DarkFraction is the expected fraction of dark hits among the selected.
	DarkFraction float64
	// Evaluations counts likelihood evaluations.
	Evaluations int

	// Converged is true when Status is Converged.
	Converged bool
	Status    Status
	// Reason explains a status other than Converged.
	Reason string
}
