// Package material describes the medium particles travel through: liquid
// water, with the constants charged-particle and photon transport need
// (electron density, mean excitation energy, Sternheimer density-effect
// parameters, radiation length).
package material
