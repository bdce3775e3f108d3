// Package lowenergy reconstructs low-energy events (electron-like, a few
// MeV to about 100 MeV, light from a short, nearly point-like track) in a
// water-Cherenkov tank by maximum likelihood: vertex, time, direction and
// kinetic energy (a fit.Track) with their uncertainties (fit.Errors). It
// works on hits alone, with the detector description (setup.Setup: tank
// and sensors, sensor model, water optics, liner, dead sensors); it never
// looks at simulation truth, so it serves real data as well. The valid
// kinetic-energy range is that of the energy calibration,
// Fitter.EkinRange. Units: cm, ns, MeV, radians (wavelengths in nm).
//
// Hits are checked with fit.CheckHits; a malformed hit is an error (and
// Status fit.BadInput). Hits on the dead sensors of the Setup are left
// out and counted.
//
// # Method
//
// Hit selection. Of the hits of live sensors, those inside the window of
// length (tank diagonal)/v_g + 100 ns holding the most hits are kept: all
// signal hits of a vertex inside the tank fall in it. The expected dark fraction of the selection
// is (live sensors) x DarkRate x window / (selected hits).
//
// Vertex and time. The time likelihood is sum_i log f(t_i - t0 - |x_i -
// v| / v_g) with v_g the mean group velocity of the detected Cherenkov
// spectrum (Light) and f the residual density: the tabulated signal
// density (prompt peak from the track extent and dispersion, late tail
// from scattering and reflection) convolved with the sensor's Gaussian
// transit-time spread, mixed with flat dark noise over the window. The
// seed needs no starting point: a cubic grid over the volume (spacing a
// quarter of the tank's size) scored by the largest number of residuals
// in a window matched to the spacing, refined by halving the spacing
// around the four best distinct candidates down to 25 cm, then the time
// profiled with the likelihood. BFGS with the analytic gradient maximizes
// from there (Nelder-Mead if BFGS fails). The hits of a short track lie
// on a ring, and every point on the ring axis sees them at nearly equal
// distances, so the likelihood has a long valley along the axis: the fit
// scans that line and restarts from its best point.
//
// Uncertainties: the statistical covariance (Result.Cov) is the inverse
// of the curvature of -log L at the maximum (central differences of the
// analytic gradient). The per-hit likelihoods treat the hits as
// independent, but all hits of an event share some deviations: the
// electron's multiple scattering turns the light of the whole event
// together, its track length varies, and the light of one bent track
// differs from the all-track residual density alike for every hit. The
// calibration records, per energy, the spread of each that the
// statistical errors miss (CalibrationPoint.DirSpread, ShiftSpread,
// VertexSpread: measured by the table generator as the spread in
// quadrature that gives unit pull width on its own calibration sample),
// and Fit adds them in quadrature at the fitted energy, and propagates
// the shift to the track start (Shift times the angle errors across the
// track). The generator logs beside DirSpread the multiple-scattering
// spread of the light-weighted direction from the Highland formula as a
// physical scale. The
// Cramer-Rao bound of the vertex for the event's hits is the inverse of
// the Fisher information I_f sum_i g_i g_i^T, with I_f the Fisher
// information of the residual density's location and g_i the gradient of
// residual i. A maximum whose curvature is not positive definite is no
// proper maximum: the fit is then fit.NotConverged. Goodness is the
// standardized log-likelihood.
//
// Failures. Selected hits no more than the dark noise of the live
// sensors puts into a selection window with probability 1e-3 (Poisson,
// times the number of windows in the hits' time span) are fit.NoEvent.
// A fit is Suspect when a point at least 2 m away along the ring axis has
// a log-likelihood within 4 of the maximum (Result.Ambiguity: the valley
// along the axis has a second maximum, and such fits can land metres
// from the truth), when its vertex uncertainty exceeds 1 m, or when the
// margin is below 12 and the prompt hits fit the direction density better
// than it expects by more than 2 standard deviations (Result.DirGoodness:
// hits on a cone narrower than Cherenkov's, as seen from a vertex behind
// the truth on the axis). Energies
// outside the calibration are extrapolated and flagged
// (Result.EkinOutside) with errors that grow with the distance to the
// range. Two hits of one sensor within its integration gate are an error
// (fit.CheckHits).
//
// Direction. The likelihood of the cosines between the track direction
// and the vertex-to-hit vectors of the prompt hits (residual inside
// PromptWindow), under the tabulated cosine density (peaked near the
// Cherenkov angle) with a flat dark part, maximized over the two angles
// (a uniform set of 200 seed directions and the mean hit direction, then
// Nelder-Mead in the tangent plane); its curvature gives the errors of
// the two angles along the axes of phys.Basis of the fitted direction
// (pi, no information, when it is not positive definite:
// Result.ErrorsValid is then false).
//
// Energy. The effective hit count sums over prompt hits the occupancy
// correction -ln(1-x)/x (x the fraction of hit sensors among the sensor
// and its live neighbours within 2.5 pitches), the inverse mean
// transmission of the light path (absorption and scattering over the
// detected spectrum) and the inverse angular acceptance at the incidence
// angle, subtracts the expected dark hits of the prompt window, and
// divides by the photocathode coverage of the live sensors and the mean
// spectral efficiency: it estimates the Cherenkov photons emitted in the
// band, so one calibration serves sensors of other coverage and
// efficiency, and a detector with dead sensors. The tabulated
// calibration maps it to kinetic energy, gives the energy spread and the
// shift of the light-weighted vertex ahead of the track start, by which
// the vertex is moved back along the fitted direction (Result.Shift).
//
// # Tables
//
// The densities and the calibration (Tables) come from the event
// simulator and are embedded from data/*.txt: "demo" (demo tank, medium
// sensors, 30% coverage), "large" (large reference tank, large sensors,
// 40%), and the built-in tanks lined with the other sensor classes
// ("demo-small-30", "demo-large-30", "large-small-40",
// "large-medium-40"). Each records what it depends on (Dependencies: sensor
// timing and size, coverage, water) and its provenance (generator
// version TablesVersion, seed, a hash of both). New picks the set whose
// dependencies match the detector's within 5%, never by tank size; when
// none does it uses the nearest and says so in Fitter.TablesWarning,
// naming each mismatch and the command that makes matching tables
// (GenerateCommand). The
// residual table is intrinsic (sensors without transit-time spread,
// Tables.TTS = 0); New convolves it with the sensor's TTS and sets the
// dark level from the sensor's dark rate (the convolution treats the first of several photoelectrons on
// a sensor like a single one, which makes multi-photoelectron hits appear
// later and wider than they are). The direction table belongs to the
// prompt window of the sensor it was made with. To regenerate (about ten
// minutes on two cores for the six sets):
//
//	go generate ./fit/lowenergy
//
// which runs fit/lowenergy/internal/gentables for each set; see that
// command for its flags and samples. Users may also fill Tables from their
// own calibration and pass them in Config. The liner is not modelled
// apart: the light it reflects arrives late and is part of the residual
// table's tail, for the liner the tables were made with.
//
// # Concurrency
//
// A Fitter is immutable after New and safe for concurrent use by any
// number of goroutines; per-call scratch is pooled.
//
// Package fit/resolution computes resolution summaries (bias, 68%
// quantiles, Gaussian-core energy resolution, each with its statistical
// error) for regression tests.
package lowenergy
