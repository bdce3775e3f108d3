// Package scatter implements multiple Coulomb scattering of charged
// particles over a step: the Highland width of the projected angle and the
// correlated lateral displacement (PDG Review, "Passage of particles
// through matter", section on multiple scattering through small angles).
package scatter
