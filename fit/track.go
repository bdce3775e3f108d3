package fit

import "github.com/golang/geo/r3"

// Track is a fitted (or true) single track: start point (cm), start time
// (ns), unit direction and kinetic energy (MeV).
type Track struct {
	Vertex r3.Vector
	Time   float64
	Dir    r3.Vector
	Ekin   float64
}
