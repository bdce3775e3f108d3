// Package profile is the file format of the emission-profile tables shared
// by package ring and its generator: the Cherenkov photon count of a
// particle in (distance along the initial direction, cosine of the angle
// to it) bins at a ladder of kinetic energies, the event-to-event
// fluctuations of the emission, and the provenance of the file.
package profile

import "github.com/conelight/conelight/sim/optics"

// CherenkovIndex is the refractive index of w averaged over the Cherenkov
// spectrum emitted between lo and hi nm (photons per unit wavelength
// proportional to (1 - 1/n^2)/lambda^2), by the midpoint rule on 1 nm
// steps: the index that sets the cone of the profiles.
func CherenkovIndex(w *optics.Water, lo, hi float64) float64 {
	var sw, sn float64
	for l := lo + 0.5; l < hi; l++ {
		n := w.Index(l)
		g := (1 - 1/(n*n)) / (l * l)
		sw += g
		sn += g * n
	}
	return sn / sw
}

// FormatName and FormatVersion identify the table file.
const (
	FormatName    = "conelight-ring-profiles"
	FormatVersion = 2
)

// NS is the number of s bins of every node; the bin width is the node's
// Extent / NS, so that nodes of different energies line up in the scaled
// distance s / Extent.
const NS = 32

// The cosine bins are uniform in three ranges: coarse backwards and
// sideways, fine across the Cherenkov cone of both species, medium
// forwards.
const (
	cosA, cosB = 0.5, 0.85
	stepLow    = 0.05  // [-1, cosA)
	stepMid    = 0.005 // [cosA, cosB)
	stepHigh   = 0.015 // [cosB, 1]
	nLow       = 30
	nMid       = 70
	nHigh      = 10
	// NC is the number of cosine bins.
	NC = nLow + nMid + nHigh
)

// CosBin returns the cosine bin of c in [0, NC).
func CosBin(c float64) int {
	var j int
	switch {
	case c < cosA:
		j = int((c + 1) / stepLow)
	case c < cosB:
		j = nLow + int((c-cosA)/stepMid)
	default:
		j = nLow + nMid + int((c-cosB)/stepHigh)
	}
	return min(max(j, 0), NC-1)
}

// CosEdges returns the NC+1 bin edges from -1 to 1.
func CosEdges() []float64 {
	e := make([]float64, 0, NC+1)
	for j := 0; j < nLow; j++ {
		e = append(e, -1+float64(j)*stepLow)
	}
	for j := 0; j < nMid; j++ {
		e = append(e, cosA+float64(j)*stepMid)
	}
	for j := 0; j <= nHigh; j++ {
		e = append(e, cosB+float64(j)*stepHigh)
	}
	return e
}

// File is the whole table file (gob encoded, gzip compressed).
type File struct {
	Format  string
	Version int
	// BandLo, BandHi (nm) is the emission band the photons were counted
	// in; Water describes the water whose refractive index was used.
	BandLo, BandHi float64
	Water          string
	// Index is the refractive index of that water averaged over the
	// Cherenkov spectrum in the band: the cone angle of the profiles.
	Index      float64
	Provenance Provenance
	Species    []Species
}

// Provenance says how a table file was made: the generator and its
// version, the command, the seeds, and the constants of the code the
// tables depend on with their hash (SHA-256 of Constants), which the
// generator's test recomputes from the code to find stale tables.
type Provenance struct {
	Generator string
	Version   int
	Command   string
	Seeds     string
	Constants string
	Hash      string
}

// Species holds the nodes of one particle kind.
type Species struct {
	PDG      int
	NS       int
	CosEdges []float64
	Energies []float64 // kinetic energies of the nodes, MeV, increasing
	Nodes    []Node
}

// Node is the mean profile of one kinetic energy.
type Node struct {
	Ekin    float64
	Events  int
	Extent  float64 // cm: all but 0.2% of the light is emitted at s < Extent
	Photons float64 // mean photons per particle in the band
	// TrackLength is the mean path length of the primary above
	// threshold (cm), for reference.
	TrackLength float64
	// Counts[k*NC+j] is the mean photon count per particle in s bin k
	// (width Extent/NS) and cosine bin j.
	Counts []float32
	// Delay[k] is the mean emission time minus s/c (ns) in s bin k.
	Delay []float32
	// The event-to-event fluctuations of the emission as a whole, which
	// the mean profile does not describe: AxisVar (rad^2) is the
	// variance, per transverse component, of the direction of the
	// event's light axis about the initial direction (the axis the
	// counts use for muons; from the start to the centroid of all
	// emission points for electrons); StartSD (cm) the spread of the
	// distance along the initial direction below which StartFraction of
	// the event's light is emitted; PhotonsSD the relative spread of the
	// event's photon count. Spreads are half the 16-84% range of the
	// events (the standard deviation of a normal core).
	AxisVar, StartSD, PhotonsSD float64
}

// StartFraction is the fraction of an event's light whose end point along
// the track measures where its light starts (Node.StartSD).
const StartFraction = 0.2
