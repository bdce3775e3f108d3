// Package display draws the pictures of a water-Cherenkov analysis with
// gonum/plot: an event display of the unrolled tank with the fitted vertex
// and ring, the hit-time residual histogram, the charge-vs-angle profile of a
// ring, and the study plots (resolution and bias against a variable with error
// bars, pull distributions with their Gaussian fit, mis-identification
// fractions). It works on hits, a detector and fit results, never on the
// simulator, so it serves real data as well: it imports geom, pmt,
// fit/resolution and sim/phys (phys.Deflect for the rays on the Cherenkov
// cone, as package fit does) besides gonum/plot.
//
// Units: cm, ns, pe; angles in degrees on the axes.
//
// The hit-time residual t - t0 - |x - v|/v_g is that of a point source at v:
// for the start of a long track (a ring fit) the light emitted further along
// arrives early, since the particle outruns its light, and the residuals
// are negative.
//
// # Unrolled tank
//
// The sensor surface is cut along the barrel line at azimuth pi and opened
// flat (Unrolled): the barrel becomes a rectangle of width 2 pi R (arc length
// R phi, phi = atan2(y, x) in (-pi, pi]) and height 2 H (z), R and H the
// radius and half height of the sensor surface. The caps are disks of radius
// R above and below it, hinged on the barrel at phi = 0 as if the lids were
// folded open there: the cap points (x, y) go to (y, H + g + R - x) on top
// and (y, -H - g - R + x) at the bottom, g a small gap. Distances are true
// in cm on the barrel and on the caps.
//
// # What a figure states
//
// Figures are meant to be read at a glance without being misread:
//
//   - Legends never lie on the data: a study plot's legend is drawn in a
//     band between its title and its data area (Grid, which Save and
//     Write also use for a single plot), the event display's below the
//     tank.
//   - Histograms do not fold values outside their range into the end
//     bins: the underflow and overflow are drawn as grey bars apart from
//     the range and labelled with what they hold and their count.
//   - The event display's colour scale spans the bulk of the values
//     (ColourScale); an end that clamps hits carries a triangle in its
//     colour and a "≥ t" or "≤ t" label, and the legend counts those hits.
//   - A fraction with nothing to measure on one side (0 of n, n of n) is
//     a one-sided limit, drawn as a bar with an arrow into the allowed
//     side, not a point with error bars (PointOfProportion with
//     resolution.Proportion: Clopper-Pearson intervals and limits).
//   - Tick labels of an axis share one number of decimals, the fewest
//     that write them exactly; a logarithmic axis is labelled at the
//     points' own X (the energies of a study).
//
// # Figures and files
//
// Every figure is a Figure (anything that draws itself on a draw.Canvas:
// *plot.Plot, *EventDisplay, Grid). Save writes one as PNG (at PNGDPI) or SVG,
// chosen by the file extension, atomically: a temporary file in the same
// directory, renamed when complete.
//
// # Concurrency
//
// The constructors only read their inputs; the figures they return are plain
// values for one goroutine at a time.
package display
