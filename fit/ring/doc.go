// Package ring reconstructs single-ring events in a water-Cherenkov tank:
// the vertex, time, direction and kinetic energy of one electron-like or
// muon-like track from the hit charges and times alone, by maximum
// likelihood under both hypotheses, with electron/muon identification
// from the likelihood ratio and the parent neutrino energy of a
// quasi-elastic interaction.
//
// Units: cm, ns, MeV (momenta MeV/c); charges in pe; wavelengths in nm.
//
// # Light model
//
// For a track hypothesis (vertex v, time t0, unit direction u, kinetic
// energy E) the mean number of photoelectrons at sensor i is
//
//	mu_i = A/(2 pi) sum_k  g_k(cos theta) * <cos eta / R^2 * acc(cos eta) * eps(R)>_k  + mu_ind,i
//
// The sum runs over steps k along the track, up to the end of the light or
// the wall. g_k is the emission profile of step k: photons per unit
// cosine of the angle theta between the initial direction and the line to
// the sensor, tabulated from the simulator for electrons (showers with
// their angular and longitudinal spread) and muons (the cone that shrinks
// as they slow down, their delta rays). Within a step the angle to the
// sensor changes monotonically, so the step's light is the count between
// the angles seen from its two ends divided by their difference: a sharp
// cone is integrated exactly with coarse steps. A is the photocathode
// area, eta the angle of incidence on the cathode, acc the sensor's
// angular acceptance, and eps(R) the detection efficiency (quantum x
// collection) times the direct-light survival exp(-R/L(lambda)), L the
// absorption and scattering length, averaged over the Cherenkov spectrum.
// The indirect term mu_ind spreads the direct total times (exp(R/L_scat)-1
// + liner reflectivity x (1 - coverage)) over the sensors as from an
// isotropic source at the light centroid.
//
// A sensor far from the track (more than 5 light lengths from the
// vertex) sees the angle to the track and its own weight change smoothly
// along it: these are computed exactly at every other step edge and
// interpolated between (TestFarSensors requires its direct light within
// 1% of the exact sum).
//
// The predicted direct-light time of a sensor is t0 + s/c + delay(s) +
// R(s)/v_g from the point s on the track that sees it at the Cherenkov
// angle (clamped to the light-emitting part of the track), with v_g the
// spectrum-averaged group velocity and delay the tabulated mean emission
// delay. Outside the outer edge of an electron's ring no point sees the
// sensor at the Cherenkov angle, and the shower's light there comes from
// its particles at depth: the time is the light-weighted mean arrival
// over the steps, its spread added to the time spread, blended in over
// one step beyond the edge.
//
// # Likelihood
//
// A sensor without a hit contributes P(no hit above threshold | mu),
// a hit sensor P(q | mu): the photoelectron count convolved with the
// sensor's single-pe charge spectrum, tabulated in (log mu, q) when the
// Fitter is built, a gamma density of the same mean and variance above
// 40 pe (clipped charges count as P(Q >= saturation)). The count is not
// Poisson about mu: the prediction itself is uncertain from sensor to
// sensor (shower and delta-ray fluctuations, mean emission profiles), so
// the true mean is taken as mu times a Gamma variable of mean 1 and
// relative width sigma_model = 0.45, which makes the count negative
// binomial with variance mu + (sigma_model mu)^2. The width is measured,
// not tuned: it is the spread of simulated charges about the prediction
// at the true track beyond the Poisson x single-pe spread, on sensors
// predicted to see 5-40 pe with the prediction scaled to each event's
// total charge (TestModelSpread measures it for electrons and muons and
// checks the constant against both). The first hit time of a sensor adds
// the density of
// the time residual: the earliest of a Poisson number of Gaussian direct
// photoelectrons (first-photon statistics, sharper with more light),
// exponentially delayed indirect light, and flat dark noise over the
// readout window, weighted by the chance that the first photoelectron is
// of each kind.
//
// # Fit
//
// Fit seeds the vertex and time from a point fit of the hit times (grid,
// then gonum's Nelder-Mead), restricts the hits to a prompt window about that
// time (leaving out hits later, seen from the point seed, than the
// track's light plus three indirect-light delays: a muon's decay
// electron), finds the ring axis by a search over directions for the charge at
// the Cherenkov angle (with the charge centroid as a second candidate),
// and for each hypothesis matches the energy to the
// total charge and moves the start back along the track. Seven parameters
// are then fitted in variables scaled to about one standard deviation,
// the vertex moving along the track together with the time. The
// likelihood is a sum of independent sensor terms, so one
// forward-difference pass over the parameters gives every sensor's score
// as well as the gradient; the outer product of the scores
// (Berndt-Hall-Hall-Hausman) estimates the Fisher information and starts a
// Levenberg-Marquardt-damped Newton search, whose Hessian estimate is then
// corrected by damped BFGS secant updates along the steps taken (the
// scores misjudge the curvature where the model's spread is wrong, as in
// the time term), with a parabolic step-length correction. A step in the
// time alone moves only the predicted times, so its differences reuse the
// stored prediction. The fit stops when the expected gain of a full step
// is below 0.05 or two steps in a row gained less than 0.05 (the noise
// floor of the linearly interpolated tables), and gives up after 100
// steps. A quasi-Newton method from the identity would have to learn the
// information matrix the scores give at once, so the search is written on
// gonum/mat (internal/minimize); TestScoringReachesMinimum checks that a
// long gonum BFGS run from its result gains less than 0.25. Uncertainties come
// from the numerical Hessian by second-order central formulas that also
// reuse the stored prediction for the time (43 likelihood evaluations
// instead of the 99 of gonum/diff/fd), and the Cramer-Rao bound from the
// expected Fisher information of the predictions' derivatives taken on the
// same points.
// When the likelihood ratio is not decisive (below 200) the losing
// hypothesis is refitted from the winner's track and the better of its two
// fits kept. Uncertainties are computed for the hypothesis with the better
// likelihood. A Result has Status fit.Converged only inside the tank and
// the table energy range (Fitter.EkinRange), and then holds finite numbers
// only; a minimum on the wall or at an end of the range is fit.AtLimit,
// and Reason says why for any status but fit.Converged. ErrorsValid is
// false when the numerical Hessian is not positive definite (Reason then
// says so), which leaves the fit and the particle identification
// standing.
//
// # Uncertainties
//
// The covariance has two parts. The measurement part is the sandwich
// H^-1 J H^-1 of the numerical Hessian H and the summed outer products J
// of every sensor's score (the central-difference gradient of its term):
// the likelihood treats the sensors as independent given the prediction,
// and where its spread of a sensor's charge or time is not the actual one
// the sandwich still gives the covariance of the estimate (Huber 1967,
// White 1982). The intrinsic part is what the likelihood of a mean
// emission profile cannot see: each shower or muon fluctuates as a whole
// about the mean. The table generator measures, on the simulated
// particles of every energy node, the spread of the direction of the
// event's light axis about the initial direction (multiple scattering,
// the shower's early spread), of where along the track the event's light
// starts (the distance below which 20% of it is emitted), and of its
// photon count; the fit adds them as covariances of the two angles, of
// the vertex along the track with the time that moves with it at c, and
// of the energy (through dlnPhotons/dlnE). The two parts are independent
// and add. Result.CramerRao is the measurement bound alone.
//
// # Identity
//
// Reconstruction.LLR is the muon fit's negative log likelihood less the
// electron fit's. A fit that stopped at a limit (fit.AtLimit) keeps its
// likelihood without the walls and takes part (Result.Usable): a stopping
// muon whose fit ran to the top of the tables is still a muon. PIDCut calls an event electron-like when the LLR lies
// above a line in the mean fitted momentum; the zero PIDCut compares the
// likelihoods directly. CalibratePID fits the line to simulated electrons
// and muons of a detector (midway between the electrons' 1% and the
// muons' 99% LLR quantiles, in momentum bins); calibrate it on one half
// of a sample and count the mis-identification on the other.
//
// # Tracks that leave the tank
//
// The prediction stops the light at the wall, so a muon that leaves the
// tank is fitted by the part of its track inside, which fixes the vertex
// and direction but hardly the energy: any energy long enough to reach
// the wall looks alike. Result.Outside is the fraction of the fitted
// track's light beyond the wall; when it exceeds ExitingFraction,
// Result.Exiting is true, the fitted energy is not a measurement and
// Result.MinEkin is the lower bound, the energy whose light just reaches
// the wall (TestExiting).
//
// Inputs the fit cannot use (no hits, hits that fail fit.CheckHits, no
// hit inside the readout window, a seed outside the tank or an energy
// outside the tables) give errors naming the field and value, with
// Status fit.NoHits or fit.BadInput; dead sensors (Setup.Dead) are left
// out of the likelihood.
//
// # Tables
//
// The emission profiles (profiles.gob.gz, embedded) are made by
//
//	go generate ./fit/ring
//
// which runs internal/gentables: single electrons and muons at 23 kinetic
// energies each (electrons 20 MeV - 3 GeV, muons 65 MeV - 3 GeV) through
// unbounded water with sim/transport and sim/cherenkov, counting the
// photons of the 280-660 nm band (the range of the sensor presets'
// quantum efficiency, over which the simulator emits; a sensor's
// efficiency outside it is ignored) in 32 bins of the distance along the
// track axis (scaled to each energy's light extent) by 110 bins of the
// cosine to it. The axis is the initial direction for electrons and, for
// muons, each event's own early track (start to the centroid of the
// emission points of its first third). Multiple scattering tilts a muon's
// track one way in each event; counted about the initial direction, the
// mean over events would turn that tilt into a symmetric widening of the
// cone that no single event has, and a fit of one event with it would be
// pulled forward along the track where rings are thin. With the profiles
// each node records the event-to-event fluctuations of the emission (see
// Uncertainties). The profiles depend only on the particle physics and
// the refractive index; absorption, scattering, the sensors and the tank
// are parameters of the Fitter. The file records its provenance: the
// generator and its version, the seeds, and every constant of the code
// the tables depend on (water, band, Cherenkov-averaged refractive
// index, the electron and muon physics settings, energy ladders, event
// counts, binning) with their SHA-256 hash; the generator's
// TestTablesCurrent fails, naming the command, when the code's constants
// no longer give that hash. New refuses a detector whose water's
// Cherenkov-averaged refractive index differs from the tables' by more
// than 0.003 (the cone turned by 0.15 degrees).
// Between nodes the profiles are interpolated in log energy at the same
// scaled distance.
//
// # Concurrency
//
// A Fitter is immutable after New and safe for concurrent use by any
// number of goroutines; per-call scratch is pooled (the per-sensor
// predictions and the event's hits). The likelihood evaluation does not
// allocate.
package ring
