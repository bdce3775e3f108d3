package fit

import "github.com/golang/geo/r3"

// Errors are one-standard-deviation uncertainties of a fitted track.
type Errors struct {
	Vertex r3.Vector // per coordinate, cm
	Time   float64   // ns
	// Angle holds the uncertainties (rad) of the two direction angles
	// along the axes of phys.Basis of the fitted direction.
	Angle [2]float64
	Ekin  float64 // MeV
	// Momentum is the uncertainty of the momentum magnitude (MeV/c);
	// zero when the fitter does not report a momentum.
	Momentum float64
}
