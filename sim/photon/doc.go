// Package photon carries Cherenkov photons from their emission point
// through the water to the sensor surface and turns the ones a sensor
// detects into photoelectrons.
//
// Each photon's life is a loop of free flights. The flight length to the
// next interaction is drawn from the total attenuation coefficient
// 1/L_abs + 1/L_scat at its wavelength; if the wall comes first the photon
// reaches it, otherwise it is absorbed or scattered (Rayleigh or the
// Mie-like component, in proportion to their coefficients, with their phase
// functions) and flies on. Time advances at the group velocity c/n_g of its
// wavelength. On the wall, the O(1) sensor lookup of geom.Detector decides
// whether the photon met a photocathode; there the detection probability
// QE x collection x angular acceptance, divided by what the emitter
// already applied, is its survival probability. Photons meeting
// the liner between sensors are reflected with the liner's reflectivity or
// absorbed. Sensor glass reflection is not modelled: photons that meet a
// photocathode and are not converted are absorbed there.
//
// Pre-scaling: the Cherenkov emitter generates only a fraction P of the
// photons (P = the sensors' maximum of QE x collection efficiency). A photon
// reaching a photocathode is then kept with probability
// Efficiency(lambda, cos)/P, so the photoelectron counts have the same
// distribution as tracing every photon with survival Efficiency. P = 1
// traces every photon.
//
// Thinning (Config.Thinned): the emitter goes further and keeps each
// photon with probability SpectralEfficiency(lambda)/P at emission
// (cherenkov.NewThinningEmitter); the photocathode then applies only the
// angular acceptance. The photoelectrons have the same distribution again
// (the thinning of a Poisson process by a probability that depends on the
// photon's own wavelength), and no photon whose wavelength the cathode
// would mostly refuse is followed through the water.
//
// A *Tracer is immutable and safe for concurrent use; each goroutine passes
// its own random stream.
package photon
