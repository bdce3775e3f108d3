// Package cherenkov emits Cherenkov light from the straight charged-track
// segments (phys.Segment) that transport reports: the Frank-Tamm yield with
// the dispersion of the water's optics (an optics.Water, the same the
// photon tracing uses) over a wavelength band, the emission spectrum at
// the local speed, and photons on the cone cos theta = 1/(n beta) about
// the step direction.
//
// An Emitter can pre-scale the light by the sensors' largest detection
// efficiency, so that photons no sensor could ever detect are never made;
// the photon transport then applies the remaining efficiency ratio as a
// survival probability. A thinning emitter (NewThinningEmitter) also keeps
// each photon with a probability set by its wavelength (the sensors'
// efficiency there over the prescale), which leaves a Poisson process with
// the spectrum multiplied by that probability.
//
// Units: lengths cm, times ns, energies MeV, wavelengths nm (vacuum).
package cherenkov
