// Package pmt models one photosensor class of a water-Cherenkov detector:
// the probability that a photon makes a photoelectron (quantum efficiency
// against wavelength, collection efficiency, angular acceptance), the
// transit-time spread, the single-photoelectron charge spectrum, dark
// pulses, the integration gate and threshold that turn photoelectrons into
// hits, and a hit-multiplicity trigger with its readout window.
//
// Units: cm, ns, Hz; charge in pe (mean single-photoelectron peak charge);
// wavelength in nm.
//
// The Hit type lives here so that reconstruction needs only geom and pmt;
// pmt imports neither the simulator nor geom.
//
// A simulator typically emits only MaxEfficiency of the Cherenkov photons,
// keeps each photon reaching a cathode with probability
// Efficiency/MaxEfficiency (or SpectralEfficiency/MaxEfficiency at emission
// and AngularAcceptance at the wall), turns the survivors into
// Photoelectrons, adds dark pulses with AddDark over the readout span,
// digitizes with a Digitizer and applies a Trigger.
//
// The presets Large, Medium and Small carry typical values for ~50 cm,
// ~20 cm and ~8 cm tubes; they are common practice, not the data sheet of
// any device.
package pmt
