package fit

// Status says how a fit ended. Both fitters use it with the same
// meanings.
type Status int

const (
	// NotFitted is the zero value: no fit was made (a zero Result). No
	// fitter returns it, so a Result that was never filled in is never
	// taken for a converged fit.
	NotFitted Status = iota
	// Converged: the minimizer met its convergence criterion inside the
	// allowed region, and every reported value is finite.
	Converged
	// NoHits: the event has no usable hits.
	NoHits
	// TooFewHits: fewer usable hits than the fit has parameters.
	TooFewHits
	// TooFewSensors: the hits lie on too few distinct sensors to fix the
	// vertex.
	TooFewSensors
	// NotConverged: the minimizer stopped without meeting its criterion
	// (iteration or time limit, failed line search, non-finite
	// likelihood).
	NotConverged
	// AtLimit: the minimum lies on the edge of the allowed region (the
	// energy range of the tables, the tank wall). The likelihood there is
	// finite and may be compared with other hypotheses; the parameters
	// are bounds, not measurements.
	AtLimit
	// NoEvent: the hits are consistent with dark noise alone.
	NoEvent
	// BadInput: a hit is malformed (see CheckHits); Fit also returns an
	// error.
	BadInput
)

var statusNames = [...]string{
	NotFitted:     "not fitted",
	Converged:     "converged",
	NoHits:        "no hits",
	TooFewHits:    "too few hits",
	TooFewSensors: "too few sensors",
	NotConverged:  "not converged",
	AtLimit:       "at a limit",
	NoEvent:       "no event",
	BadInput:      "bad input",
}

// String returns the status's name.
func (s Status) String() string {
	if s >= 0 && int(s) < len(statusNames) {
		return statusNames[s]
	}
	return "unknown status"
}
