package ring

import (
	"bytes"
	"compress/gzip"
	_ "embed"
	"encoding/gob"
	"fmt"
	"math"
	"sync"

	"github.com/conelight/conelight/fit/ring/internal/profile"
)

//go:generate go run ./internal/gentables -o profiles.gob.gz -events 1.5

//go:embed profiles.gob.gz
var profilesGz []byte

// speciesTable is one particle kind's emission profiles, read-only after
// loading. Node k has NS s bins of width extent[k]/NS; counts and their
// cumulative sums over cosine are per particle.
type speciesTable struct {
	pdg      int
	energies []float64 // kinetic energy nodes, MeV
	logE     []float64
	extent   []float64 // cm
	photons  []float64
	uni      [][]float64 // [node][step*(uniNC+1)+j]: see resample
	delay    [][]float64 // [node][k]
	cosLo    []float64   // NC+1 cosine edges
	// event-to-event fluctuations per node (profile.Node)
	axisVar, startSD, photonsSD []float64
}

type tableSet struct {
	bandLo, bandHi float64
	// index is the Cherenkov-averaged refractive index of the water the
	// tables were made with, water its description.
	index          float64
	water          string
	provenance     profile.Provenance
	electron, muon *speciesTable
}

var (
	loadOnce sync.Once
	loaded   *tableSet
	loadErr  error
)

// tables returns the embedded profile tables, decoded once. The decoded
// value is never written after decoding.
func tables() (*tableSet, error) {
	loadOnce.Do(func() { loaded, loadErr = decodeTables(profilesGz) })
	return loaded, loadErr
}

func decodeTables(b []byte) (*tableSet, error) {
	zr, err := gzip.NewReader(bytes.NewReader(b))
	if err != nil {
		return nil, fmt.Errorf("ring: profile tables: %w", err)
	}
	var f profile.File
	if err := gob.NewDecoder(zr).Decode(&f); err != nil {
		return nil, fmt.Errorf("ring: profile tables: %w", err)
	}
	if f.Format != profile.FormatName || f.Version != profile.FormatVersion {
		return nil, fmt.Errorf("ring: profile tables: format %q version %d, want %q %d", f.Format, f.Version, profile.FormatName, profile.FormatVersion)
	}
	ts := &tableSet{bandLo: f.BandLo, bandHi: f.BandHi, index: f.Index, water: f.Water, provenance: f.Provenance}
	for _, sp := range f.Species {
		if sp.NS != profile.NS || len(sp.CosEdges) != profile.NC+1 || len(sp.Nodes) != len(sp.Energies) || len(sp.Nodes) < 2 {
			return nil, fmt.Errorf("ring: profile tables: species %d has inconsistent dimensions", sp.PDG)
		}
		t := &speciesTable{pdg: sp.PDG, cosLo: sp.CosEdges}
		for _, nd := range sp.Nodes {
			if len(nd.Counts) != profile.NS*profile.NC || len(nd.Delay) != profile.NS || !(nd.Extent > 0) {
				return nil, fmt.Errorf("ring: profile tables: species %d node %g MeV is malformed", sp.PDG, nd.Ekin)
			}
			t.energies = append(t.energies, nd.Ekin)
			t.logE = append(t.logE, math.Log(nd.Ekin))
			t.extent = append(t.extent, nd.Extent)
			t.photons = append(t.photons, nd.Photons)
			c := make([]float64, len(nd.Counts))
			for j, v := range nd.Counts {
				c[j] = float64(v)
			}
			d := make([]float64, profile.NS)
			for k, v := range nd.Delay {
				d[k] = float64(v)
			}
			t.uni = append(t.uni, resample(c, sp.CosEdges))
			t.delay = append(t.delay, d)
			t.axisVar = append(t.axisVar, nd.AxisVar)
			t.startSD = append(t.startSD, nd.StartSD)
			t.photonsSD = append(t.photonsSD, nd.PhotonsSD)
		}
		switch sp.PDG {
		case 11:
			ts.electron = t
		case 13:
			ts.muon = t
		}
	}
	if ts.electron == nil || ts.muon == nil {
		return nil, fmt.Errorf("ring: profile tables lack the electron or the muon")
	}
	return ts, nil
}

// EkinRange returns the kinetic energy range (MeV) covered by the tables
// of a hypothesis.
func (t *speciesTable) energyRange() (lo, hi float64) {
	return t.energies[0], t.energies[len(t.energies)-1]
}

// profileAt is a profile interpolated to one kinetic energy: linear in
// log energy between the two neighbouring nodes at the same scaled
// distance s/extent, so that the end of a muon track moves with energy
// instead of fading between two fixed end points.
type profileAt struct {
	ekin    float64
	extent  float64 // cm
	ds      float64 // s bin width, cm
	photons float64
	// On the uniform cosine grid of uniNC bins: per-bin density
	// (photons per unit cosine) and cumulative count at the lower edge,
	// for integration step k (two table bins each).
	dens  [nSteps * uniNC]float64
	cum   [nSteps * (uniNC + 1)]float64
	total [nSteps]float64
	delay [profile.NS]float64
	// light90 is the s (cm) below which 90% of the light is emitted: the
	// end of the track for the time prediction.
	light90 float64
	// The event-to-event fluctuations (profile.Node): axis variance per
	// transverse component (rad^2), spread of the start of the light
	// (cm), relative spread of the photon count, and dlnPhotons/dlnE,
	// which turns the last into an energy spread.
	axisVar, startSD, photonsSD, photonSlope float64
}

// interpolate fills p for kinetic energy e, which must lie in the table
// range. It does not allocate.
func (t *speciesTable) interpolate(e float64, p *profileAt) {
	le := math.Log(e)
	n := len(t.logE)
	i := 0
	for i < n-2 && le > t.logE[i+1] {
		i++
	}
	w := (le - t.logE[i]) / (t.logE[i+1] - t.logE[i])
	w = min(max(w, 0), 1)
	a, b := 1-w, w
	p.ekin = e
	p.extent = math.Exp(a*math.Log(t.extent[i]) + b*math.Log(t.extent[i+1]))
	p.ds = p.extent / nSteps
	// Counts per node scale with the photon yield; interpolate the shape
	// and the total separately so the total is smooth in energy.
	p.photons = math.Exp(a*math.Log(t.photons[i]) + b*math.Log(t.photons[i+1]))
	fa, fb := a*p.photons/t.photons[i], b*p.photons/t.photons[i+1]
	ua, ub := t.uni[i], t.uni[i+1]
	total := 0.0
	for k := 0; k < nSteps; k++ {
		base := k * (uniNC + 1)
		for j := 0; j <= uniNC; j++ {
			p.cum[base+j] = fa*ua[base+j] + fb*ub[base+j]
		}
		for j := 0; j < uniNC; j++ {
			p.dens[k*uniNC+j] = (p.cum[base+j+1] - p.cum[base+j]) * uniNC / 2
		}
		p.total[k] = p.cum[base+uniNC]
		total += p.total[k]
	}
	p.axisVar = a*t.axisVar[i] + b*t.axisVar[i+1]
	p.startSD = a*t.startSD[i] + b*t.startSD[i+1]
	p.photonsSD = a*t.photonsSD[i] + b*t.photonsSD[i+1]
	p.photonSlope = math.Log(t.photons[i+1]/t.photons[i]) / (t.logE[i+1] - t.logE[i])
	da, db := t.delay[i], t.delay[i+1]
	for k := range p.delay {
		p.delay[k] = a*da[k] + b*db[k]
	}
	acc := 0.0
	p.light90 = p.extent
	for k := 0; k < nSteps; k++ {
		v := p.total[k]
		if acc+v >= 0.9*total && v > 0 {
			p.light90 = (float64(k) + (0.9*total-acc)/v) * p.extent / nSteps
			break
		}
		acc += v
	}
}

// nSteps is the number of integration steps along the track: pairs of
// table bins. uniNC is the number of bins of the uniform cosine grid the
// profiles are resampled onto, fine enough for the sharp muon cone
// (the table's finest bins are 0.005 wide) and indexable without a search.
const (
	nSteps = profile.NS / 2
	uniNC  = 400
)

// resample returns the cumulative photon count of every step (pairs of
// table bins) at the uniNC+1 edges of the uniform cosine grid, linear in
// cosine within each table bin.
func resample(counts []float64, edges []float64) []float64 {
	out := make([]float64, nSteps*(uniNC+1))
	for k := 0; k < nSteps; k++ {
		for j := 0; j <= uniNC; j++ {
			c := -1 + 2*float64(j)/uniNC
			var v float64
			for kk := 2 * k; kk < 2*k+2; kk++ {
				row := counts[kk*profile.NC : (kk+1)*profile.NC]
				for m, n := range row {
					lo, hi := edges[m], edges[m+1]
					switch {
					case c >= hi:
						v += n
					case c > lo:
						v += n * (c - lo) / (hi - lo)
					}
				}
			}
			out[k*(uniNC+1)+j] = v
		}
	}
	return out
}

// cosCell returns the uniform-grid cell of cosine c and the position
// within it (cosine units from the cell's lower edge).
func cosCell(c float64) (int, float64) {
	x := (c + 1) * (uniNC / 2)
	j := int(x)
	if j < 0 {
		return 0, 0
	}
	if j >= uniNC {
		return uniNC - 1, 2.0 / uniNC
	}
	return j, (x - float64(j)) * (2.0 / uniNC)
}
