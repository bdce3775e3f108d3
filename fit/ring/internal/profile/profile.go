// Package profile is the file format of the emission-profile tables shared
// by package ring and its generator: the Cherenkov photon count of a
// particle in (distance along the initial direction, cosine of the angle
// to it) bins at a ladder of kinetic energies.
package profile

// FormatName and FormatVersion identify the table file.
const (
	FormatName    = "conelight-ring-profiles"
	FormatVersion = 1
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
	Species        []Species
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
}
