package lowenergy

import (
	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
)

// Result is the low-energy fit of one event. Units: cm, ns, MeV, radians.
type Result struct {
	// Track is the fitted track: Vertex and Time its start (the maximum
	// of the time likelihood moved back by Shift), Dir its direction and
	// Ekin the kinetic energy from the calibrated effective hit count.
	Track fit.Track
	// Status says how the fit ended (fit.Converged: the vertex optimizer
	// converged, the curvature of the time likelihood at its maximum is
	// positive definite and every reported value is finite). Reason
	// explains a Status other than fit.Converged, or why ErrorsValid is
	// false.
	Status fit.Status
	Reason string

	// Errors are the 1-sigma uncertainties of Track: vertex and time from
	// the inverse of the curvature (observed information) of the time
	// likelihood at its maximum; the two direction angles (along the axes
	// of phys.Basis of Track.Dir) from the curvature of the direction
	// likelihood; the energy from the calibrated spread of the effective
	// hit count at Track.Ekin over the slope of the calibration.
	// Errors.Momentum is zero (the fitter reports no momentum).
	Errors fit.Errors
	// ErrorsValid says that every entry of Errors comes from a positive
	// definite curvature. When the direction likelihood's curvature is
	// not (too few prompt hits, a flat maximum) the angle errors are pi,
	// no information, ErrorsValid is false and Reason says so; when the
	// time likelihood's is not, Status is fit.NotConverged.
	ErrorsValid bool
	// Cov is the covariance of (x, y, z, t) in cm and ns.
	Cov [4][4]float64

	// Neff is the effective hit count the energy is calibrated from.
	Neff float64
	// Shift (cm) is how far the vertex was moved back along Dir from the
	// maximum of the time likelihood (the light-weighted centre of the
	// track) to the track start, from the calibration at Ekin; the time
	// was moved back by Shift/c with it. Track.Vertex + Shift*Track.Dir
	// is the light point.
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

	// Hits is the number of hits of the event, DeadHits those on dead
	// sensors (Setup.Dead), which the fit leaves out, Selected those of
	// live sensors in the selection window that the vertex fit used,
	// Prompt those in the prompt residual window that the direction and
	// energy use.
	Hits, DeadHits, Selected, Prompt int
	// DarkFraction is the expected fraction of dark hits among the selected.
	DarkFraction float64
	// Evaluations counts likelihood evaluations.
	Evaluations int
}
