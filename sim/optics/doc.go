// Package optics describes light in the water of a tank: the refractive
// index and group index of liquid water vs wavelength and temperature
// (IAPWS 1997 formulation), the absorption of pure water (Pope and Fry
// 1997, Smith and Baker 1981 in the UV), Rayleigh scattering with the
// depolarization-corrected phase function and an optional forward-peaked
// Henyey-Greenstein component, and the reflection off the tank liner.
//
// Water builds uniform tables (at most 1 nm apart) over its band once, so
// that every per-photon lookup is O(1) and allocation-free. Both the
// simulator and the reconstruction use the same *Water; the package
// imports nothing of the simulator but sim/phys.
//
// Units: wavelengths in nm (vacuum), lengths in cm, times in ns,
// velocities in cm/ns, temperatures in Celsius. Refractive indices are
// relative to vacuum.
package optics
