// Package sim is the event simulator of conelight: given a detector
// description (sim/setup.Setup, the one the fitters take too: the tank and
// its sensors, the sensor model, the water optics, the liner, the dead
// sensors and the trigger) and a run seed, it turns the primaries of each
// event into digitized hits with their Monte Carlo truth (sim/event).
//
// For each event, in order:
//
//  1. the generator draws the primaries from the event's random stream
//     EventStream(Seed, number);
//  2. sim/transport follows them and all their descendants (sim/em for
//     electrons, positrons and photons, sim/muon for muons, sim/hadron
//     for charged and neutral pions and protons, sim/neutron for neutrons
//     to their capture); neutrinos are not followed (fate NotFollowed) and
//     an unknown PDG code is an error;
//  3. every charged step above threshold emits its Cherenkov photons
//     (sim/cherenkov), pre-scaled by the sensors' maximum efficiency, and
//     each photon is traced at once to the wall (sim/photon), so no event
//     ever holds its photons in memory;
//  4. dark pulses are added over the signal span plus the readout margins
//     (pmt.Model.AddDark), photoelectrons are digitized (pmt.Digitizer),
//     the hits of dead sensors (Setup.Dead) are dropped, and the trigger
//     (pmt.Trigger) decides the readout window.
//
// A dead sensor still absorbs the light that reaches it; it makes no hit,
// signal or dark, and its photoelectrons are not in the truth counts. Its
// hits are dropped after digitization so that every event draws the same
// random numbers whichever sensors are dead: the live sensors' hits do not
// depend on the list.
//
// Hit times are on the event clock: ns since the primaries' time origin
// (the generator's vertex time). Only the first trigger of an event is
// read out; light arriving after the readout window (for example from a
// muon's decay electron microseconds later) is in the truth counts but
// not in the hits.
//
// Run spreads events over Config.Workers goroutines. Each event depends
// only on (Seed, number), so the output is bit-identical for any number of
// workers and for any split into shards (RunOptions.Shard, Shards): the
// Count events are cut into n contiguous blocks as equal as possible and
// shard k makes block k (RunOptions.ShardRange gives its first event
// number and length); sim/event.Merge joins the shard files. Events stream to the caller in number order, with at most
// a few per worker in memory. An event with nothing to track (a neutral-
// current event of a generator file) is counted and reported, not an
// error; a bad event (a malformed event of a file) stops the run or, with
// RunOptions.BadEvents = SkipBad, is skipped, counted and reported
// (RunOptions.OnBad); WriteRun stores both in the run record.
//
// # Which water
//
// Three descriptions of the water answer three questions and are kept
// apart because each model needs different numbers:
//
//   - Setup.Water, an *optics.Water (sim/optics), is its optics:
//     refractive and group index, absorption and scattering lengths over
//     the wavelength band, for Cherenkov emission and photon tracing (the
//     fitters use the same one);
//   - material.Water() (sim/material) is the medium charged particles lose
//     energy and scatter in: density, electron density, mean excitation
//     energy, radiation length, for sim/em and sim/muon;
//   - gen.Water (sim/gen) is the neutrino target: the nucleons of H2O that
//     the quasi-elastic generator strikes.
//
// Changing the optics (temperature, absorption) leaves the transport
// medium at its tabulated density.
//
// A *Simulator is immutable after New and safe for concurrent use.
package sim
