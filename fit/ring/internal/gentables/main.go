// Command gentables makes the emission profiles that package ring embeds:
// for electrons and muons at a ladder of kinetic energies it follows
// single particles through unbounded pure water with the simulator's
// transport (sim/transport: sim/em and sim/muon) and Cherenkov emitter
// (sim/cherenkov, no pre-scaling, over the 280-660 nm band photosensors
// behind glass respond to)
// and counts every photon by its distance s along the track axis from the
// start point and the cosine of its angle to that axis. For electrons the
// axis is the initial direction; for muons it is each event's own early
// track, from the start to the centroid of the emission points of its
// first third (see counter.flush and axisFraction).
// The tables therefore depend on the particle physics and the refractive
// index of water only; absorption, scattering and the sensors enter the
// prediction in package ring, not here.
//
// Run from fit/ring with
//
//	go generate
//
// which executes `go run ./internal/gentables -o profiles.gob.gz`. The
// file is written atomically (temporary file, then rename). The run is
// deterministic: the random stream of each (species, energy, event) is a
// fixed PCG stream.
package main

import (
	"compress/gzip"
	"crypto/sha256"
	"encoding/gob"
	"encoding/hex"
	"flag"
	"fmt"
	"io"
	"log"
	"math"
	"math/rand/v2"
	"runtime"
	"strings"
	"sync"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit/resolution"
	"github.com/conelight/conelight/fit/ring/internal/profile"
	"github.com/conelight/conelight/geom/safefile"
	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/transport"
)

// unbounded is the tracking volume: all of space, so that the profiles
// describe a particle in an infinite tank.
type unbounded struct{}

func (unbounded) Contains(r3.Vector) bool { return true }

// maxEmitTime drops light emitted later than this (ns) after the start:
// a stopped muon's decay electron a microsecond later is a separate event,
// not part of the ring.
const maxEmitTime = 80

// detectLo, detectHi (nm) is the counted band: the range of the sensor
// presets' quantum-efficiency curve (pmt.BialkaliQE, bialkali behind
// borosilicate glass), over which the simulator emits. A sensor whose
// efficiency reaches beyond it loses that light in the prediction.
const detectLo, detectHi = 280.0, 660.0

// fineDS is the width (cm) of the fine histogram in s that is rebinned
// into the node's own bins once its extent is known.
const fineDS = 1.0

type counter struct {
	emitter *cherenkov.Emitter
	rng     *rand.Rand
	photons []cherenkov.Photon
	start   r3.Vector
	dir     r3.Vector
	fine    [][]float64 // [fine s bin][cos bin] photon counts
	tsum    []float64   // per fine s bin, sum of (t - s/c)
	ownAxis bool        // count each event about its own light axis (muons)
	event   []cherenkov.Photon
	err     error
	// per-event fluctuations: photon counts, the transverse components
	// of the light axis (two per event), the starts of the light
	counts, axes, starts []float64
	evHist               []float64 // this event's photons per fine s bin
}

func (c *counter) Segment(seg phys.Segment) {
	if c.err != nil || seg.T0 > maxEmitTime {
		return
	}
	var err error
	c.photons, err = c.emitter.Emit(seg, c.rng, c.photons[:0])
	if err != nil {
		c.err = err
		return
	}
	c.event = append(c.event, c.photons...)
}

// fill counts photons by s along the unit axis a from the start and by
// the cosine of their direction to a.
func (c *counter) fill(photons []cherenkov.Photon, a r3.Vector) {
	for _, p := range photons {
		s := p.Pos.Sub(c.start).Dot(a)
		if s < 0 {
			s = 0
		}
		k := int(s / fineDS)
		if k >= len(c.fine) {
			k = len(c.fine) - 1
		}
		j := profile.CosBin(p.Dir.Dot(a))
		c.fine[k][j]++
		c.tsum[k] += p.Time - s/phys.SpeedOfLight
	}
}

// axisFraction is the part of a muon's track, from its start (in
// distance along the initial direction, as a fraction of the farthest
// emission point), whose emission points define the event's axis: the
// early track, whose light makes the ring's outer edge. The whole track
// (the helper study in the package notes) sharpens the tables as much but
// follows the late scattering, which the fitted direction then follows
// too; in the large tank at 500 MeV/c, 40 muons, the vertex 68% quantile
// was 26.0 cm about the initial direction, 23.6 cm about the first third
// and 23.0 cm about the first half, with direction 68% quantiles of 1.97,
// 1.90 and 2.00 degrees.
const axisFraction = 1.0 / 3

// flush counts the photons held for one event about the event's own light
// axis: from the start to the centroid of the emission points. Multiple
// scattering tilts a muon as a whole, one way in each event; counted about
// the initial direction, the mean over events turns that tilt into a
// symmetric widening of the cone which no single event has, and a fit of
// one event with it is biased (forward along the track where rings are
// thin next to their distance to the wall). Counted about the axis that a
// straight-track fit of the event estimates, the tables keep only the
// spread of the light about it.
func (c *counter) flush() {
	a := c.dir
	if c.ownAxis && len(c.event) > 0 {
		var smax float64
		for _, p := range c.event {
			smax = math.Max(smax, p.Pos.Sub(c.start).Dot(c.dir))
		}
		var cen r3.Vector
		var m int
		for _, p := range c.event {
			if p.Pos.Sub(c.start).Dot(c.dir) <= axisFraction*smax {
				cen = cen.Add(p.Pos)
				m++
			}
		}
		if m > 0 {
			if d := cen.Mul(1 / float64(m)).Sub(c.start); d.Norm() > 1e-6 {
				a = d.Normalize()
			}
		}
	}
	c.fluctuations(a)
	c.fill(c.event, a)
	c.event = c.event[:0]
}

// fluctuations adds the event held to the sums of the event-to-event
// fluctuations: its photon count, the transverse components of its light
// axis (a for muons; from the start to the centroid of all emission
// points for electrons) and the distance along the initial direction
// below which profile.StartFraction of its light is emitted.
func (c *counter) fluctuations(a r3.Vector) {
	n := float64(len(c.event))
	c.counts = append(c.counts, n)
	if n == 0 {
		return
	}
	if !c.ownAxis {
		var cen r3.Vector
		for _, p := range c.event {
			cen = cen.Add(p.Pos)
		}
		if d := cen.Mul(1 / n).Sub(c.start); d.Norm() > 1e-6 {
			a = d.Normalize()
		}
	}
	// transverse components about the initial direction (z)
	c.axes = append(c.axes, a.X, a.Y)
	for i := range c.evHist {
		c.evHist[i] = 0
	}
	for _, p := range c.event {
		s := math.Max(p.Pos.Sub(c.start).Dot(c.dir), 0)
		c.evHist[min(int(s/fineDS), len(c.evHist)-1)]++
	}
	var acc float64
	for k, v := range c.evHist {
		if acc+v >= profile.StartFraction*n {
			s := (float64(k) + (profile.StartFraction*n-acc)/v) * fineDS
			c.starts = append(c.starts, s)
			return
		}
		acc += v
	}
}
func (c *counter) Secondary(phys.Particle)                  {}
func (c *counter) Deposit(r3.Vector, float64, float64, int) {}

// version is the generator's version: raise it when the method changes
// in a way the constants below do not show.
const version = 2

// defaultScale is the event scale that go generate uses (the
// //go:generate line in package ring).
const defaultScale = 1.5

// species are the particle kinds and their energy ladders: nodes kinetic
// energies geometric from lo to hi (MeV), baseline events at 100 MeV
// (more below, fewer above).
var species = []struct {
	pdg      int
	lo, hi   float64
	nodes    int
	baseline float64
}{
	{phys.Electron, 20, 3000, 23, 300},
	{phys.MuonMinus, 65, 3000, 23, 300},
}

func main() {
	out := flag.String("o", "profiles.gob.gz", "output file")
	scale := flag.Float64("events", defaultScale, "scale factor on the number of events per energy")
	flag.Parse()
	if err := run(*out, *scale); err != nil {
		log.Fatal(err)
	}
}

// setup is what the tables are made with.
type setup struct {
	water   *optics.Water
	emitter *cherenkov.Emitter
	physics *transport.Physics
	file    profile.File // header and provenance
}

// configure builds the water, the emitter and the transport the tables
// are made with, and the file header with its provenance: every constant
// of the code the tables depend on, written out, and its hash.
func configure(scale float64) (*setup, error) {
	water, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		return nil, err
	}
	// The band of light photosensors behind glass can detect: the tables
	// count only it, so that the cone width is that of the detectable
	// light (ultraviolet photons, emitted at larger angles, would widen it).
	lo, hi := math.Max(detectLo, 0), detectHi
	if wlo, whi := water.Band(); lo < wlo || hi > whi {
		return nil, fmt.Errorf("gentables: band %g-%g nm outside the water tables %g-%g nm", lo, hi, wlo, whi)
	}
	emitter, err := cherenkov.NewEmitter(water, lo, hi, 1)
	if err != nil {
		return nil, err
	}
	nmax := 1 / emitter.Threshold()
	emCfg, err := em.ConfigForIndex(nmax)
	if err != nil {
		return nil, err
	}
	muCfg := muon.DefaultConfig()
	muCfg.ThresholdIndex = nmax
	physics, err := transport.New(material.Water(), emCfg, muCfg)
	if err != nil {
		return nil, err
	}
	index := profile.CherenkovIndex(water, lo, hi)
	var b strings.Builder
	fmt.Fprintf(&b, "water %+v\nband %g-%g nm\nindex %.6f\nem %+v\nmuon %+v\nmaterial %+v\n", water.Config(), lo, hi, index, emCfg, muCfg, material.Water())
	fmt.Fprintf(&b, "species %+v\nscale %g\naxisFraction %g\nmaxEmitTime %v\nfineDS %g\nNS %d NC %d\ncosEdges %v\nstartFraction %g\n",
		species, scale, axisFraction, maxEmitTime, fineDS, profile.NS, profile.NC, profile.CosEdges(), profile.StartFraction)
	sum := sha256.Sum256([]byte(b.String()))
	file := profile.File{Format: profile.FormatName, Version: profile.FormatVersion,
		BandLo: lo, BandHi: hi, Water: fmt.Sprintf("%+v", water.Config()), Index: index,
		Provenance: profile.Provenance{
			Generator: "fit/ring/internal/gentables", Version: version,
			Command:   fmt.Sprintf("go generate ./fit/ring (go run ./internal/gentables -o profiles.gob.gz -events %g)", scale),
			Seeds:     "PCG(PDG+1000, node index) per species and energy node",
			Constants: b.String(), Hash: hex.EncodeToString(sum[:]),
		}}
	return &setup{water: water, emitter: emitter, physics: physics, file: file}, nil
}

func run(out string, scale float64) error {
	st, err := configure(scale)
	if err != nil {
		return err
	}
	file := st.file
	for _, sp := range species {
		tab := profile.Species{PDG: sp.pdg, NS: profile.NS, CosEdges: profile.CosEdges()}
		for k := 0; k < sp.nodes; k++ {
			tab.Energies = append(tab.Energies, sp.lo*math.Pow(sp.hi/sp.lo, float64(k)/float64(sp.nodes-1)))
		}
		tab.Nodes = make([]profile.Node, sp.nodes)
		var wg sync.WaitGroup
		sem := make(chan struct{}, runtime.GOMAXPROCS(0))
		errs := make([]error, sp.nodes)
		for k, e := range tab.Energies {
			n := int(scale * sp.baseline * math.Sqrt(100/e) * 2)
			n = max(n, int(40*scale), 2)
			wg.Add(1)
			sem <- struct{}{}
			go func() {
				defer wg.Done()
				defer func() { <-sem }()
				tab.Nodes[k], errs[k] = node(st.physics, st.emitter, sp.pdg, e, n, uint64(k))
			}()
		}
		wg.Wait()
		for _, err := range errs {
			if err != nil {
				return err
			}
		}
		file.Species = append(file.Species, tab)
		log.Printf("species %d done", sp.pdg)
	}
	return writeAtomic(out, &file)
}

// node simulates n particles of kinetic energy e and returns their mean
// emission profile.
func node(physics *transport.Physics, emitter *cherenkov.Emitter, pdg int, e float64, n int, stream uint64) (profile.Node, error) {
	tr, err := transport.NewTracker(physics)
	if err != nil {
		return profile.Node{}, err
	}
	const maxS = 2000.0
	nf := int(maxS / fineDS)
	c := &counter{emitter: emitter, dir: r3.Vector{Z: 1},
		rng:  rand.New(rand.NewPCG(uint64(pdg+1000), stream)),
		fine: make([][]float64, nf), tsum: make([]float64, nf), ownAxis: pdg == phys.MuonMinus,
		evHist: make([]float64, nf)}
	for i := range c.fine {
		c.fine[i] = make([]float64, profile.NC)
	}
	var length float64
	for i := 0; i < n; i++ {
		prim := []phys.Particle{{PDG: pdg, Dir: c.dir, Ekin: e}}
		recs, err := tr.Run(prim, unbounded{}, c.rng, c)
		if err != nil {
			return profile.Node{}, err
		}
		if c.err != nil {
			return profile.Node{}, c.err
		}
		c.flush()
		length += recs[0].TrackLength
	}
	// Extent: the s below which all but 0.2% of the light is emitted.
	var total float64
	perS := make([]float64, nf)
	for k := range c.fine {
		for _, v := range c.fine[k] {
			perS[k] += v
		}
		total += perS[k]
	}
	if total == 0 {
		return profile.Node{}, fmt.Errorf("gentables: no light for PDG %d at %g MeV", pdg, e)
	}
	var acc float64
	extent := maxS
	for k, v := range perS {
		acc += v
		if acc >= 0.998*total {
			extent = float64(k+1) * fineDS
			break
		}
	}
	nd := profile.Node{Ekin: e, Events: n, Extent: extent, Photons: total / float64(n),
		TrackLength: length / float64(n),
		Counts:      make([]float32, profile.NS*profile.NC), Delay: make([]float32, profile.NS)}
	ds := extent / profile.NS
	var delayW = make([]float64, profile.NS)
	// Rebin the fine s bins into NS bins of width ds, splitting a fine bin
	// that straddles an edge in proportion to its overlap; light beyond
	// the extent goes to the last bin.
	for k := range c.fine {
		a, b := float64(k)*fineDS, float64(k+1)*fineDS
		for a < b {
			j := int(a / ds)
			if j >= profile.NS {
				j = profile.NS - 1
			}
			end := math.Min(b, float64(j+1)*ds)
			if j == profile.NS-1 {
				end = b
			}
			f := (end - a) / fineDS
			for m, v := range c.fine[k] {
				nd.Counts[j*profile.NC+m] += float32(f * v / float64(n))
			}
			nd.Delay[j] += float32(f * c.tsum[k])
			delayW[j] += f * perS[k]
			a = end
		}
	}
	for j := range nd.Delay {
		if delayW[j] > 0 {
			nd.Delay[j] = float32(float64(nd.Delay[j]) / delayW[j])
		}
	}
	// Robust widths, half the 16-84% range (the standard deviation of a
	// normal core): a muon's decay electron within maxEmitTime, a few
	// per cent of the events, would dominate a standard deviation of the
	// photon count, while the fit leaves its light out of the prompt
	// window.
	width := func(x []float64) (float64, error) {
		lo, err := resolution.Quantile(x, 0.16)
		if err != nil {
			return 0, err
		}
		hi, err := resolution.Quantile(x, 0.84)
		return 0.5 * (hi.Value - lo.Value), err
	}
	wa, err := width(c.axes)
	if err != nil {
		return profile.Node{}, fmt.Errorf("gentables: PDG %d %g MeV: axis: %w", pdg, e, err)
	}
	ws, err := width(c.starts)
	if err != nil {
		return profile.Node{}, fmt.Errorf("gentables: PDG %d %g MeV: start: %w", pdg, e, err)
	}
	wn, err := width(c.counts)
	if err != nil {
		return profile.Node{}, fmt.Errorf("gentables: PDG %d %g MeV: photons: %w", pdg, e, err)
	}
	nd.AxisVar, nd.StartSD, nd.PhotonsSD = wa*wa, ws, wn/nd.Photons
	log.Printf("PDG %d %8.2f MeV: %4d events, %9.0f photons (sd %.3f), extent %6.1f cm, track %6.1f cm, axis sd %.4f rad, start sd %.1f cm",
		pdg, e, n, nd.Photons, nd.PhotonsSD, extent, nd.TrackLength, math.Sqrt(nd.AxisVar), nd.StartSD)
	return nd, nil
}

func writeAtomic(path string, f *profile.File) error {
	return safefile.Write(path, func(w io.Writer) error {
		zw, err := gzip.NewWriterLevel(w, gzip.BestCompression)
		if err != nil {
			return err
		}
		if err := gob.NewEncoder(zw).Encode(f); err != nil {
			return err
		}
		return zw.Close()
	})
}
