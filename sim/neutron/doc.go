// Package neutron follows neutrons (2112) in water, pure or loaded with
// gadolinium, from their start to their capture.
//
// # Physics
//
// Cross-sections (see xsec.go for the values and their sources): n-p
// elastic scattering from the effective-range formula below 20 MeV (20.4 b
// thermal, 4.26 b at 1 MeV) and a table above; n-16O elastic 3.888 b below
// 0.3 MeV (free-atom value) and a smoothed curve above, its
// resonances left out; 16O(n, n') to the 6.13 MeV state from 6.5 to 20 MeV
// with its gamma; above 20 MeV the oxygen non-elastic cross-section and
// knock-out model of sim/hadron (one nucleon out, de-excitation gamma);
// capture following 1/v from the thermal values: H 0.3326 b (2.2246 MeV
// gamma), 16O 0.19 mb (4.14 MeV, one gamma), natural Gd 48 800 b.
//
// Scattering is isotropic in the centre of mass: exact for n-p below ~10
// MeV (S wave), a simplification for oxygen above ~1 MeV. Kinematics are
// non-relativistic below 20 MeV, relativistic above (n-p only).
//
// Thermal model: a free gas. Below Config.ThermalCut (4 eV) the struck
// nucleus moves with a Maxwellian velocity at the water temperature,
// drawn with the relative-speed weighting, and the collision rate carries
// the free-gas factor <|v - V|>/v. Known error: hydrogen in water is bound
// in the molecule; at thermal energies its scattering cross-section is
// about twice the free atom's (~45 b against 20.4 b, the molecular
// rotations and vibrations) and the energy exchange differs, so the model
// overestimates the thermal diffusion length (2.8 cm measured, from
// memory) by roughly 40% and the capture-point spread with it. The capture
// time is unaffected: with 1/v capture the capture rate Sigma_a v is the
// same at every speed, so the mean capture time is 1/(Sigma_a(v0) v0)
// whatever the moderation.
//
// Gadolinium cascade: the 157Gd (81% of captures) or 155Gd capture energy,
// 7.94 or 8.54 MeV, split at uniformly placed points into 3, 4 or 5
// gammas. This is a simplification: it keeps the total energy and a mean
// multiplicity near the measured ~4, not the measured spectrum.
//
// Recoil protons above 1 MeV and all gammas are reported to the sink as
// secondaries; smaller recoils are deposits.
//
// A *Physics is immutable and safe for concurrent use.
package neutron
