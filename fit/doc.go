// Package fit holds what conelight's reconstruction shares: the track a
// fitter reports (fit.Track), and the vocabulary its fitters use alike.
// The fitters themselves live in the sub-packages:
//
//   - fit/lowenergy: events of a few to about 100 MeV, fitted as a point
//     source of light (vertex and time from the hit-time residuals,
//     direction from the Cherenkov-angle distribution, energy from a
//     corrected hit count);
//   - fit/ring: single-ring events of about 100 MeV to several GeV under
//     the electron and muon hypotheses (predicted charge and time at every
//     sensor from tabulated emission profiles).
//
// fit/resolution summarizes fitted samples against the truth and
// fit/display draws events and study results.
//
// Like every package under fit, this one imports the detector
// description (geom, pmt) and the shared physics (sim/phys, sim/optics)
// only, never the simulator, so that it serves real data.
package fit
