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
	// likelihood at its maximum, plus the error of moving that point back
	// to the track start (the shift's calibrated spread along the track,
	// Shift times the angle errors across it); the two direction angles
	// (along the axes of phys.Basis of Track.Dir) from the curvature of
	// the direction likelihood in quadrature with the calibrated
	// event-to-event spread of the direction (multiple scattering, vertex
	// error: CalibrationPoint.DirSpread); the energy from the calibrated
	// spread of the effective hit count at Track.Ekin over the slope of
	// the calibration.
	// Errors.Momentum is zero (the fitter reports no momentum).
	Errors fit.Errors
	// ErrorsValid says that every entry of Errors comes from a positive
	// definite curvature. When the direction likelihood's curvature is
	// not (too few prompt hits, a flat maximum) the angle errors are pi,
	// no information, ErrorsValid is false and Reason says so; when the
	// time likelihood's is not, Status is fit.NotConverged.
	ErrorsValid bool
	// Cov is the covariance of (x, y, z, t) in cm and ns of the maximum
	// of the time likelihood (the light point, before the shift), the
	// inverse of its curvature.
	Cov [4][4]float64
	// AngleStat holds the statistical errors (rad) of the two angles, from
	// the curvature of the direction likelihood alone; Errors.Angle adds
	// the calibrated event-to-event spread (CalibrationPoint.DirSpread).
	AngleStat [2]float64

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

	// EkinOutside says that Track.Ekin lies outside the energy
	// calibration (Fitter.EkinRange): the energy is extrapolated linearly,
	// and its error adds the distance to the range to the end point's
	// spread scaled as sqrt(Ekin); Reason says so.
	EkinOutside bool

	// DirGoodness is the standardized direction log-likelihood, (logL -
	// N E[log g]) / sqrt(N Var[log g]) under the direction density g of
	// the N prompt hits: strongly positive when the hits sit at a narrower
	// cone than the Cherenkov angle's, as seen from a vertex behind the
	// true one on the ring axis.
	DirGoodness float64

	// Ambiguity is the log-likelihood margin of the maximum over the best
	// point along the ring axis at least 2 m away (time profiled): small
	// when the likelihood's valley along the axis has a second maximum
	// nearly as good, where a fit may have landed on the wrong side.
	// Suspect is Ambiguity < 4, a vertex uncertainty (the length of
	// Errors.Vertex) beyond 1 m, or Ambiguity < 12 with DirGoodness > 2
	// (the hits look like a cone narrower than Cherenkov's, as from a
	// vertex behind the truth on the axis): the fit may be far (metres)
	// from the truth; users wanting clean samples drop suspect fits.
	Ambiguity float64
	Suspect   bool

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
