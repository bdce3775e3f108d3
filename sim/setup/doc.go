// Package setup holds the one description of a detector that the
// simulator and both fitters are built from: the tank and its sensors
// (geom.Detector), the sensors' response (pmt.Model), the water's optics
// (optics.Water), the liner between the sensors, the sensors out of
// service and the trigger with its readout window.
//
// The simulator (sim.New), the low-energy fitter (fit/lowenergy.New) and
// the ring fitter (fit/ring.New) all take a Setup and apply the same
// defaults, in one place: Setup.Check.
//
// The package imports the detector description (geom, pmt) and the water
// optics (sim/optics) only, so the reconstruction may import it without
// importing the simulator.
//
// A Setup is a value; the detector and water it points to are immutable
// after construction, so a Setup may be shared by any number of
// goroutines.
package setup
